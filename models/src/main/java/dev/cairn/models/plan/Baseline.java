package dev.cairn.models.plan;

import dev.cairn.models.prior.Beta;
import dev.cairn.models.prior.NormalInverseGamma;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.AhrensDieterMarsagliaTsangGammaSampler;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * What is assumed true of the control: its payer rate and lognormal spend per payer. Either fixed, or drawn
 * anew for every simulated test from a distribution — priors (a design prior), priors fitted to history, or
 * a previous fit's posterior draws — so that the plan's figures average over what the baseline may be.
 */
public sealed interface Baseline {
    /**
     * One test's baseline.
     *
     * @param rng the test's stream (not used by a fixed baseline)
     * @return {payer rate, mean of log spend, sd of log spend}; the spend values NaN without spend
     */
    double[] draw(UniformRandomProvider rng);

    /** {@return whether the baseline carries spend per payer} */
    boolean hasSpend();

    /** {@return "fixed", "priors", "history" or "result"} */
    String source();

    /** {@return whether every test has the same baseline} */
    default boolean fixed() {
        return source().equals("fixed");
    }

    /**
     * Fixed numbers.
     *
     * @param payerRate    the payer rate
     * @param logSpendMean the mean of log spend (NaN without spend)
     * @param logSpendSd   the sd of log spend (NaN without spend)
     */
    record Fixed(double payerRate, double logSpendMean, double logSpendSd) implements Baseline {
        @Override
        public double[] draw(UniformRandomProvider rng) {
            return new double[] {payerRate, logSpendMean, logSpendSd};
        }

        @Override
        public boolean hasSpend() {
            return !Double.isNaN(logSpendSd);
        }

        @Override
        public String source() {
            return "fixed";
        }
    }

    /**
     * Drawn from distributions: p ~ Beta, and (mu, sigma^2) ~ Normal-Inverse-Gamma when spend is given.
     *
     * @param payerRate the payer rate's distribution
     * @param logSpend  the log spend's distribution, or null without spend
     * @param source    "priors" or "history"
     * @param note      how the distributions were found (null when given)
     */
    record Drawn(Beta payerRate, NormalInverseGamma logSpend, String source, String note) implements Baseline {
        @Override
        public double[] draw(UniformRandomProvider rng) {
            double p = ChengBetaSampler.of(rng, payerRate.a(), payerRate.b()).sample();
            if (logSpend == null) {
                return new double[] {p, Double.NaN, Double.NaN};
            }
            double variance = logSpend.beta0() / AhrensDieterMarsagliaTsangGammaSampler.of(rng, logSpend.alpha0(), 1).sample();
            double mu = logSpend.mu0() + Math.sqrt(variance / logSpend.kappa0())
                    * ZigguratSampler.NormalizedGaussian.of(rng).sample();
            return new double[] {p, mu, Math.sqrt(variance)};
        }

        @Override
        public boolean hasSpend() {
            return logSpend != null;
        }
    }

    /**
     * A previous fit's posterior draws of one arm, one draw picked at random per test.
     *
     * @param rows   per draw {payer rate, mean of log spend, sd of log spend} (spend NaN without spend)
     * @param path   the result.json, as the plan spec names it
     * @param arm    the arm
     */
    record Posterior(double[][] rows, String path, String arm) implements Baseline {
        @Override
        public double[] draw(UniformRandomProvider rng) {
            return rows[rng.nextInt(rows.length)].clone();
        }

        @Override
        public boolean hasSpend() {
            return !Double.isNaN(rows[0][2]);
        }

        @Override
        public String source() {
            return "result";
        }
    }
}
