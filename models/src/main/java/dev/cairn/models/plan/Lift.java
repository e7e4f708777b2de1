package dev.cairn.models.plan;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * An arm's assumed relative change against the baseline: a fixed number, or a distribution of plausible
 * values drawn once per simulated test (for assurance: power averaged over what the effect may be, O'Hagan,
 * Stevens &amp; Campbell 2005, Pharmaceutical Statistics 4).
 *
 * @param family "fixed", "normal" (truncated to values above -1) or "uniform"
 * @param first  the value (fixed), the mean (normal) or the lower end (uniform)
 * @param second 0 (fixed), the sd (normal) or the upper end (uniform)
 */
public record Lift(String family, double first, double second) {
    /** No change. */
    public static final Lift NONE = new Lift("fixed", 0, 0);

    /** {@return whether the lift is one fixed value} */
    public boolean fixed() {
        return family.equals("fixed");
    }

    /** {@return the lift's mean (of the untruncated normal for "normal")} */
    public double mean() {
        return switch (family) {
            case "fixed", "normal" -> first;
            default -> (first + second) / 2;
        };
    }

    /**
     * Draws a lift.
     *
     * @param rng the stream
     * @return a value above -1
     */
    public double draw(UniformRandomProvider rng) {
        switch (family) {
            case "fixed":
                return first;
            case "uniform":
                return first + (second - first) * rng.nextDouble();
            default:
                ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
                for (int attempt = 0; attempt < 1000; attempt++) {
                    double v = first + second * normal.sample();
                    if (v > -1) {
                        return v;
                    }
                }
                throw new IllegalStateException("a normal lift of mean " + first + " and sd " + second
                        + " is almost never above -1"); // refused by PlanReader before a run
        }
    }
}
