package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * Independent draws from a posterior known in closed form (fully conjugate models). Run through
 * {@link ChainRunner#runExact} it yields the same {@link Draws} as MCMC, so the same diagnostics apply.
 * Like the steps, it hands each chain its own source bound to the chain's random stream.
 */
@FunctionalInterface
public interface ExactSampler {

    /** A per-chain source of draws using {@code rng}. */
    Source start(UniformRandomProvider rng);

    /** Per-chain draws. */
    @FunctionalInterface
    interface Source {
        /** Writes one posterior draw, on the parameters' natural scale and in their order, into {@code out}. */
        void draw(double[] out);
    }
}
