package dev.cairn.samplers;

import java.util.concurrent.atomic.AtomicIntegerArray;
import java.util.concurrent.atomic.AtomicLongArray;

/**
 * The progress of a whole run from its chains' reports: iterations done over all chains, the run's total
 * (chains that have not started yet count as not done, so the share only grows) and whether any chain is
 * still in warmup. Thread-safe; chains past the first 256 are not counted (no run has that many).
 */
public class ProgressTally implements Progress {
    private static final int MAX_CHAINS = 256;
    private final AtomicLongArray done = new AtomicLongArray(MAX_CHAINS);
    private final AtomicLongArray totals = new AtomicLongArray(MAX_CHAINS);
    private final AtomicIntegerArray inWarmup = new AtomicIntegerArray(MAX_CHAINS);
    /** The whole run's iterations, known from {@link #start}; 0 until then. */
    private volatile long runTotal;

    @Override
    public synchronized void start(int chains, long totalPerChain) {
        runTotal = (long) chains * totalPerChain;
        for (int i = 0; i < MAX_CHAINS; i++) {
            done.set(i, 0);
            totals.set(i, 0);
            inWarmup.set(i, 0);
        }
    }

    @Override
    public void report(int chain, long iterations, long total, boolean warmup) {
        if (chain >= MAX_CHAINS) {
            return;
        }
        done.set(chain, iterations);
        totals.set(chain, total);
        inWarmup.set(chain, warmup ? 1 : 0);
    }

    /** {@return iterations done over all chains} */
    public long done() {
        long sum = 0;
        for (int i = 0; i < MAX_CHAINS; i++) {
            sum += done.get(i);
        }
        return sum;
    }

    /** {@return the run's iterations: the larger of the announced total and the chains' own totals} */
    public long total() {
        long sum = 0;
        for (int i = 0; i < MAX_CHAINS; i++) {
            sum += totals.get(i);
        }
        return Math.max(sum, runTotal);
    }

    /** {@return the share of the run done, 0 to 1 (0 before anything is known)} */
    public double share() {
        long t = total();
        return t == 0 ? 0 : Math.min(1.0, (double) done() / t);
    }

    /** {@return whether some chain is still in warmup} */
    public boolean warmup() {
        for (int i = 0; i < MAX_CHAINS; i++) {
            if (inWarmup.get(i) == 1 && done.get(i) < totals.get(i)) {
                return true;
            }
        }
        return false;
    }
}
