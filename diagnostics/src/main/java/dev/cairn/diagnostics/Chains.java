package dev.cairn.diagnostics;

/** Checks and helpers for draws laid out as chains[m][n]. */
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

    static double[] pool(double[][] chains) {
        int n = chains[0].length;
        double[] out = new double[chains.length * n];
        for (int c = 0; c < chains.length; c++) {
            System.arraycopy(chains[c], 0, out, c * n, n);
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
