package dev.cairn.diagnostics;

/** Checks and helpers for draws laid out as chains[m][n]. */
final class Chains {
    private Chains() {
    }

    /** Checks the layout: at least one chain, equal lengths, finite values. */
    static void check(double[][] chains) {
        checkLayout(chains);
        for (int c = 0; c < chains.length; c++) {
            for (int t = 0; t < chains[c].length; t++) {
                if (!Double.isFinite(chains[c][t])) {
                    throw new IllegalArgumentException("chain " + (c + 1) + ", draw " + (t + 1)
                            + " is not finite: " + chains[c][t]);
                }
            }
        }
    }

    /**
     * Where the first non-finite draw is, as "chain c, draw t: value", with how many there are; null when
     * every draw is finite.
     */
    static String nonFinite(double[][] chains) {
        long count = 0;
        String first = null;
        for (int c = 0; c < chains.length; c++) {
            for (int t = 0; t < chains[c].length; t++) {
                if (!Double.isFinite(chains[c][t])) {
                    count++;
                    if (first == null) {
                        first = "chain " + (c + 1) + ", draw " + (t + 1) + ": " + chains[c][t];
                    }
                }
            }
        }
        return first == null ? null : count + " draws are not finite (first at " + first + ")";
    }

    /** Checks the layout only: at least one chain, equal lengths, at least one draw. */
    static void checkLayout(double[][] chains) {
        if (chains == null || chains.length == 0) {
            throw new IllegalArgumentException("draws need at least one chain");
        }
        int n = chains[0].length;
        for (int c = 0; c < chains.length; c++) {
            if (chains[c].length != n) {
                throw new IllegalArgumentException("chain " + (c + 1) + " has " + chains[c].length
                        + " draws, chain 1 has " + n);
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
    /**
     * The tolerance below which differences between draws are rounding, not variation: 64 units in the last
     * place of the largest magnitude among the draws (0 when every draw is 0).
     */
    static double tolerance(double[][] chains) {
        double largest = 0;
        for (double[] chain : chains) {
            for (double v : chain) {
                largest = Math.max(largest, Math.abs(v));
            }
        }
        return 64 * Math.ulp(largest);
    }

    /** Whether chain c's draws all lie within {@code tolerance} of each other. */
    static boolean flat(double[] chain, double tolerance) {
        double lo = chain[0], hi = chain[0];
        for (double v : chain) {
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        return hi - lo <= tolerance;
    }

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
