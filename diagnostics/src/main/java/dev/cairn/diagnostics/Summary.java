package dev.cairn.diagnostics;

import java.util.Arrays;

/**
 * A posterior summary: mean, sd, median and the equal-tailed credible interval [lo, hi] holding
 * {@code level} of the draws (quantiles (1 - level)/2 and (1 + level)/2, Hyndman & Fan definition 7).
 */
public record Summary(double mean, double sd, double lo, double median, double hi, double level) {

    public static Summary of(double[] draws, double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("interval level must be in (0, 1), was " + level);
        }
        if (draws.length == 0) {
            throw new IllegalArgumentException("summary of no draws");
        }
        double[] sorted = draws.clone();
        Arrays.sort(sorted);
        double mean = Autocovariance.mean(sorted);
        double sd = Math.sqrt(Ess.variance(sorted));
        return new Summary(mean, sd, Quantiles.ofSorted(sorted, (1 - level) / 2), Quantiles.ofSorted(sorted, 0.5),
                Quantiles.ofSorted(sorted, (1 + level) / 2), level);
    }

    public static Summary of(double[][] chains, double level) {
        Chains.check(chains);
        return of(Chains.pool(chains), level);
    }
}
