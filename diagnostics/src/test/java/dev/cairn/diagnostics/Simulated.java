package dev.cairn.diagnostics;

import java.util.SplittableRandom;

/** Seeded chains with known properties for diagnostics tests. */
final class Simulated {
    private Simulated() {
    }

    /**
     * m stationary AR(1) chains x_t = rho x_{t-1} + e_t, e_t ~ N(0, 1), started from the stationary
     * N(0, 1 / (1 - rho^2)); their integrated autocorrelation time is (1 + rho) / (1 - rho).
     */
    static double[][] ar1(int m, int n, double rho, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[][] x = new double[m][n];
        for (int c = 0; c < m; c++) {
            double v = random.nextGaussian() / Math.sqrt(1 - rho * rho);
            for (int t = 0; t < n; t++) {
                x[c][t] = v;
                v = rho * v + random.nextGaussian();
            }
        }
        return x;
    }

    static double[][] shift(double[][] x, int chain, double by) {
        double[][] y = copy(x);
        for (int t = 0; t < y[chain].length; t++) {
            y[chain][t] += by;
        }
        return y;
    }

    static double[][] scale(double[][] x, int chain, double by) {
        double[][] y = copy(x);
        for (int t = 0; t < y[chain].length; t++) {
            y[chain][t] *= by;
        }
        return y;
    }

    static double[][] map(double[][] x, java.util.function.DoubleUnaryOperator f) {
        double[][] y = copy(x);
        for (double[] chain : y) {
            for (int t = 0; t < chain.length; t++) {
                chain[t] = f.applyAsDouble(chain[t]);
            }
        }
        return y;
    }

    static double[][] copy(double[][] x) {
        double[][] y = new double[x.length][];
        for (int c = 0; c < x.length; c++) {
            y[c] = x[c].clone();
        }
        return y;
    }
}
