package dev.cairn.models.segmented;

/**
 * The method-of-moments estimate of a between-group variance from estimates y_i with known variances v_i
 * (DerSimonian & Laird 1986, "Meta-analysis in clinical trials", Controlled Clinical Trials 7:177-188):
 * <pre>
 *   w_i = 1 / v_i,   ybar = sum w_i y_i / sum w_i,   Q = sum w_i (y_i - ybar)^2,
 *   tau^2 = max(0, (Q - (k - 1)) / (sum w_i - sum w_i^2 / sum w_i))
 * </pre>
 * Several families (one per arm) can be pooled by adding their Q, k - 1 and denominators. Used only to
 * choose each segment's parameterisation before sampling; it never enters the posterior.
 */
final class MomentSpread {
    private double q, df, denominator;

    /**
     * Adds one family of estimates; entries with a non-finite or non-positive variance are skipped.
     *
     * @param y estimates (not modified)
     * @param v their variances (not modified)
     * @return this
     */
    MomentSpread add(double[] y, double[] v) {
        double sw = 0, swy = 0, sw2 = 0;
        int k = 0;
        for (int i = 0; i < y.length; i++) {
            if (Double.isFinite(y[i]) && Double.isFinite(v[i]) && v[i] > 0) {
                double w = 1 / v[i];
                sw += w;
                swy += w * y[i];
                sw2 += w * w;
                k++;
            }
        }
        if (k < 2) {
            return this;
        }
        double mean = swy / sw;
        for (int i = 0; i < y.length; i++) {
            if (Double.isFinite(y[i]) && Double.isFinite(v[i]) && v[i] > 0) {
                double r = y[i] - mean;
                q += r * r / v[i];
            }
        }
        df += k - 1;
        denominator += sw - sw2 / sw;
        return this;
    }

    /** The estimated between-group variance tau^2 (0 when the estimates vary no more than their noise). */
    double variance() {
        return denominator > 0 ? Math.max(0, (q - df) / denominator) : 0;
    }
}
