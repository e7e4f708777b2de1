package dev.cairn.samplers;

/**
 * A target that also supplies the gradient of its log density on the unconstrained scale, for gradient-based
 * steps ({@link NutsStep}). Models write it from their sufficient statistics; tests check every gradient
 * against central finite differences.
 */
public interface GradientTarget extends Target {

    /**
     * The log density at {@code unconstrained} and its gradient.
     *
     * @param unconstrained the point (not modified)
     * @param gradient      receives d log p / d u_i for every coordinate (modified; same length as the point)
     * @return the log density (log-Jacobians included); -infinity or NaN outside the support
     */
    double logDensityAndGradient(double[] unconstrained, double[] gradient);

    /** The log density alone, through {@link #logDensityAndGradient} (override when it can be had cheaper). */
    @Override
    default double logDensity(double[] unconstrained) {
        return logDensityAndGradient(unconstrained, new double[unconstrained.length]);
    }

    /** A gradient target from a function that fills the gradient and returns the log density. */
    static GradientTarget of(Parameters parameters, Density density) {
        return new GradientTarget() {
            @Override
            public Parameters parameters() {
                return parameters;
            }

            @Override
            public double logDensityAndGradient(double[] u, double[] gradient) {
                return density.at(u, gradient);
            }
        };
    }

    /** A log density that writes its gradient into the second argument (modified) and returns its value. */
    @FunctionalInterface
    interface Density {
        double at(double[] point, double[] gradient);
    }
}
