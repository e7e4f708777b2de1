package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/** Chooses a chain's starting point on the unconstrained scale. */
@FunctionalInterface
public interface Initializer {

    double[] start(int chain, Parameters parameters, UniformRandomProvider rng);

    /**
     * Dispersed starts: every unconstrained coordinate uniform on (-radius, radius), so chains begin far
     * enough apart for R-hat to see a failure to mix.
     */
    static Initializer uniform(double radius) {
        if (!(radius > 0) || Double.isInfinite(radius)) {
            throw new IllegalArgumentException("initial radius must be a finite number > 0, was " + radius);
        }
        return (chain, parameters, rng) -> {
            double[] u = new double[parameters.size()];
            for (int i = 0; i < u.length; i++) {
                u[i] = radius * (2 * rng.nextDouble() - 1);
            }
            return u;
        };
    }

    /** The same start (given on the natural, constrained scale) for every chain. */
    static Initializer fixed(double... constrained) {
        double[] copy = constrained.clone();
        for (int i = 0; i < copy.length; i++) {
            if (!Double.isFinite(copy[i])) {
                throw new IllegalArgumentException("initial value " + (i + 1) + " must be finite, was " + copy[i]);
            }
        }
        return (chain, parameters, rng) -> parameters.unconstrain(copy);
    }
}
