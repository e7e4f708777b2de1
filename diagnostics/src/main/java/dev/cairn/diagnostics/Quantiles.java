package dev.cairn.diagnostics;

/**
 * Sample quantiles of sorted values by linear interpolation between order statistics: for probability p
 * and S values, h = (S - 1) p and Q = x_(floor h) + (h - floor h)(x_(floor h + 1) - x_(floor h))
 * (definition 7 of Hyndman & Fan 1996, The American Statistician 50(4)).
 */
public final class Quantiles {
    private Quantiles() {
    }

    /**
     * The p-quantile of sorted values by linear interpolation between order statistics (type 7 of
     * Hyndman & Fan 1996, the common default).
     *
     * @param sorted values in ascending order (not modified)
     * @param p      the probability, in [0, 1]
     * @return the quantile
     * @throws IllegalArgumentException when p is not in [0, 1] or there are no values
     */
    public static double ofSorted(double[] sorted, double p) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException("probability must be in [0, 1], was " + p);
        }
        if (sorted.length == 0) {
            throw new IllegalArgumentException("quantile of no values");
        }
        double h = (sorted.length - 1) * p;
        int lo = (int) Math.floor(h);
        if (lo >= sorted.length - 1) {
            return sorted[sorted.length - 1];
        }
        return sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo]);
    }

    /**
     * The p-quantile of unsorted values (sorts a copy).
     *
     * @param values the values (not modified)
     * @param p      the probability, in [0, 1]
     * @return the quantile, as {@link #ofSorted}
     */
    public static double of(double[] values, double p) {
        double[] sorted = values.clone();
        java.util.Arrays.sort(sorted);
        return ofSorted(sorted, p);
    }
}
