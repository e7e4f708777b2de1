package dev.cairn.samplers;

/**
 * Maps a parameter's natural (constrained) scale to the whole real line, where the samplers move.
 *
 * <p>For a constrained value x = g(u) of an unconstrained u, a density p(x) on the constrained scale
 * becomes p(g(u)) |g'(u)| on the unconstrained one; {@link #logJacobian(double)} is log |g'(u)|.
 * <ul>
 *   <li>{@link #REAL}: x = u, log-Jacobian 0;</li>
 *   <li>{@link #POSITIVE}: x = exp(u), log-Jacobian u;</li>
 *   <li>{@link #UNIT_INTERVAL}: x = 1 / (1 + exp(-u)), log-Jacobian log x + log(1 - x).</li>
 * </ul>
 */
public enum Transform {
    REAL {
        @Override public double constrain(double u) { return u; }
        @Override public double unconstrain(double x) { return x; }
        @Override public double logJacobian(double u) { return 0.0; }
        @Override boolean admits(double x) { return Double.isFinite(x); }
    },
    POSITIVE {
        @Override public double constrain(double u) { return Math.exp(u); }
        @Override public double unconstrain(double x) { return Math.log(x); }
        @Override public double logJacobian(double u) { return u; }
        @Override boolean admits(double x) { return x > 0 && x < Double.POSITIVE_INFINITY; }
    },
    UNIT_INTERVAL {
        @Override public double constrain(double u) {
            return u >= 0 ? 1.0 / (1.0 + Math.exp(-u)) : Math.exp(u) / (1.0 + Math.exp(u));
        }
        @Override public double unconstrain(double x) { return Math.log(x) - Math.log1p(-x); }
        @Override public double logJacobian(double u) {
            // log(x(1-x)) = -softplus(u) - softplus(-u), computed without overflow.
            return -softplus(u) - softplus(-u);
        }
        @Override boolean admits(double x) { return x > 0 && x < 1; }
    };

    /**
     * The constrained value of an unconstrained coordinate.
     *
     * @param u the unconstrained coordinate
     * @return the value on the parameter's own scale
     */
    public abstract double constrain(double u);

    /**
     * The unconstrained coordinate of a constrained value.
     *
     * @param x a value inside the parameter's support
     * @return the unconstrained coordinate
     */
    public abstract double unconstrain(double x);

    /**
     * log |d constrain(u) / du|, which a density on the constrained scale adds on the unconstrained one.
     *
     * @param u the unconstrained coordinate
     * @return the log Jacobian
     */
    public abstract double logJacobian(double u);

    /** Whether x lies strictly inside this transform's range. */
    abstract boolean admits(double x);

    static double softplus(double z) {
        return z > 0 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z));
    }
}
