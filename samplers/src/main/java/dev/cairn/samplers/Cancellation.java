package dev.cairn.samplers;

import java.util.concurrent.atomic.AtomicBoolean;

/** A flag another thread sets to stop a run; chains check it between iterations. */
public final class Cancellation {
    private final AtomicBoolean cancelled = new AtomicBoolean();

    public void cancel() {
        cancelled.set(true);
    }

    public boolean isCancelled() {
        return cancelled.get();
    }
}
