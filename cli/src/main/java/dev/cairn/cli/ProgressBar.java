package dev.cairn.cli;

import dev.cairn.samplers.Progress;
import dev.cairn.samplers.ProgressTally;
import java.io.PrintStream;
import java.util.Locale;

/**
 * A one-line progress bar on stderr for fits that take more than about a second: share of all chains'
 * iterations done, whether chains are still warming up, and the time left. Drawn only when the process
 * has a terminal, at most ten times a second, and erased when the fit ends.
 */
final class ProgressBar extends ProgressTally {
    private static final long DELAY_NANOS = 1_000_000_000L;
    private static final long INTERVAL_NANOS = 100_000_000L;
    private final PrintStream err;
    private final String label;
    private final long start = System.nanoTime();
    private long lastDrawn;
    private boolean drawn;

    private final long delayNanos;
    private final long intervalNanos;

    private ProgressBar(PrintStream err, String label, long delayNanos, long intervalNanos) {
        this.err = err;
        this.label = label;
        this.delayNanos = delayNanos;
        this.intervalNanos = intervalNanos;
    }

    /** A bar drawing to {@code err} at every report from the start (for tests). */
    static ProgressBar immediate(PrintStream err, String label) {
        return new ProgressBar(err, label, 0, 0);
    }

    /** A bar when stderr is (very likely) a terminal and not silenced; else the no-op progress. */
    static Progress forTerminal(boolean quiet, String label) {
        boolean terminal = System.console() != null && !"dumb".equals(System.getenv("TERM"));
        return quiet || !terminal ? Progress.NONE : new ProgressBar(System.err, label, DELAY_NANOS, INTERVAL_NANOS);
    }

    @Override
    public void report(int chain, long iterations, long total, boolean warming) {
        super.report(chain, iterations, total, warming);
        long now = System.nanoTime();
        if (now - start < delayNanos) {
            return;
        }
        synchronized (this) {
            if (now - lastDrawn < intervalNanos && iterations < total) {
                return;
            }
            lastDrawn = now;
            long sumDone = done(), sumTotal = total();
            if (sumTotal == 0) {
                return;
            }
            double share = share();
            boolean warmup = warmup();
            double elapsed = (now - start) / 1e9;
            double left = share > 0 ? elapsed * (1 - share) / share : Double.NaN;
            int width = 30;
            int filled = (int) Math.round(share * width);
            err.print(String.format(Locale.ROOT, "\r%s [%s%s] %3.0f%% %s  %d/%d iterations  about %.0f s left ", label,
                    "#".repeat(filled), ".".repeat(width - filled), 100 * share, warmup ? "warmup  " : "sampling",
                    sumDone, sumTotal, left));
            err.flush();
            drawn = true;
        }
    }

    /** Erases the bar (call when the fit ends). */
    synchronized void finish() {
        if (drawn) {
            err.print("\r" + " ".repeat(100) + "\r");
            err.flush();
        }
    }

    static void finish(Progress p) {
        if (p instanceof ProgressBar bar) {
            bar.finish();
        }
    }
}
