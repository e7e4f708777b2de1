package dev.cairn.samplers;

/**
 * One update in a sweep. A step is immutable settings; {@link #start} hands each chain its own
 * {@link Updater}, which holds the chain's adapted tuning.
 */
public interface Step {

    /** A fresh per-chain updater for {@code target}. */
    Updater start(Target target);

    /** The per-chain, mutable half of a step. */
    interface Updater {
        /**
         * Moves the chain's state. When {@code adapt} is true (warmup only) the updater may tune itself;
         * when false its tuning is frozen.
         */
        void update(ChainState state, org.apache.commons.rng.UniformRandomProvider rng, boolean adapt);
    }
}
