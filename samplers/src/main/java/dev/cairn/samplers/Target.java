package dev.cairn.samplers;

/**
 * What a sampler explores: a log density over an unconstrained vector whose coordinates are named by
 * {@link #parameters()}.
 */
public interface Target {

    Parameters parameters();

    /** Log density at an unconstrained point (log-Jacobians already included). */
    double logDensity(double[] unconstrained);

    /** A target whose density is already written on the unconstrained scale. */
    static Target of(Parameters parameters, LogDensity unconstrainedDensity) {
        return new Target() {
            @Override
            public Parameters parameters() {
                return parameters;
            }

            @Override
            public double logDensity(double[] u) {
                return unconstrainedDensity.at(u);
            }
        };
    }

    /**
     * A target from a density written on the parameters' natural scale: the sampler sees
     * log p(g(u)) + sum_i log |g_i'(u_i)|.
     */
    static Target onConstrainedScale(Parameters parameters, LogDensity constrainedDensity) {
        return new Target() {
            // One scratch vector per thread: targets are shared by chains running in parallel.
            private final ThreadLocal<double[]> scratch = ThreadLocal.withInitial(() -> new double[parameters.size()]);

            @Override
            public Parameters parameters() {
                return parameters;
            }

            @Override
            public double logDensity(double[] u) {
                double[] x = scratch.get();
                parameters.constrain(u, x);
                double lp = constrainedDensity.at(x);
                if (lp == Double.NEGATIVE_INFINITY || Double.isNaN(lp)) {
                    return lp;
                }
                return lp + parameters.logJacobian(u);
            }
        };
    }
}
