package dev.cairn.models;

import java.util.Map;

/**
 * What plots need beyond the result: the replicated statistics of the predictive checks and the retention
 * curves by day. Empty for models that have neither.
 *
 * @param replicated "arm/statistic" -&gt; the statistic in each replicated data set
 * @param curves     arm -&gt; its install-weighted curve by day
 */
public record Figures(Map<String, double[]> replicated, Map<String, Curve> curves) {
    public static final Figures NONE = new Figures(Map.of(), Map.of());

    public Figures {
        replicated = Map.copyOf(replicated);
        curves = Map.copyOf(curves);
    }

    /**
     * One arm's curve over days 1..T.
     *
     * @param band     band[t] = {mean, lo, median, hi} of the share on day t (band[0] unused)
     * @param observed observed[t] = the share observed on day t pooled over the cohorts that reached it (NaN
     *                 where none did)
     * @param lastDay  the last day any cohort reached
     */
    public record Curve(double[][] band, double[] observed, int lastDay) {
    }
}
