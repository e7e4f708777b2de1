package dev.cairn.models;

import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Progress;

/**
 * How a fit reports and may be stopped: progress callback, cancellation and the number of threads
 * (null: the spec's setting, else one per chain up to the processors). Results never depend on threads.
 */
public record FitOptions(Progress progress, Cancellation cancellation, Integer threads) {
    public static final FitOptions DEFAULT = new FitOptions(Progress.NONE, new Cancellation(), null);

    public FitOptions withThreads(int n) {
        return new FitOptions(progress, cancellation, n);
    }

    public FitOptions withProgress(Progress p) {
        return new FitOptions(p, cancellation, threads);
    }
}
