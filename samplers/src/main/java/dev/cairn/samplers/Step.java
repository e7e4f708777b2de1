package dev.cairn.samplers;

/**
 * One update in a sweep. A step is immutable settings; {@link #start} hands each chain its own
 * {@link Updater}, bound to the chain's random stream, which holds the chain's adapted tuning.
 */
public interface Step {

    /**
     * A fresh per-chain updater.
     *
     * @param target the chain's target density
     * @param stream the chain's random stream, which the updater keeps for all its draws
     * @return the updater
     */
    Updater start(Target target, org.apache.commons.rng.UniformRandomProvider stream);

    /** The per-chain, mutable half of a step. */
    interface Updater {
        /**
         * Moves the chain's state. When {@code adapt} is true (warmup only) the updater may tune itself;
         * when false its tuning is frozen.
         */
        void update(ChainState state, boolean adapt);
    }
}
