package dev.cairn.models;

import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Progress;

/**
 * How a fit reports and may be stopped: progress callback, cancellation and the number of threads
 * (null: the spec's setting, else one per chain up to the processors). Results never depend on threads.
 */
public record FitOptions(Progress progress, Cancellation cancellation, Integer threads) {
    public static final FitOptions DEFAULT = new FitOptions(Progress.NONE, new Cancellation(), null);

    /**
     * The same options running chains on {@code n} threads (the draws do not depend on it).
     *
     * @param n threads, >= 1
     * @return the options
     */
    public FitOptions withThreads(int n) {
        return new FitOptions(progress, cancellation, n);
    }

    /**
     * The same options reporting progress to {@code p}.
     *
     * @param p receives each chain's progress
     * @return the options
     */
    public FitOptions withProgress(Progress p) {
        return new FitOptions(p, cancellation, threads);
    }
}
