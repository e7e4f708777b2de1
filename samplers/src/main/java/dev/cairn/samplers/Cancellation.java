package dev.cairn.samplers;

import java.util.concurrent.atomic.AtomicBoolean;

/** A flag another thread sets to stop a run; chains check it between iterations. */
public final class Cancellation {
    private final AtomicBoolean cancelled = new AtomicBoolean();

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
}
