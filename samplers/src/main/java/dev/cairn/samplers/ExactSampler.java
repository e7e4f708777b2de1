package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * Independent draws from a posterior known in closed form (fully conjugate models). Run through
 * {@link ChainRunner#runExact} it yields the same {@link Draws} as MCMC, so the same diagnostics apply.
 */
@FunctionalInterface
public interface ExactSampler {
    /** Writes one posterior draw, on the parameters' natural scale and in their order, into {@code out}. */
    void draw(UniformRandomProvider rng, double[] out);
}
