package dev.cairn.samplers;

import java.util.List;
import java.util.function.Supplier;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.RealDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Samplers against posteriors known in closed form. Reference distributions and quantiles come from
 * commons-math3; tolerances are 4 batch-means standard errors of the run itself.
 */
class ConjugatePosteriorTest {
    private static final double[] PROBABILITIES = {0.025, 0.5, 0.975};
    private static final RunSettings SETTINGS = RunSettings.of(4, 500, 4000, 20251202L);

    static List<Object[]> sweeps() {
        return List.of(
                new Object[] {"slice", (Supplier<Sweep>) () -> Sweep.of(SliceStep.of(1.0))},
                new Object[] {"metropolis-within-gibbs", (Supplier<Sweep>) () -> Sweep.of(MetropolisStep.of(1.0))},
                new Object[] {"block metropolis", (Supplier<Sweep>) () -> Sweep.of(BlockMetropolisStep.of(1.0))});
    }

    /**
     * Normal mean with known sd: prior theta ~ N(m0, s0^2), n observations with mean ybar and sd sigma give
     * theta | y ~ N(m_n, s_n^2), 1/s_n^2 = 1/s0^2 + n/sigma^2, m_n = s_n^2 (m0/s0^2 + n ybar/sigma^2)
     * (Gelman et al., Bayesian Data Analysis 3rd ed., section 2.5, eqs. 2.11-2.12).
     */
    @ParameterizedTest(name = "{0}")
    @MethodSource("sweeps")
    void normalMeanWithKnownSd(String method, Supplier<Sweep> sweep) {
        double m0 = 0, s0 = 2, sigma = 3, ybar = 1.5;
        int n = 12;
        Target target = Target.of(Parameters.real("theta"), x -> {
            double t = x[0];
            return -0.5 * (t - m0) * (t - m0) / (s0 * s0) - 0.5 * n * (ybar - t) * (ybar - t) / (sigma * sigma);
        });
        double precision = 1 / (s0 * s0) + n / (sigma * sigma);
        double sn = Math.sqrt(1 / precision);
        double mn = (m0 / (s0 * s0) + n * ybar / (sigma * sigma)) / precision;

        Draws draws = ChainRunner.of(SETTINGS).run(target, sweep.get(), Initializer.uniform(2));
        check(draws.column("theta"), new NormalDistribution(mn, sn), method + " theta");
    }

    /**
     * Binomial rate: prior Beta(a, b), k successes in n trials give Beta(a + k, b + n - k)
     * (Bayesian Data Analysis 3rd ed., section 2.4). Sampled on the logit scale, so this also checks the
     * unit-interval transform's Jacobian end to end.
     */
    @ParameterizedTest(name = "{0}")
    @MethodSource("sweeps")
    void binomialRateWithBetaPrior(String method, Supplier<Sweep> sweep) {
        double a = 2, b = 3;
        int k = 17, n = 60;
        Parameters p = Parameters.builder().unitInterval("rate").build();
        Target target = Target.onConstrainedScale(p,
                x -> (a - 1 + k) * Math.log(x[0]) + (b - 1 + n - k) * Math.log1p(-x[0]));

        Draws draws = ChainRunner.of(SETTINGS).run(target, sweep.get(), Initializer.uniform(2));
        check(draws.column("rate"), new BetaDistribution(a + k, b + n - k), method + " rate");
    }

    /**
     * Normal with unknown mean and variance under a Normal-Inverse-Gamma(mu0, kappa0, alpha0, beta0) prior:
     * sigma^2 | y ~ Inv-Gamma(alpha_n, beta_n) and mu | y ~ t_{2 alpha_n}(mu_n, beta_n / (alpha_n kappa_n))
     * (Murphy 2007, "Conjugate Bayesian analysis of the Gaussian distribution", section 3, eqs. 85-89).
     * Two coordinates, one of them positive: the sweep must handle dependence and the log transform.
     */
    @ParameterizedTest(name = "{0}")
    @MethodSource("sweeps")
    void normalWithUnknownMeanAndVariance(String method, Supplier<Sweep> sweep) {
        double mu0 = 1, kappa0 = 0.5, alpha0 = 3, beta0 = 2;
        int n = 20;
        double ybar = 2.2, ss = 30.0; // sum of squared deviations from ybar
        Parameters p = Parameters.builder().real("mu").positive("variance").build();
        Target target = Target.onConstrainedScale(p, x -> {
            double mu = x[0], v = x[1];
            return -(alpha0 + 1 + 0.5 + 0.5 * n) * Math.log(v) - beta0 / v
                    - kappa0 * (mu - mu0) * (mu - mu0) / (2 * v)
                    - (ss + n * (ybar - mu) * (ybar - mu)) / (2 * v);
        });
        double kn = kappa0 + n;
        double mun = (kappa0 * mu0 + n * ybar) / kn;
        double an = alpha0 + n / 2.0;
        double bn = beta0 + 0.5 * ss + kappa0 * n * (ybar - mu0) * (ybar - mu0) / (2 * kn);

        Draws draws = ChainRunner.of(SETTINGS).run(target, sweep.get(), Initializer.uniform(2));
        RealDistribution t = new TDistribution(2 * an);
        double scale = Math.sqrt(bn / (an * kn));
        double[][] mu = draws.column("mu");
        MonteCarlo.assertMean(mu, mun, method + " mu");
        MonteCarlo.assertSd(mu, mun, scale * Math.sqrt(t.getNumericalVariance()), method + " mu");
        for (double q : PROBABILITIES) {
            MonteCarlo.assertQuantile(mu, q, mun + scale * t.inverseCumulativeProbability(q), method + " mu");
        }
        // 1/sigma^2 ~ Gamma(shape alpha_n, scale 1/beta_n): the q-quantile of sigma^2 is 1/(the (1-q)-quantile).
        GammaDistribution precision = new GammaDistribution(an, 1 / bn);
        double[][] v = draws.column("variance");
        MonteCarlo.assertMean(v, bn / (an - 1), method + " variance");
        for (double q : PROBABILITIES) {
            MonteCarlo.assertQuantile(v, q, 1 / precision.inverseCumulativeProbability(1 - q), method + " variance");
        }
    }

    private static void check(double[][] chains, RealDistribution reference, String what) {
        double mean = reference.getNumericalMean();
        MonteCarlo.assertMean(chains, mean, what);
        MonteCarlo.assertSd(chains, mean, Math.sqrt(reference.getNumericalVariance()), what);
        for (double q : PROBABILITIES) {
            MonteCarlo.assertQuantile(chains, q, reference.inverseCumulativeProbability(q), what);
        }
    }
}
