package dev.cairn.diagnostics;

/**
 * Potential scale reduction R-hat (Gelman & Rubin 1992; Vehtari et al. 2021, section 3, eqs. 1-4):
 * with M chains of N draws, W the mean within-chain variance and B/N the variance of the chain means,
 * var+ = (N-1)/N W + B/N and R-hat = sqrt(var+ / W). Callers pass split, rank-normalised chains.
 */
public final class Rhat {
    private Rhat() {
    }

    /**
     * R-hat of the given chains as they are (no splitting or ranking). NaN when there is no variation at
     * all; +infinity when chains vary between but not within themselves (stuck chains).
     *
     * @param chains the draws, m chains of n draws each
     * @return the potential scale reduction factor
     */
    public static double basic(double[][] chains) {
        return basic(Flat.of(chains));
    }

    static double basic(Flat chains) {
        int m = chains.chains();
        int n = chains.length();
        if (m < 2 || n < 2) {
            return Double.NaN;
        }
        double[] means = new double[m];
        double within = 0;
        for (int c = 0; c < m; c++) {
            means[c] = chains.mean(c);
            within += chains.variance(c);
        }
        within /= m;
        double betweenOverN = Ess.variance(means);
        if (within == 0) {
            return betweenOverN == 0 ? Double.NaN : Double.POSITIVE_INFINITY;
        }
        double varPlus = (n - 1.0) / n * within + betweenOverN;
        return Math.sqrt(varPlus / within);
    }
}
