package dev.cairn.diagnostics;

import java.util.Arrays;
import java.util.Comparator;

/**
 * Sorting orders and average ranks of many draws, without boxing: each value's order-preserving 64-bit
 * key keeps its high bits and carries the value's index in the low bits, so sorting the keys yields the
 * permutation. The keys are sorted by a stable least-significant-digit radix sort over the value bits
 * only (they start in index order, so the index bits need no pass), linear in the number of draws.
 * Values that agree in those high bits (a relative difference below about 2^-28) are put in exact order
 * afterwards, so the result is exactly the order of the values.
 */
final class Ranking {
    private Ranking() {
    }

    /** Indices of {@code values} in ascending order of value (NaN not allowed; -0.0 equals 0.0). */
    static int[] order(double[] values) {
        int s = values.length;
        int indexBits = Math.max(1, 32 - Integer.numberOfLeadingZeros(Math.max(1, s - 1)));
        long mask = (1L << indexBits) - 1;
        long[] keys = new long[s];
        for (int i = 0; i < s; i++) {
            // The sign bit flipped makes unsigned order equal to the signed order of sortable keys.
            keys[i] = ((sortable(values[i]) ^ Long.MIN_VALUE) & ~mask) | i;
        }
        radixSort(keys, indexBits);
        int[] order = new int[s];
        for (int k = 0; k < s; k++) {
            order[k] = (int) (keys[k] & mask);
        }
        // Runs whose truncated keys collide are ordered exactly by value.
        int start = 0;
        for (int k = 1; k <= s; k++) {
            if (k == s || (keys[k] & ~mask) != (keys[start] & ~mask)) {
                if (k - start > 1) {
                    Integer[] run = new Integer[k - start];
                    for (int j = start; j < k; j++) {
                        run[j - start] = order[j];
                    }
                    Arrays.sort(run, Comparator.comparingDouble(i -> values[i] + 0.0));
                    for (int j = start; j < k; j++) {
                        order[j] = run[j - start];
                    }
                }
                start = k;
            }
        }
        return order;
    }

    /**
     * The order of |x - centre| given the order of x: walking outwards from the centre, the values below it
     * come in ascending distance from the right end of the left part, those above it from the left end of
     * the right part; merging the two walks is linear.
     */
    static int[] foldedOrder(double[] values, int[] order, double centre) {
        int s = order.length;
        int split = 0;
        while (split < s && values[order[split]] <= centre) {
            split++;
        }
        int[] out = new int[s];
        int left = split - 1;
        int right = split;
        for (int k = 0; k < s; k++) {
            if (right >= s || (left >= 0 && centre - values[order[left]] <= values[order[right]] - centre)) {
                out[k] = order[left--];
            } else {
                out[k] = order[right++];
            }
        }
        return out;
    }

    /**
     * Twice the average rank (1-based) of each value, given their ascending order; tied values share the
     * average of their ranks, which is an integer or a half, hence the doubling.
     */
    static int[] twiceAverageRanks(double[] values, int[] order) {
        int s = order.length;
        int[] twice = new int[s];
        int start = 0;
        for (int k = 1; k <= s; k++) {
            if (k == s || values[order[k]] != values[order[start]]) {
                int sum = (start + 1) + k; // first rank + last rank of the tie group
                for (int j = start; j < k; j++) {
                    twice[order[j]] = sum;
                }
                start = k;
            }
        }
        return twice;
    }

    private static final int DIGIT_BITS = 12;

    /** Stable LSD radix sort, as unsigned numbers, of keys already ordered in their lowest {@code skipBits}. */
    private static void radixSort(long[] keys, int skipBits) {
        long[] from = keys;
        long[] to = new long[keys.length];
        int[] count = new int[1 << DIGIT_BITS];
        int digitMask = (1 << DIGIT_BITS) - 1;
        for (int shift = skipBits; shift < 64; shift += DIGIT_BITS) {
            Arrays.fill(count, 0);
            for (long k : from) {
                count[(int) ((k >>> shift) & digitMask)]++;
            }
            if (count[(int) ((from[0] >>> shift) & digitMask)] == from.length) {
                continue; // every key has this digit: the pass would not move anything
            }
            int position = 0;
            for (int d = 0; d < count.length; d++) {
                int c = count[d];
                count[d] = position;
                position += c;
            }
            for (long k : from) {
                to[count[(int) ((k >>> shift) & digitMask)]++] = k;
            }
            long[] swap = from;
            from = to;
            to = swap;
        }
        if (from != keys) {
            System.arraycopy(from, 0, keys, 0, keys.length);
        }
    }

    private static long sortable(double v) {
        long bits = Double.doubleToLongBits(v + 0.0);
        return bits ^ ((bits >> 63) & 0x7fffffffffffffffL);
    }
}
