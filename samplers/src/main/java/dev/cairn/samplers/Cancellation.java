package dev.cairn.samplers;

import java.util.concurrent.atomic.AtomicBoolean;

/**
 * How a run may be stopped: a flag another thread sets (chains check it between iterations), and the most
 * values a run may keep (chains x draws x recorded quantities), checked before anything is allocated, so a
 * service can refuse a fit that would not fit in its memory.
 */
public final class Cancellation {
    private final AtomicBoolean cancelled = new AtomicBoolean();
    private final long maxKeptValues;

    /** No limit on the kept values. */
    public Cancellation() {
        this(Long.MAX_VALUE);
    }

    /**
     * @param maxKeptValues the most values (chains x draws x recorded quantities) a run may keep, >= 1
     */
    public Cancellation(long maxKeptValues) {
        if (maxKeptValues < 1) {
            throw new IllegalArgumentException("maxKeptValues must be >= 1, was " + maxKeptValues);
        }
        this.maxKeptValues = maxKeptValues;
    }

    /**
     * Asks every chain that polls this to stop after its current iteration.
     */
    public void cancel() {
        cancelled.set(true);
    }

    /**
     * {@return whether {@link #cancel} has been called}
     */
    public boolean isCancelled() {
        return cancelled.get();
    }

    /** {@return the most values a run may keep} */
    public long maxKeptValues() {
        return maxKeptValues;
    }

    /**
     * Refuses a run that would keep more values than allowed.
     *
     * @param chains     chains of the run
     * @param draws      kept draws per chain
     * @param quantities values recorded per draw
     * @throws RunTooLargeException when chains x draws x quantities exceeds {@link #maxKeptValues()}
     */
    public void admit(int chains, int draws, int quantities) {
        if (values(chains, draws, quantities) > maxKeptValues) {
            throw new RunTooLargeException(chains, draws, quantities, maxKeptValues);
        }
    }

    /** chains x draws x quantities, saturating at Long.MAX_VALUE (ints: the first product cannot overflow). */
    static long values(int chains, int draws, int quantities) {
        long perQuantity = (long) chains * draws;
        return quantities > 0 && perQuantity > Long.MAX_VALUE / quantities ? Long.MAX_VALUE : perQuantity * quantities;
    }
}
