package dev.cairn.diagnostics;

import java.util.Arrays;

/** Operations on draws laid out as chains[m][n]: splitting, pooling, rank-normalising, folding. */
final class Chains {
    private Chains() {
    }

    /** Checks the layout: at least one chain, equal lengths, finite values. */
    static void check(double[][] chains) {
        if (chains == null || chains.length == 0) {
            throw new IllegalArgumentException("draws need at least one chain");
        }
        int n = chains[0].length;
        for (int c = 0; c < chains.length; c++) {
            if (chains[c].length != n) {
                throw new IllegalArgumentException("chain " + (c + 1) + " has " + chains[c].length
                        + " draws, chain 1 has " + n);
            }
            for (int t = 0; t < n; t++) {
                if (!Double.isFinite(chains[c][t])) {
                    throw new IllegalArgumentException("chain " + (c + 1) + ", draw " + (t + 1)
                            + " is not finite: " + chains[c][t]);
                }
            }
        }
        if (n == 0) {
            throw new IllegalArgumentException("draws need at least one iteration");
        }
    }

    /**
     * Each chain cut into its first and second half (the middle draw of an odd-length chain is dropped), so
     * a trend within a chain shows up as disagreement between halves.
     */
    static double[][] split(double[][] chains) {
        int n = chains[0].length;
        if (n < 2) {
            return chains;
        }
        int half = n / 2;
        double[][] out = new double[2 * chains.length][];
        for (int c = 0; c < chains.length; c++) {
            out[2 * c] = Arrays.copyOfRange(chains[c], 0, half);
            out[2 * c + 1] = Arrays.copyOfRange(chains[c], n - half, n);
        }
        return out;
    }

    static double[] pool(double[][] chains) {
        int n = chains[0].length;
        double[] out = new double[chains.length * n];
        for (int c = 0; c < chains.length; c++) {
            System.arraycopy(chains[c], 0, out, c * n, n);
        }
        return out;
    }

    /** The same values in the same chain layout, computed element by element. */
    static double[][] map(double[][] chains, java.util.function.DoubleUnaryOperator f) {
        double[][] out = new double[chains.length][];
        for (int c = 0; c < chains.length; c++) {
            out[c] = new double[chains[c].length];
            for (int t = 0; t < chains[c].length; t++) {
                out[c][t] = f.applyAsDouble(chains[c][t]);
            }
        }
        return out;
    }

    /** Whether every value equals the first. */
    static boolean constant(double[][] chains) {
        double first = chains[0][0];
        for (double[] chain : chains) {
            for (double v : chain) {
                if (v != first) {
                    return false;
                }
            }
        }
        return true;
    }
}
