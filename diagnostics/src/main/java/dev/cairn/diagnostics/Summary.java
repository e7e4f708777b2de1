package dev.cairn.diagnostics;

import org.apache.commons.math3.stat.descriptive.rank.Percentile;

/**
 * A posterior summary: mean, sd, median and the equal-tailed credible interval [lo, hi] holding
 * {@code level} of the draws (quantiles (1 - level)/2 and (1 + level)/2, Hyndman & Fan definition 7).
 */
public record Summary(double mean, double sd, double lo, double median, double hi, double level) {

    /**
     * Summary of pooled draws: mean, sd, median and the central interval of probability {@code level}.
     *
     * @param draws the draws
     * @param level the interval's probability, in (0, 1)
     * @return the summary
     * @throws IllegalArgumentException when level is not in (0, 1) or there are no draws
     */
    public static Summary of(double[] draws, double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("interval level must be in (0, 1), was " + level);
        }
        if (draws.length == 0) {
            throw new IllegalArgumentException("summary of no draws");
        }
        double mean = Autocovariance.mean(draws);
        double sd = Math.sqrt(Ess.variance(draws));
        // Selection instead of a full sort (commons-math3 Percentile, estimation type R_7 = Hyndman & Fan
        // definition 7, as Quantiles); it keeps the pivots of one quantile for the next.
        Percentile quantiles = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
        quantiles.setData(draws);
        return new Summary(mean, sd, quantiles.evaluate(50 * (1 - level)), quantiles.evaluate(50),
                quantiles.evaluate(50 * (1 + level)), level);
    }

    /**
     * Summary of draws laid out as chains, pooled.
     *
     * @param chains the draws, m chains of n draws each
     * @param level  the interval's probability, in (0, 1)
     * @return the summary of all chains' draws together
     * @throws IllegalArgumentException when the chains are empty, ragged or hold a non-finite draw, or level
     *                                  is not in (0, 1)
     */
    public static Summary of(double[][] chains, double level) {
        Chains.check(chains);
        return of(Chains.pool(chains), level);
    }
}
