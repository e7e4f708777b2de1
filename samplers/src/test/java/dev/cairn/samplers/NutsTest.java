package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * NUTS against targets whose answers are known exactly (closed-form Gaussian moments and quantiles), with
 * tolerances from the run's own batch-means Monte Carlo error.
 */
class NutsTest {

    /** Independent normals with sds 1..20: the metric must learn scales that differ twenty-fold. */
    @Test
    void independentNormalsOfVeryDifferentScales() {
        int dim = 20;
        GradientTarget target = GradientTarget.of(Parameters.real(names(dim)), (x, g) -> {
            double lp = 0;
            for (int i = 0; i < dim; i++) {
                double s = i + 1;
                lp -= 0.5 * x[i] * x[i] / (s * s);
                g[i] = -x[i] / (s * s);
            }
            return lp;
        });
        Draws draws = ChainRunner.of(RunSettings.of(4, 1000, 1000, 11))
                .run(target, Sweep.of(NutsStep.of(1000)), Initializer.uniform(2));
        for (int i : new int[] {0, 9, 19}) {
            double[][] chains = draws.column("x" + i);
            MonteCarlo.assertMean(chains, 0, "x" + i);
            MonteCarlo.assertSd(chains, 0, i + 1, "x" + i);
            double q = new NormalDistribution(0, i + 1).inverseCumulativeProbability(0.9);
            MonteCarlo.assertQuantile(chains, 0.9, q, "x" + i);
        }
    }

    /** A bivariate normal with correlation 0.9 (exact moments: means 1 and -2, sds 1 and 3). */
    @Test
    void correlatedNormal() {
        double rho = 0.9, s1 = 1, s2 = 3, m1 = 1, m2 = -2;
        double det = 1 - rho * rho;
        GradientTarget target = GradientTarget.of(Parameters.real("a", "b"), (x, g) -> {
            double u = (x[0] - m1) / s1, v = (x[1] - m2) / s2;
            g[0] = -(u - rho * v) / (det * s1);
            g[1] = -(v - rho * u) / (det * s2);
            return -0.5 * (u * u - 2 * rho * u * v + v * v) / det;
        });
        Draws draws = ChainRunner.of(RunSettings.of(4, 1000, 2000, 5))
                .run(target, Sweep.of(NutsStep.of(1000)), Initializer.uniform(2));
        MonteCarlo.assertMean(draws.column("a"), m1, "a");
        MonteCarlo.assertMean(draws.column("b"), m2, "b");
        MonteCarlo.assertSd(draws.column("a"), m1, s1, "a");
        MonteCarlo.assertSd(draws.column("b"), m2, s2, "b");
    }

    /**
     * A half-normal written with a hard wall (log density -infinity below 0): trajectories that cross the
     * wall are cut, never followed, and the draws keep the exact mean sqrt(2/pi) and second moment 1.
     */
    @Test
    void hardWallIsRespected() {
        GradientTarget target = GradientTarget.of(Parameters.real("x"), (x, g) -> {
            g[0] = -x[0];
            return x[0] < 0 ? Double.NEGATIVE_INFINITY : -0.5 * x[0] * x[0];
        });
        Draws draws = ChainRunner.of(RunSettings.of(4, 500, 2000, 3))
                .run(target, Sweep.of(NutsStep.of(500)), (c, p, r) -> new double[] {0.5 + r.nextDouble()});
        double[][] chains = draws.column("x");
        for (double[] chain : chains) {
            for (double v : chain) {
                assertTrue(v >= 0, "a draw crossed the wall: " + v);
            }
        }
        MonteCarlo.assertMean(chains, Math.sqrt(2 / Math.PI), "half-normal");
        MonteCarlo.assertSd(chains, 0, 1, "half-normal (second moment)");
    }

    /** NaN densities or gradients are rejected regions, not crashes. */
    @Test
    void notANumberIsARejection() {
        GradientTarget target = GradientTarget.of(Parameters.real("x"), (x, g) -> {
            g[0] = x[0] > 3 ? Double.NaN : -x[0];
            return x[0] > 3 ? Double.NaN : -0.5 * x[0] * x[0];
        });
        Draws draws = ChainRunner.of(RunSettings.of(2, 300, 1000, 9))
                .run(target, Sweep.of(NutsStep.of(300)), Initializer.uniform(1));
        for (double[] chain : draws.column("x")) {
            for (double v : chain) {
                assertTrue(Double.isFinite(v) && v <= 3, "draw " + v);
            }
        }
    }

    /** Step size and metric adapt in warmup and stay frozen while draws are kept. */
    @Test
    void adaptationFreezesAfterWarmup() {
        GradientTarget target = GradientTarget.of(Parameters.real("x", "y"), (x, g) -> {
            g[0] = -x[0] / 0.01;
            g[1] = -x[1] / 100;
            return -0.5 * (x[0] * x[0] / 0.01 + x[1] * x[1] / 100);
        });
        NutsStep step = NutsStep.of(500);
        Chain chain = Chain.start(target, Sweep.of(step), Initializer.uniform(1), 0, RandomStreams.forChain(1, 0));
        for (int t = 0; t < 500; t++) {
            chain.iterate(true);
        }
        NutsUpdater u = (NutsUpdater) chain.updater(0);
        chain.iterate(false);
        double eps = u.stepSize();
        double[] metric = u.inverseMetric();
        for (int t = 0; t < 200; t++) {
            chain.iterate(false);
        }
        assertEquals(eps, u.stepSize());
        assertEquals(metric[0], u.inverseMetric()[0]);
        // the metric has learned the variances (0.01 and 100) to within a factor of two
        assertTrue(metric[0] > 0.005 && metric[0] < 0.02, "metric x " + metric[0]);
        assertTrue(metric[1] > 50 && metric[1] < 200, "metric y " + metric[1]);
    }

    /** Analytic and numeric gradients of the test targets agree (the check the models use). */
    @Test
    void gradientCheckFindsAWrongGradient() {
        GradientTarget right = GradientTarget.of(Parameters.real("x"), (x, g) -> {
            g[0] = -x[0];
            return -0.5 * x[0] * x[0];
        });
        GradientTarget wrong = GradientTarget.of(Parameters.real("x"), (x, g) -> {
            g[0] = -2 * x[0];
            return -0.5 * x[0] * x[0];
        });
        assertTrue(GradientCheck.maxError(right, new double[] {1.3}) < 1e-6);
        assertTrue(GradientCheck.maxError(wrong, new double[] {1.3}) > 0.5);
    }

    private static String[] names(int n) {
        String[] s = new String[n];
        for (int i = 0; i < n; i++) {
            s[i] = "x" + i;
        }
        return s;
    }
}
