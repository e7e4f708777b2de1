package dev.cairn.models.prior;

/**
 * The conjugate prior of a normal mean and variance: mu | sigma² ~ N(mu0, sigma² / kappa0),
 * sigma² ~ Inv-Gamma(alpha0, beta0) (Murphy 2007, "Conjugate Bayesian analysis of the Gaussian
 * distribution"). A joint prior on two quantities, so not a {@link Prior}; the models that use it update it
 * in closed form.
 *
 * @param mu0    prior mean of mu
 * @param kappa0 prior weight of mu0, in observations, &gt; 0
 * @param alpha0 shape of sigma², &gt; 0
 * @param beta0  scale of sigma², &gt; 0
 */
public record NormalInverseGamma(double mu0, double kappa0, double alpha0, double beta0) {
    public NormalInverseGamma {
        Prior.finite("normal-inverse-gamma", "mu0", mu0);
        Prior.positive("normal-inverse-gamma", "kappa0", kappa0);
        Prior.positive("normal-inverse-gamma", "alpha0", alpha0);
        Prior.positive("normal-inverse-gamma", "beta0", beta0);
    }

    /** {@return the family's name as the spec writes it} */
    public String family() {
        return "normal-inverse-gamma";
    }

    /**
     * The joint log density of (mu, sigma) — the sd, not the variance — dropping the constants: with
     * v = sigma², -(alpha0 + 1) log v - beta0 / v - kappa0 (mu - mu0)² / (2 v). (The normal's
     * -1/2 log v cancels against the Jacobian 2 sigma of v = sigma².)
     *
     * @param mu    the mean
     * @param sigma the sd, &gt; 0
     * @return log p(mu, sigma) + constant
     */
    public double logDensityOnSd(double mu, double sigma) {
        if (!(sigma > 0)) {
            return Double.NEGATIVE_INFINITY;
        }
        double v = sigma * sigma;
        return -(alpha0 + 1) * Math.log(v) - beta0 / v - kappa0 * (mu - mu0) * (mu - mu0) / (2 * v);
    }

    /**
     * The posterior after m observations with sum S1 and sum of squares S2 (Murphy 2007, eqs. 86-89):
     * kappa_n = kappa0 + m, mu_n = (kappa0 mu0 + S1) / kappa_n, alpha_n = alpha0 + m / 2,
     * beta_n = beta0 + (S2 - S1^2 / m) / 2 + kappa0 m (S1 / m - mu0)^2 / (2 kappa_n); the prior itself when m = 0.
     *
     * @param m  observations
     * @param s1 their sum
     * @param s2 the sum of their squares
     * @return {mu_n, kappa_n, alpha_n, beta_n}
     */
    public double[] posterior(long m, double s1, double s2) {
        if (m == 0) {
            return new double[] {mu0, kappa0, alpha0, beta0};
        }
        double kn = kappa0 + m;
        double ybar = s1 / m;
        double within = Math.max(0, s2 - s1 * s1 / m);
        double mun = (kappa0 * mu0 + s1) / kn;
        double an = alpha0 + m / 2.0;
        double bn = beta0 + 0.5 * within + kappa0 * m * (ybar - mu0) * (ybar - mu0) / (2 * kn);
        return new double[] {mun, kn, an, bn};
    }
}
