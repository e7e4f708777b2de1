package dev.cairn.samplers;

/**
 * How long and how many chains to run.
 *
 * @param chains  number of chains, >= 1
 * @param warmup  adapted iterations per chain, discarded, >= 0
 * @param draws   kept draws per chain (after thinning), >= 1
 * @param thin    keep every thin-th iteration after warmup, >= 1
 * @param seed    the run's seed; chain c's stream derives from (seed, c) only
 * @param threads worker threads, >= 1; results do not depend on it
 */
public record RunSettings(int chains, int warmup, int draws, int thin, long seed, int threads) {
    /** Iterations a chain may run at the most: keeps memory for draws bounded and sizes sane. */
    public static final long MAX_ITERATIONS = 100_000_000L;

    public RunSettings {
        if (chains < 1) {
            throw new IllegalArgumentException("chains must be >= 1, was " + chains);
        }
        if (warmup < 0) {
            throw new IllegalArgumentException("warmup must be >= 0, was " + warmup);
        }
        if (draws < 1) {
            throw new IllegalArgumentException("draws must be >= 1, was " + draws);
        }
        if (thin < 1) {
            throw new IllegalArgumentException("thin must be >= 1, was " + thin);
        }
        if (threads < 1) {
            throw new IllegalArgumentException("threads must be >= 1, was " + threads);
        }
        if (warmup + (long) draws * thin > MAX_ITERATIONS) {
            throw new IllegalArgumentException("warmup + draws x thin must be <= " + MAX_ITERATIONS
                    + ", was " + (warmup + (long) draws * thin));
        }
    }

    /**
     * Settings with thinning 1 and one thread per chain up to the number of processors.
     *
     * @param chains chains, >= 1
     * @param warmup warmup iterations per chain, >= 0
     * @param draws  kept draws per chain, >= 1
     * @param seed   the run's seed
     * @return the settings
     * @throws IllegalArgumentException naming the bad value
     */
    public static RunSettings of(int chains, int warmup, int draws, long seed) {
        int threads = Math.max(1, Math.min(Math.max(chains, 1), Runtime.getRuntime().availableProcessors()));
        return new RunSettings(chains, warmup, draws, 1, seed, threads);
    }

    /**
     * The same settings on {@code n} threads (the draws do not depend on it).
     *
     * @param n threads, >= 1
     * @return the settings
     * @throws IllegalArgumentException when n < 1
     */
    public RunSettings withThreads(int n) {
        return new RunSettings(chains, warmup, draws, thin, seed, n);
    }

    /**
     * The same settings keeping every k-th iteration after warmup.
     *
     * @param k the thinning interval, >= 1
     * @return the settings
     * @throws IllegalArgumentException when k < 1 or the iterations exceed the limit
     */
    public RunSettings withThin(int k) {
        return new RunSettings(chains, warmup, draws, k, seed, threads);
    }

    /** {@return iterations each chain runs: warmup plus draws x thin} */
    public long iterationsPerChain() {
        return warmup + (long) draws * thin;
    }
}
