package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.diagnostics.Sbc;
import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SpendData;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RandomStreams;
import dev.cairn.samplers.RunSettings;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.api.Test;

/**
 * Simulation-based calibration (Talts et al. 2018) of the non-conjugate spend model with slice sampling:
 * parameters drawn from the prior, one arm of users simulated from them, fitted, and the prior draw ranked
 * among 99 thinned posterior draws; ranks must be uniform (chi-square, 10 bins). Reduced by default
 * (500 replications); -Pfull-validation runs 5,000.
 */
class SpendSbcTest {
    private static final boolean FULL = "full".equals(System.getProperty("cairn.validation"));
    private static final int REPLICATIONS = FULL ? 5000 : 500;
    private static final int USERS = 150;

    @Test
    void nonConjugateSpendModelIsCalibrated() {
        SpendPriors priors = new SpendPriors(new dev.cairn.models.prior.Beta(3, 40), null,
                new dev.cairn.models.prior.Normal(1.5, 0.5), new dev.cairn.models.prior.HalfNormal(1.0), "spec", null);
        UniformRandomProvider rng = RandomStreams.forChain(2018, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        Sbc sbc = new Sbc();
        for (int r = 0; r < REPLICATIONS; r++) {
            double p = ChengBetaSampler.of(rng, 3, 40).sample();
            double mu = 1.5 + 0.5 * g.sample();
            double sigma = Math.abs(g.sample());
            long payers = 0;
            double s1 = 0, s2 = 0;
            for (int u = 0; u < USERS; u++) {
                if (rng.nextDouble() < p) {
                    double logSpend = mu + sigma * g.sample();
                    payers++;
                    s1 += logSpend;
                    s2 += logSpend * logSpend;
                }
            }
            SpendData data = new SpendData(List.of(ArmStats.summary("A", USERS, payers, s1, s2),
                    ArmStats.summary("B", USERS, payers, s1, s2)), true, "sbc", 2 * USERS, List.of(), "");
            Draws d = SpendPosterior.mcmc(data, priors, true, RunSettings.of(2, 300, 495, 1000 + r).withThreads(1),
                    Progress.NONE, new Cancellation());
            sbc.add("payerRate", p, Sbc.thin(d.pooled("payerRate[A]"), 99));
            sbc.add("logSpendMean", mu, Sbc.thin(d.pooled("logSpendMean[A]"), 99));
            sbc.add("logSpendSd", sigma, Sbc.thin(d.pooled("logSpendSd[A]"), 99));
        }
        for (Map.Entry<String, Sbc.RankHistogram> e : sbc.histograms(10).entrySet()) {
            assertTrue(e.getValue().uniformAt(0.001), e.getKey() + " ranks not uniform: p = " + e.getValue().pValue()
                    + ", counts " + java.util.Arrays.toString(e.getValue().counts()));
        }
    }
}
