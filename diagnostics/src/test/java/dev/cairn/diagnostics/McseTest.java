package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

class McseTest {
    private static final int REPLICATIONS = 300;

    /**
     * The MCSE of a quantile should equal the spread of that quantile over independent replications of
     * the whole run: compare the mean reported MCSE with the replications' standard deviation.
     */
    @Test
    void quantileMcseMatchesTheSpreadOverReplications() {
        for (double p : new double[] {0.05, 0.5}) {
            double[] estimates = new double[REPLICATIONS];
            double mcseSum = 0;
            for (int r = 0; r < REPLICATIONS; r++) {
                double[][] x = Simulated.ar1(4, 1000, 0.5, 900 + r);
                estimates[r] = Quantiles.of(Chains.pool(x), p);
                mcseSum += Mcse.quantile(x, p);
            }
            double spread = Math.sqrt(Ess.variance(estimates));
            double reported = mcseSum / REPLICATIONS;
            assertEquals(1.0, reported / spread, 0.2, "p=" + p + ": mean MCSE " + reported + " vs spread " + spread);
        }
    }

    /** Same check for the MCSE of the mean and of the sd reported by the diagnostics. */
    @Test
    void meanAndSdMcseMatchTheSpreadOverReplications() {
        double[] means = new double[REPLICATIONS];
        double[] sds = new double[REPLICATIONS];
        double mcseMean = 0, mcseSd = 0;
        for (int r = 0; r < REPLICATIONS; r++) {
            double[][] x = Simulated.ar1(4, 1000, 0.7, 5000 + r);
            ParameterDiagnostics d = Diagnostics.of("x", x);
            means[r] = d.mean();
            sds[r] = d.sd();
            mcseMean += d.mcseMean() / REPLICATIONS;
            mcseSd += Mcse.sd(x) / REPLICATIONS;
        }
        assertEquals(1.0, mcseMean / Math.sqrt(Ess.variance(means)), 0.2, "MCSE of the mean");
        assertEquals(1.0, mcseSd / Math.sqrt(Ess.variance(sds)), 0.2, "MCSE of the sd");
    }

    /** Summaries of many independent N(0,1) draws against the normal quantiles from commons-math3. */
    @Test
    void summaryIntervalMatchesTheNormalQuantiles() {
        Summary s = Summary.of(Simulated.ar1(4, 50_000, 0, 9), 0.9);
        NormalDistribution n = new NormalDistribution();
        assertEquals(n.inverseCumulativeProbability(0.05), s.lo(), 0.03);
        assertEquals(n.inverseCumulativeProbability(0.95), s.hi(), 0.03);
        assertEquals(0.0, s.median(), 0.02);
        assertEquals(1.0, s.sd(), 0.02);
        assertTrue(s.lo() < s.median() && s.median() < s.hi());
    }

    /** Hyndman & Fan definition 7 on a small worked case: quantiles of 1..5. */
    @Test
    void quantileInterpolation() {
        double[] x = {1, 2, 3, 4, 5};
        assertEquals(1.0, Quantiles.ofSorted(x, 0), 0);
        assertEquals(2.0, Quantiles.ofSorted(x, 0.25), 1e-12);
        assertEquals(3.4, Quantiles.ofSorted(x, 0.6), 1e-12);
        assertEquals(5.0, Quantiles.ofSorted(x, 1), 0);
    }
}
