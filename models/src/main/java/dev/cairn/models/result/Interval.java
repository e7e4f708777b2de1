package dev.cairn.models.result;

import dev.cairn.diagnostics.Summary;

/** A posterior summary in the result: mean, sd and the equal-tailed credible interval [lo, hi] with its median. */
public record Interval(double mean, double sd, double lo, double median, double hi) {
    /**
     * Mean, sd, median and central interval of draws.
     *
     * @param draws the draws
     * @param level the interval's probability, in (0, 1)
     * @return the interval
     */
    public static Interval of(double[] draws, double level) {
        Summary s = Summary.of(draws, level);
        return new Interval(s.mean(), s.sd(), s.lo(), s.median(), s.hi());
    }
}
