package dev.cairn.models.segmented;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.diagnostics.Quantiles;
import dev.cairn.diagnostics.Sbc;
import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SegmentedSpendData;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RandomStreams;
import dev.cairn.samplers.RunSettings;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * segmented-spend on simulated segments with known truth: coverage, shrinkage, SBC, a funnel of tiny
 * segments, and awkward segments. Reduced by default; -Pfull-validation runs more replications.
 */
class SegmentedTest {
    private static final boolean FULL = "full".equals(System.getProperty("cairn.validation"));

    /** Cells simulated user by user from given cell parameters; arms "A" (control) and "B". */
    static SegmentedSpendData simulate(double[][] payerRate, double[][] logMean, double[][] logSd, int[] users,
                                       UniformRandomProvider rng) {
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        List<SegmentedSpendData.Cell> cells = new ArrayList<>();
        String[] arms = {"A", "B"};
        for (int j = 0; j < users.length; j++) {
            for (int k = 0; k < 2; k++) {
                long m = 0;
                double s1 = 0, s2 = 0;
                for (int u = 0; u < users[j]; u++) {
                    if (rng.nextDouble() < payerRate[j][k]) {
                        double y = logMean[j][k] + logSd[j][k] * g.sample();
                        m++;
                        s1 += y;
                        s2 += y * y;
                    }
                }
                cells.add(new SegmentedSpendData.Cell(String.format("s%02d", j), ArmStats.summary(arms[k], users[j], m, s1, s2)));
            }
        }
        return new SegmentedSpendData(cells, true, "simulated", 0, List.of(), "");
    }

    static double logistic(double z) {
        return 1 / (1 + Math.exp(-z));
    }

