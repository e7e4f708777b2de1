package dev.cairn.models.segmented;

/**
 * A one-dimensional Metropolis-Hastings move proposed from the Gaussian that matches the log target's slope
 * g and curvature -h (h > 0) at the current point: delta ~ N(g / h, 1 / h), one Newton step with its own
 * uncertainty. The reverse proposal is the same Gaussian taken at the proposed point, so the acceptance
 * ratio is
 * <pre>
 *   log a = f(delta) - f(0) + log N(0 | delta + g1/h1, 1/h1) - log N(delta | g0/h0, 1/h0)
 * </pre>
 * For a log-concave target that is close to quadratic (a shift of many cells' values) nearly every proposal
 * is accepted and lands an independent draw away.
 */
final class NewtonProposal {
    private NewtonProposal() {
    }

    /**
     * @param slope     g at the current point
     * @param curvature h at the current point, > 0
     * @param normal    a standard normal draw
     * @return the proposed change delta
     */
    static double draw(double slope, double curvature, double normal) {
        return slope / curvature + normal / Math.sqrt(curvature);
    }

    /**
     * @param f0 log target at the current point; g0, h0 its slope and curvature there
     * @param f1 log target at the proposed point; g1, h1 its slope and curvature there
     * @param delta the proposed change
     * @return the log acceptance ratio (negative infinity when h1 is not > 0 or a value is not finite)
     */
    static double logRatio(double f0, double g0, double h0, double f1, double g1, double h1, double delta) {
        if (!(h1 > 0) || !Double.isFinite(f1) || !Double.isFinite(g1)) {
            return Double.NEGATIVE_INFINITY;
        }
        double back = (delta + g1 / h1) * Math.sqrt(h1), forth = (delta - g0 / h0) * Math.sqrt(h0);
        return f1 - f0 - 0.5 * back * back + 0.5 * Math.log(h1) + 0.5 * forth * forth - 0.5 * Math.log(h0);
    }
}
