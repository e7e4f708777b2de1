package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SpendData;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import java.util.List;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.LogNormalDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.api.Test;

/** The exact spend posterior against closed-form marginals computed with commons-math3. */
class SpendExactTest {
    static final int DRAWS = 20_000;
    static final double[] PROBABILITIES = {0.025, 0.25, 0.5, 0.75, 0.975};

    // Test inputs (not a published dataset): 4,000 users, 120 payers whose log spend has mean 1.5 and
    // sum of squared deviations 150.
    static final ArmStats ARM = ArmStats.summary("A", 4000, 120, 120 * 1.5, 150 + 120 * 1.5 * 1.5);
    static final ArmStats OTHER = ArmStats.summary("B", 3000, 70, 70 * 1.2, 90 + 70 * 1.2 * 1.2);
    static final SpendData DATA = new SpendData(List.of(ARM, OTHER), true, "test", 7000, List.of(), "");
    static final SpendPriors PRIORS = new SpendPriors(new dev.cairn.models.prior.Beta(2, 30),
            new dev.cairn.models.prior.NormalInverseGamma(1.0, 0.5, 2.0, 1.5), null, null, "spec", null);

    static Draws exact() {
        return SpendPosterior.exact(DATA, PRIORS, RunSettings.of(4, 0, DRAWS, 99), Progress.NONE, new Cancellation());
    }

    /** i.i.d. draws: the share below the reference p-quantile is p within 4 binomial standard errors. */
    static void assertQuantiles(double[] draws, java.util.function.DoubleUnaryOperator referenceQuantile, String what) {
        for (double p : PROBABILITIES) {
            double q = referenceQuantile.applyAsDouble(p);
            long below = java.util.Arrays.stream(draws).filter(x -> x <= q).count();
            double share = (double) below / draws.length;
            double se = Math.sqrt(p * (1 - p) / draws.length);
            assertEquals(p, share, 4 * se, what + " at p=" + p + " (reference quantile " + q + ")");
        }
    }

    /** Payer rate: Beta(a + m, b + n - m) (BDA3 section 2.4); reference quantiles from commons-math3. */
    @Test
    void payerRateIsBeta() {
        BetaDistribution beta = new BetaDistribution(2 + 120, 30 + 4000 - 120);
        assertQuantiles(exact().pooled("payerRate[A]"), beta::inverseCumulativeProbability, "payer rate");
    }

    /**
     * Marginal of mu: Student-t with 2 alpha_n degrees of freedom, location mu_n, scale
     * sqrt(beta_n / (alpha_n kappa_n)); sigma^2: Inverse-Gamma(alpha_n, beta_n) (Murphy 2007, eqs. 86-91).
     * The updated hyperparameters are computed here independently of the model code.
     */
    @Test
    void logSpendMeanIsStudentTAndVarianceIsInverseGamma() {
        double m = 120, ybar = 1.5, ss = 150;
        double kn = 0.5 + m;
        double mun = (0.5 * 1.0 + m * ybar) / kn;
        double an = 2.0 + m / 2;
        double bn = 1.5 + ss / 2 + 0.5 * m * (ybar - 1.0) * (ybar - 1.0) / (2 * kn);
        TDistribution t = new TDistribution(2 * an);
        double scale = Math.sqrt(bn / (an * kn));
        Draws d = exact();
        assertQuantiles(d.pooled("logSpendMean[A]"), p -> mun + scale * t.inverseCumulativeProbability(p), "mu");
        GammaDistribution precision = new GammaDistribution(an, 1 / bn);
        double[] variance = java.util.Arrays.stream(d.pooled("logSpendSd[A]")).map(s -> s * s).toArray();
        assertQuantiles(variance, p -> 1 / precision.inverseCumulativeProbability(1 - p), "sigma^2");
    }

    /**
     * The mean of a lognormal with log-mean mu and log-sd sigma is exp(mu + sigma^2 / 2) (standard result;
     * checked here against commons-math3's LogNormalDistribution), and ARPU = payer rate x ARPPU holds in
     * every draw.
     */
    @Test
    void arppuIsTheLognormalMeanAndArpuDecomposes() {
        assertEquals(new LogNormalDistribution(1.3, 0.9).getNumericalMean(), Math.exp(1.3 + 0.81 / 2), 1e-12);
        Draws d = SpendAnalysis.withDerived(exact(), DATA);
        double[] mu = d.pooled("logSpendMean[B]");
        double[] sigma = d.pooled("logSpendSd[B]");
        double[] rate = d.pooled("payerRate[B]");
        double[] arppu = d.pooled("arppu[B]");
        double[] arpu = d.pooled("arpu[B]");
        for (int i = 0; i < mu.length; i += 97) {
            double expected = new LogNormalDistribution(mu[i], sigma[i]).getNumericalMean();
            assertEquals(expected, arppu[i], 1e-12 * expected);
            assertEquals(rate[i] * arppu[i], arpu[i], 1e-15);
        }
    }

    /** With no payers, the log-spend posterior is the prior (nothing to update). */
    @Test
    void anArmWithoutPayersKeepsThePrior() {
        double[] post = SpendPosterior.nigPosterior(PRIORS.logSpend(), ArmStats.summary("Z", 50, 0, 0, 0));
        assertEquals(1.0, post[0]);
        assertEquals(0.5, post[1]);
        assertEquals(2.0, post[2]);
        assertEquals(1.5, post[3]);
        assertTrue(SpendFit.method("auto", PRIORS, DATA).equals("exact"));
    }
}
