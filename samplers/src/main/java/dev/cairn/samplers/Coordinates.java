package dev.cairn.samplers;

import java.util.Arrays;

/** Helpers for the coordinate lists steps act on. */
final class Coordinates {
    private Coordinates() {
    }

    /** The given coordinates, checked against the target; all of them when none are given. */
    static int[] resolve(int[] coordinates, Target target) {
        int d = target.parameters().size();
        if (coordinates == null || coordinates.length == 0) {
            int[] all = new int[d];
            for (int i = 0; i < d; i++) {
                all[i] = i;
            }
            return all;
        }
        for (int c : coordinates) {
            if (c < 0 || c >= d) {
                throw new IllegalArgumentException("coordinate " + c + " is outside 0.." + (d - 1));
            }
        }
        return coordinates.clone();
    }

    static int[] checked(int[] coordinates) {
        if (coordinates == null) {
            return new int[0];
        }
        int[] sorted = coordinates.clone();
        Arrays.sort(sorted);
        for (int i = 0; i < sorted.length; i++) {
            if (sorted[i] < 0) {
                throw new IllegalArgumentException("coordinate must be >= 0, was " + sorted[i]);
            }
            if (i > 0 && sorted[i] == sorted[i - 1]) {
                throw new IllegalArgumentException("coordinate " + sorted[i] + " is listed twice");
            }
        }
        return coordinates.clone();
    }
}
