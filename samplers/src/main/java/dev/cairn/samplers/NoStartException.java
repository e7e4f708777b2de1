package dev.cairn.samplers;

/**
 * A chain found no starting point with a finite log density: the target is zero (or not a number) wherever
 * its initializer looked, which for a model usually means data it cannot produce.
 */
public final class NoStartException extends IllegalStateException {
    private final int chain;

    /**
     * @param chain    the chain, 1-based
     * @param attempts how many starting points were tried
     */
    public NoStartException(int chain, int attempts) {
        super("chain " + chain + ": no starting point with finite log density in " + attempts + " attempts");
        this.chain = chain;
    }

    /** {@return the chain, 1-based} */
    public int chain() {
        return chain;
    }
}
