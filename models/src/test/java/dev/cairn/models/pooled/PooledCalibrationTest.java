package dev.cairn.models.pooled;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.diagnostics.Quantiles;
import dev.cairn.diagnostics.Sbc;
import dev.cairn.models.data.Estimates;
import dev.cairn.models.spec.PriorsSpec;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RandomStreams;
import dev.cairn.samplers.RunSettings;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.api.Test;

/**
 * Calibration of pooled-effects with simulated data whose truth is known: simulation-based calibration
 * (Talts et al. 2018) and the coverage and shrinkage an analyst relies on. Reduced by default;
 * -Pfull-validation runs five times more replications.
 */
class PooledCalibrationTest {
    private static final boolean FULL = "full".equals(System.getProperty("cairn.validation"));
    private static final int REPLICATIONS = FULL ? 2500 : 500;
    /** Ten "countries": standard errors from small (big country) to large (small country). */
    private static final double[] SE = {0.02, 0.03, 0.04, 0.05, 0.07, 0.09, 0.12, 0.15, 0.2, 0.3};

    private static List<String> names() {
        List<String> n = new ArrayList<>();
        for (int j = 0; j < SE.length; j++) {
            n.add("c" + j);
        }
        return n;
    }

    private static ZigguratSampler.NormalizedGaussian gaussian(long seed) {
        return ZigguratSampler.NormalizedGaussian.of(RandomStreams.forChain(seed, 0));
    }

    /** One simulated data set and its fit. */
    private record Replication(double[] theta, double[] y, Draws draws) {
    }

    /** True effects theta_j ~ N(mu, tau^2), estimates y_j ~ N(theta_j, SE_j^2), fitted on one thread. */
    private static Replication replicate(double mu, double tau, ZigguratSampler.NormalizedGaussian g,
                                         RunSettings settings) {
        double[] theta = new double[SE.length];
        double[] y = new double[SE.length];
        for (int j = 0; j < SE.length; j++) {
            theta[j] = mu + tau * g.sample();
            y[j] = theta[j] + SE[j] * g.sample();
        }
        Estimates data = new Estimates(names(), y, SE, "simulated", "");
        Draws d = PooledEffectsPosterior.sample(data, priors(data), settings.withThreads(1), Progress.NONE,
                new Cancellation());
        return new Replication(theta, y, d);
    }

    /** How many of the ten effects' 90% intervals hold the true effect. */
    private static int covered(Draws d, double[] theta) {
        int covered = 0;
        for (int j = 0; j < SE.length; j++) {
            double[] draws = d.pooled("effect[c" + j + "]");
            covered += theta[j] >= Quantiles.of(draws, 0.05) && theta[j] <= Quantiles.of(draws, 0.95) ? 1 : 0;
        }
        return covered;
    }

    private static PooledPriors priors(Estimates data) {
        return PooledPriors.of(new PriorsSpec(null, null, null, null, null,
                new PriorsSpec.MuPrior("normal", 0.0, 0.1), new PriorsSpec.TauPrior("half-normal", null, null, 0.1, null)), data);
    }

    @Test
    void simulationBasedCalibration() {
        ZigguratSampler.NormalizedGaussian g = gaussian(77);
        Sbc sbc = new Sbc();
        for (int r = 0; r < REPLICATIONS; r++) {
            double mu = 0.1 * g.sample();
            double tau = Math.abs(0.1 * g.sample());
            Replication rep = replicate(mu, tau, g, RunSettings.of(2, 200, 495, r));
            double[] theta = rep.theta();
            Draws d = rep.draws();
            sbc.add("mu", mu, Sbc.thin(d.pooled("mu"), 99));
            sbc.add("tau", tau, Sbc.thin(d.pooled("tau"), 99));
            sbc.add("theta[c0]", theta[0], Sbc.thin(d.pooled("effect[c0]"), 99));
            sbc.add("theta[c9]", theta[9], Sbc.thin(d.pooled("effect[c9]"), 99));
        }
        for (Map.Entry<String, Sbc.RankHistogram> e : sbc.histograms(10).entrySet()) {
            assertTrue(e.getValue().uniformAt(0.001), e.getKey() + ": p = " + e.getValue().pValue() + ", counts "
                    + java.util.Arrays.toString(e.getValue().counts()));
        }
    }

    /**
     * Over data sets whose truth is drawn from the prior the fit uses, 90% intervals cover the truth 90% of the
     * time (the calibration a Bayesian interval promises, the basis of Cook, Gelman & Rubin 2006, "Validation
     * of software for Bayesian models using posterior quantiles", JCGS; reference from memory; at one fixed
     * truth it may cover more or less, e.g. more when the prior's spread exceeds the truth's). The ten countries of a data set share mu and tau,
     * so their hits are correlated: the tolerance takes a design effect of 2.
     */
    @Test
    void coverageOverThePrior() {
        ZigguratSampler.NormalizedGaussian g = gaussian(79);
        int covered = 0, total = 0;
        for (int r = 0; r < REPLICATIONS / 5; r++) {
            double mu = 0.1 * g.sample();
            double tau = Math.abs(0.1 * g.sample());
            Replication rep = replicate(mu, tau, g, RunSettings.of(2, 300, 1000, 2000 + r));
            covered += covered(rep.draws(), rep.theta());
            total += SE.length;
        }
        double coverage = (double) covered / total;
        assertEquals(0.90, coverage, 4 * Math.sqrt(2 * 0.09 / total) + 0.01, "coverage of 90% intervals");
    }

    /**
     * Countries with a known true lift (mu = 0.05, tau = 0.03): a small country's estimate moves most of the
     * way to the overall lift, a big one's barely moves, and the intervals do not cover less than promised.
     */
    @Test
    void shrinkageAtAKnownTruth() {
        ZigguratSampler.NormalizedGaussian g = gaussian(78);
        int replications = REPLICATIONS / 5;
        int covered = 0, total = 0;
        double bigShift = 0, smallShift = 0;
        for (int r = 0; r < replications; r++) {
            Replication rep = replicate(0.05, 0.03, g, RunSettings.of(2, 300, 1000, 1000 + r));
            Draws d = rep.draws();
            double[] y = rep.y();
            double pooledMean = java.util.Arrays.stream(d.pooled("mu")).average().orElseThrow();
            covered += covered(d, rep.theta());
            total += SE.length;
            // Share of the way from the raw estimate to the pooled mean.
            double big = java.util.Arrays.stream(d.pooled("effect[c0]")).average().orElseThrow();
            double small = java.util.Arrays.stream(d.pooled("effect[c9]")).average().orElseThrow();
            bigShift += (y[0] - big) / (y[0] - pooledMean) / replications;
            smallShift += (y[9] - small) / (y[9] - pooledMean) / replications;
        }
        double coverage = (double) covered / total;
        assertTrue(coverage >= 0.90 - 4 * Math.sqrt(2 * 0.09 / total) - 0.01, "coverage of 90% intervals " + coverage);
        assertTrue(smallShift > 0.8, "the smallest country moves most of the way to the overall lift: " + smallShift);
        assertTrue(bigShift < 0.5, "the biggest country keeps most of its own estimate: " + bigShift);
    }
}
