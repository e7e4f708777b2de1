package dev.cairn.models;

/**
 * The posterior of a normal mean with a normal prior and normal observations of known variance (the
 * normal-normal update; e.g. Gelman et al., Bayesian Data Analysis, 3rd ed., section 2.5):
 * <pre>
 *   theta ~ N(m0, v0),  y_i | theta ~ N(theta, v_i)
 *   =>  precision = 1/v0 + sum 1/v_i,   mean = (m0/v0 + sum y_i/v_i) / precision
 * </pre>
 * Accumulate observations with {@link #add}, then read {@link #mean()} and {@link #variance()}. A flat prior
 * is v0 = +infinity. Mutable and cheap; one per use.
 */
public final class NormalMean {
    private double precision;
    private double weighted;

    private NormalMean(double priorMean, double priorVariance) {
        if (Double.isInfinite(priorVariance)) {
            return;
        }
        precision = 1 / priorVariance;
        weighted = priorMean / priorVariance;
    }

    /**
     * Starts from the prior N(m0, v0).
     *
     * @param priorMean     m0
     * @param priorVariance v0, > 0 (+infinity for a flat prior)
     * @return the accumulator
     * @throws IllegalArgumentException when v0 is not > 0
     */
    public static NormalMean prior(double priorMean, double priorVariance) {
        if (!(priorVariance > 0)) {
            throw new IllegalArgumentException("prior variance must be > 0, was " + priorVariance);
        }
        return new NormalMean(priorMean, priorVariance);
    }

    /**
     * Adds one observation y ~ N(theta, v); a non-finite v (no information) is ignored.
     *
     * @param y the observation
     * @param v its variance, > 0
     * @return this
     */
    public NormalMean add(double y, double v) {
        if (Double.isFinite(v) && v > 0) {
            precision += 1 / v;
            weighted += y / v;
        }
        return this;
    }

    /**
     * Adds n observations of one variance v through their sum.
     *
     * @param sum the sum of the observations
     * @param n   how many
     * @param v   the variance of each, > 0
     * @return this
     */
    public NormalMean addSum(double sum, double n, double v) {
        precision += n / v;
        weighted += sum / v;
        return this;
    }

    /** {@return the posterior mean (NaN with a flat prior and no observation)} */
    public double mean() {
        return weighted / precision;
    }

    /** {@return the posterior variance (+infinity with a flat prior and no observation)} */
    public double variance() {
        return 1 / precision;
    }

    /** {@return the posterior precision} */
    public double precision() {
        return precision;
    }
}