    @ParameterizedTest
    @ValueSource(strings = {"segment-gibbs", "nuts"})
    void intervalsCoverTheTruthAndSmallSegmentsShrink(String method) {
        UniformRandomProvider rng = RandomStreams.forChain(505, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        int[] users = {150, 300, 500, 800, 1200, 2000, 3000, 5000, 8000, 12000, 20000, 40000};
        int replications = FULL ? 80 : 20;
        int covered = 0, total = 0;
        double smallShrink = 0, largeShrink = 0;
        for (int r = 0; r < replications; r++) {
            int jn = users.length;
            double[][] p = new double[jn][2], mu = new double[jn][2];
            double[][] sd = new double[jn][2];
            for (int j = 0; j < jn; j++) {
                double alpha = -3.2 + 0.4 * g.sample(), d = 0.15 + 0.05 * g.sample();
                double beta = 1.5 + 0.3 * g.sample(), e = 0.05 + 0.05 * g.sample();
                p[j][0] = logistic(alpha);
                p[j][1] = logistic(alpha + d);
                mu[j][0] = beta;
                mu[j][1] = beta + e;
                sd[j][0] = Math.exp(0.1 + 0.1 * g.sample());
                sd[j][1] = sd[j][0];
            }
            SegmentedSpendData data = simulate(p, mu, sd, users, rng);
            SegmentedPosterior model = new SegmentedPosterior(data, "A", "auto");
            double[] weights = new double[jn];
            java.util.Arrays.fill(weights, 1.0 / jn);
            Draws d = model.sample(method, RunSettings.of(2, 500, 1000, 900 + r).withThreads(1), Progress.NONE,
                    new Cancellation(), weights);
            for (int j = 0; j < jn; j++) {
                String seg = data.segments().get(j);
                for (int k = 0; k < 2; k++) {
                    String arm = k == 0 ? "A" : "B";
                    double[] rate = d.pooled(SegmentedOutputs.cell("payerRate", seg, arm));
                    double[] mean = d.pooled(SegmentedOutputs.cell("logSpendMean", seg, arm));
                    covered += within(rate, p[j][k]) + within(mean, mu[j][k]);
                    total += 2;
                }
            }
            // Shrinkage of the payer-rate log-odds lift: pooled vs raw, relative to the typical lift.
            double typical = median(d.pooled("D[B]"));
            smallShrink += shrink(d, data, data.segments().get(0), typical) / replications;
            largeShrink += shrink(d, data, data.segments().get(jn - 1), typical) / replications;
        }
        double coverage = (double) covered / total;
        assertEquals(0.90, coverage, 0.05, method + ": coverage of 90% intervals");
        assertTrue(smallShrink > 0.6, "the smallest segment moves most of the way to the typical lift: " + smallShrink);
        assertTrue(largeShrink < 0.5, "the largest segment keeps most of its own lift: " + largeShrink);
    }

    private static int within(double[] draws, double truth) {
        return truth >= Quantiles.of(draws, 0.05) && truth <= Quantiles.of(draws, 0.95) ? 1 : 0;
    }

    private static double median(double[] x) {
        return Quantiles.of(x, 0.5);
    }

    /** |raw - pooled| / |raw - typical| for the log-odds lift of B over A in one segment. */
    private static double shrink(Draws d, SegmentedSpendData data, String seg, double typical) {
        ArmStats a = data.cell(seg, "A"), b = data.cell(seg, "B");
        double raw = logit((b.payers() + 0.5) / (b.users() + 1.0)) - logit((a.payers() + 0.5) / (a.users() + 1.0));
        double[] pa = d.pooled(SegmentedOutputs.cell("payerRate", seg, "A"));
        double[] pb = d.pooled(SegmentedOutputs.cell("payerRate", seg, "B"));
        double[] lift = new double[pa.length];
        for (int i = 0; i < lift.length; i++) {
            lift[i] = logit(pb[i]) - logit(pa[i]);
        }
        double pooled = median(lift);
        double denominator = Math.abs(raw - typical);
        return denominator < 1e-9 ? 0 : Math.min(1.5, Math.abs(raw - pooled) / denominator);
    }

    private static double logit(double p) {
        return Math.log(p / (1 - p));
    }

    /**
     * SBC (Talts et al. 2018) of the hyperparameters, parameters drawn from the documented hyperpriors, for
     * both samplers: the scales too, since segment-gibbs moves each of them by a move of its own.
     */
    @ParameterizedTest
    @ValueSource(strings = {"segment-gibbs", "nuts"})
    void simulationBasedCalibration(String method) {
        UniformRandomProvider rng = RandomStreams.forChain(606, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        int replications = FULL ? 1000 : 200;
        int[] users = {400, 400, 400, 400};
        Sbc sbc = new Sbc();
        for (int r = 0; r < replications; r++) {
            HierarchicalCells.Prior payer = SegmentedLayout.PAYER, mean = SegmentedLayout.MEAN;
            HierarchicalCells.Prior spread = SegmentedLayout.SPREAD;
            double alpha0 = payer.mean().mean() + payer.mean().sd() * g.sample();
            double bigD = payer.armMean().sd() * g.sample();
            double beta0 = mean.mean().mean() + mean.mean().sd() * g.sample();
            double bigE = mean.armMean().sd() * g.sample();
            double s0 = spread.mean().mean() + spread.mean().sd() * g.sample();
            double bigG = spread.armMean().sd() * g.sample();
            double tA = Math.abs(payer.level().sd() * g.sample());
            double tD = Math.abs(payer.effect().sd() * g.sample());
            double tB = Math.abs(mean.level().sd() * g.sample());
            double tE = Math.abs(mean.effect().sd() * g.sample());
            double tS = Math.abs(spread.level().sd() * g.sample());
            double[][] p = new double[4][2], mu = new double[4][2];
            double[][] sd = new double[4][2];
            for (int j = 0; j < 4; j++) {
                double alpha = alpha0 + tA * g.sample(), d = bigD + tD * g.sample();
                double beta = beta0 + tB * g.sample(), e = bigE + tE * g.sample();
                p[j][0] = logistic(alpha);
                p[j][1] = logistic(alpha + d);
                mu[j][0] = beta;
                mu[j][1] = beta + e;
                double logSd = s0 + tS * g.sample();
                sd[j][0] = Math.exp(logSd);
                sd[j][1] = Math.exp(logSd + bigG);
            }
            SegmentedSpendData data = simulate(p, mu, sd, users, rng);
            SegmentedPosterior model = new SegmentedPosterior(data, "A", "auto");
            double[] w = {0.25, 0.25, 0.25, 0.25};
            Draws d = model.sample(method, RunSettings.of(2, 300, 495, 4000 + r).withThreads(1), Progress.NONE,
                    new Cancellation(), w);
            sbc.add("alpha0", alpha0, Sbc.thin(d.pooled("alpha0"), 99));
            sbc.add("D[B]", bigD, Sbc.thin(d.pooled("D[B]"), 99));
            sbc.add("beta0", beta0, Sbc.thin(d.pooled("beta0"), 99));
            sbc.add("E[B]", bigE, Sbc.thin(d.pooled("E[B]"), 99));
            sbc.add("G[B]", bigG, Sbc.thin(d.pooled("G[B]"), 99));
            sbc.add("tauAlpha", tA, Sbc.thin(d.pooled("tauAlpha"), 99));
            sbc.add("tauD", tD, Sbc.thin(d.pooled("tauD"), 99));
            sbc.add("tauBeta", tB, Sbc.thin(d.pooled("tauBeta"), 99));
            sbc.add("tauE", tE, Sbc.thin(d.pooled("tauE"), 99));
            sbc.add("s0", s0, Sbc.thin(d.pooled("s0"), 99));
            sbc.add("tauS", tS, Sbc.thin(d.pooled("tauS"), 99));
        }
        for (Map.Entry<String, Sbc.RankHistogram> e : sbc.histograms(10).entrySet()) {
            assertTrue(e.getValue().uniformAt(0.001), method + ", " + e.getKey() + ": p = " + e.getValue().pValue() + ", counts "
                    + java.util.Arrays.toString(e.getValue().counts()));
        }
    }
}
