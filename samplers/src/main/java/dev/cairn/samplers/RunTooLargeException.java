package dev.cairn.samplers;

import java.util.Locale;

/** A run refused before it started: it would keep more values than its {@link Cancellation} allows. */
public final class RunTooLargeException extends RuntimeException {
    private final long limit;

    RunTooLargeException(int chains, int draws, int quantities, long limit) {
        super(String.format(Locale.ROOT, "chains x draws x quantities = %,d x %,d x %,d = %,d values to keep, more than "
                + "the %,d allowed", chains, draws, quantities, Cancellation.values(chains, draws, quantities), limit));
        this.limit = limit;
    }

    /** {@return the most values the run was allowed to keep} */
    public long limit() {
        return limit;
    }
}
