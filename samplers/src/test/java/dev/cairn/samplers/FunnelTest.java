package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Neal's funnel (Neal 2003, Annals of Statistics 31(3), section 8): v ~ N(0, 3^2), x | v ~ N(0, e^v).
 * The scale of x changes by a factor e^5 between v = -5 and v = 5, so no single proposal width suits the
 * whole target; slice sampling's stepping-out and shrinkage adapt the interval to the slice each time.
 */
class FunnelTest {

    @Test
    void sliceExploresTheNeckAndTheMouth() {
        Target funnel = Target.of(Parameters.real("v", "x"), p -> {
            double v = p[0], x = p[1];
            return -v * v / 18.0 - 0.5 * v - 0.5 * x * x * Math.exp(-v);
        });
        Draws draws = ChainRunner.of(RunSettings.of(4, 1000, 10_000, 99))
                .run(funnel, Sweep.of(SliceStep.of(1.0)), Initializer.uniform(2));
        double[][] v = draws.column("v");
        NormalDistribution truth = new NormalDistribution(0, 3);
        MonteCarlo.assertMean(v, 0.0, "funnel v");
        MonteCarlo.assertSd(v, 0.0, 3.0, "funnel v");
        for (double q : new double[] {0.05, 0.5, 0.95}) {
            MonteCarlo.assertQuantile(v, q, truth.inverseCumulativeProbability(q), "funnel v");
        }
        double lowest = Double.POSITIVE_INFINITY, highest = Double.NEGATIVE_INFINITY;
        for (double[] chain : v) {
            for (double d : chain) {
                lowest = Math.min(lowest, d);
                highest = Math.max(highest, d);
            }
        }
        assertTrue(lowest < -6 && highest > 6, "v visited [" + lowest + ", " + highest + "]");
    }
}
