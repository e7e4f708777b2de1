package dev.cairn.models;

/**
 * The normal hierarchy with known sampling variances (Gelman et al., Bayesian Data Analysis, 3rd ed.,
 * sections 5.4-5.5; the marginal of tau is their equation 5.21):
 * <pre>
 *   y_j | theta_j ~ N(theta_j, v_j),   theta_j | mu, tau ~ N(mu, tau^2),   mu ~ N(m0, V0) (V0 = infinity: flat)
 * </pre>
 * Given tau, mu has a normal posterior ({@link #meanGivenTau}); given mu and tau each theta_j is normal
 * ({@link #effectGiven}); and tau has the marginal likelihood ({@link #logMarginal})
 * <pre>
 *   log p(y | tau) = 1/2 log V_mu - sum_j 1/2 [log(v_j + tau^2) + (y_j - mu_hat)^2 / (v_j + tau^2)]
 *                    - (mu_hat - m0)^2 / (2 V0)   + constant
 * </pre>
 * with mu_hat, V_mu the posterior mean and variance of mu given tau. A group with v_j = infinity carries no
 * information and drops out. Immutable; the arrays are not copied (the caller keeps them fixed while using it).
 */
public final class KnownVarianceHierarchy {
    private final double[] y;
    private final double[] v;
    private final double priorMean;
    private final double priorVariance;

    private KnownVarianceHierarchy(double[] y, double[] v, double priorMean, double priorVariance) {
        this.y = y;
        this.v = v;
        this.priorMean = priorMean;
        this.priorVariance = priorVariance;
    }

    /**
     * @param y             the estimates (not modified)
     * @param v             their variances, > 0 (infinity: no information) (not modified)
     * @param priorMean     m0
     * @param priorVariance V0, > 0 (infinity: flat)
     * @return the hierarchy
     * @throws IllegalArgumentException when the lengths differ or V0 is not > 0
     */
    public static KnownVarianceHierarchy of(double[] y, double[] v, double priorMean, double priorVariance) {
        if (y.length != v.length) {
            throw new IllegalArgumentException(y.length + " estimates for " + v.length + " variances");
        }
        if (!(priorVariance > 0)) {
            throw new IllegalArgumentException("prior variance of mu must be > 0, was " + priorVariance);
        }
        return new KnownVarianceHierarchy(y, v, priorMean, priorVariance);
    }

    /**
     * The normal posterior of mu given tau.
     *
     * @param tau the between-group sd, >= 0
     * @return the posterior of mu
     */
    public NormalMean meanGivenTau(double tau) {
        NormalMean m = NormalMean.prior(priorMean, priorVariance);
        double t2 = tau * tau;
        for (int j = 0; j < y.length; j++) {
            m.add(y[j], v[j] + t2);
        }
        return m;
    }

    /**
     * log p(y | tau) up to a constant, with mu integrated out (equation 5.21; prior of tau not included).
     *
     * @param tau the between-group sd, >= 0
     * @return the log marginal likelihood
     */
    public double logMarginal(double tau) {
        double t2 = tau * tau;
        // one pass for the posterior of mu (the precision-weighted mean of the y_j with variances v_j + tau^2)
        double precision = Double.isInfinite(priorVariance) ? 0 : 1 / priorVariance;
        double weighted = Double.isInfinite(priorVariance) ? 0 : priorMean / priorVariance;
        for (int j = 0; j < y.length; j++) {
            if (Double.isFinite(v[j])) {
                double w = 1 / (v[j] + t2);
                precision += w;
                weighted += y[j] * w;
            }
        }
        double muHat = weighted / precision;
        // sum log(v_j + tau^2) as the log of products of up to 16 factors: one logarithm per 16 groups (a
        // product is flushed early before it could leave the range of doubles)
        double lp = -0.5 * Math.log(precision), product = 1;
        int factors = 0;
        double logSum = 0;
        for (int j = 0; j < y.length; j++) {
            if (Double.isFinite(v[j])) {
                double total = v[j] + t2;
                lp -= 0.5 * (y[j] - muHat) * (y[j] - muHat) / total;
                product *= total;
                if (++factors == 16 || product < 1e-200 || product > 1e200) {
                    logSum += Math.log(product);
                    product = 1;
                    factors = 0;
                }
            }
        }
        lp -= 0.5 * (logSum + Math.log(product));
        if (Double.isFinite(priorVariance)) {
            lp -= (muHat - priorMean) * (muHat - priorMean) / (2 * priorVariance);
        }
        return lp;
    }

    /**
     * The normal posterior of theta_j given mu and tau.
     *
     * @param j   the group
     * @param mu  the population mean
     * @param tau the between-group sd, > 0
     * @return the posterior of theta_j
     */
    public NormalMean effectGiven(int j, double mu, double tau) {
        return NormalMean.prior(mu, tau * tau).add(y[j], v[j]);
    }
}
