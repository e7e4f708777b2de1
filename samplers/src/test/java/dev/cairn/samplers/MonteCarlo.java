package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;

/**
 * Monte Carlo tolerances for sampler tests: batch-means standard errors (each chain cut into 25 batches,
 * the batch means treated as independent), so a tolerance follows from the run's own autocorrelation
 * rather than being picked by hand.
 */
final class MonteCarlo {
    static final double Z = 4.0;
    private static final int BATCHES_PER_CHAIN = 25;

    private MonteCarlo() {
    }

    /** Mean over all chains of f(x) and its batch-means standard error: {mean, se}. */
    static double[] meanAndSe(double[][] chains, DoubleUnaryOperator f) {
        int n = chains[0].length;
        int size = n / BATCHES_PER_CHAIN;
        int b = chains.length * BATCHES_PER_CHAIN;
        double[] means = new double[b];
        double total = 0;
        int k = 0;
        for (double[] chain : chains) {
            for (int i = 0; i < BATCHES_PER_CHAIN; i++) {
                double s = 0;
                for (int t = i * size; t < (i + 1) * size; t++) {
                    s += f.applyAsDouble(chain[t]);
                }
                means[k++] = s / size;
                total += s / size;
            }
        }
        double mean = total / b;
        double ss = 0;
        for (double m : means) {
            ss += (m - mean) * (m - mean);
        }
        return new double[] {mean, Math.sqrt(ss / (b - 1) / b)};
    }

    /** Posterior mean within Z standard errors of the reference. */
    static void assertMean(double[][] chains, double expected, String what) {
        double[] m = meanAndSe(chains, x -> x);
        assertTrue(Math.abs(m[0] - expected) <= Z * m[1],
                what + " mean " + m[0] + " vs reference " + expected + " (se " + m[1] + ")");
    }

    /** Posterior variance (about the reference mean) within Z standard errors of the reference sd^2. */
    static void assertSd(double[][] chains, double mean, double sd, String what) {
        double[] m = meanAndSe(chains, x -> (x - mean) * (x - mean));
        assertTrue(Math.abs(m[0] - sd * sd) <= Z * m[1],
                what + " variance " + m[0] + " vs reference " + sd * sd + " (se " + m[1] + ")");
    }

    /** The share of draws below the reference p-quantile is p, within Z standard errors (+0.002). */
    static void assertQuantile(double[][] chains, double p, double referenceQuantile, String what) {
        double[] m = meanAndSe(chains, x -> x <= referenceQuantile ? 1.0 : 0.0);
        assertTrue(Math.abs(m[0] - p) <= Z * m[1] + 0.002,
                what + ": share below reference " + p + "-quantile " + referenceQuantile + " is " + m[0]
                        + " (se " + m[1] + ")");
    }
}
