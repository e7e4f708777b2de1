package dev.cairn.samplers;

/** Receives progress from running chains (called from worker threads; keep it cheap and thread-safe). */
@FunctionalInterface
public interface Progress {
    Progress NONE = (chain, done, total, warmup) -> { };

    /**
     * @param chain  0-based chain index
     * @param done   iterations this chain has completed, warmup included
     * @param total  iterations this chain will run
     * @param warmup whether the chain is still in warmup
     */
    void report(int chain, long done, long total, boolean warmup);

    /**
     * Called once before any chain runs, with the size of the whole run, so that a display can show one
     * overall fraction that only grows (chains that have not started yet count as not done).
     *
     * @param chains        the number of chains
     * @param totalPerChain iterations each chain will run
     */
    default void start(int chains, long totalPerChain) {
    }
}
