package dev.cairn.models.prior;

/**
 * A prior on one real quantity: a small immutable object with its log density, the density's derivative
 * (for the gradient-based samplers) and its family name. Each family states which constants its log
 * density drops; none depends on the quantity, so posteriors and their gradients are unchanged.
 *
 * <p>For a quantity sampled on the log scale (a positive scale or sd), {@link #logDensityOfLog} adds the
 * Jacobian: p(l) = p(x) x with x = exp(l).
 */
public sealed interface Prior permits Normal, HalfNormal, HalfCauchy, Uniform, Flat, Beta {

    /** The family's name as the spec writes it ({@code "half-normal"}...). */
    String family();

    /**
     * The log density at {@code x}, up to the constants the family states; negative infinity outside the
     * support.
     *
     * @param x the value
     * @return log p(x) + constant
     */
    double logDensity(double x);

    /**
     * d/dx of {@link #logDensity} inside the support.
     *
     * @param x the value
     * @return the derivative
     */
    double derivative(double x);

    /**
     * The log density of l = log x, Jacobian included: logDensity(e^l) + l.
     *
     * @param l the log of the value
     * @return log p(l) + constant
     */
    default double logDensityOfLog(double l) {
        return logDensity(Math.exp(l)) + l;
    }

    /**
     * d/dl of {@link #logDensityOfLog}: derivative(e^l) e^l + 1.
     *
     * @param l the log of the value
     * @return the derivative
     */
    default double derivativeOfLog(double l) {
        double x = Math.exp(l);
        return derivative(x) * x + 1;
    }

    /** Refuses a parameter that is not a finite number greater than 0, naming it and its value. */
    static void positive(String family, String parameter, double v) {
        if (!(v > 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException(family + " prior: " + parameter + " must be a finite number > 0, was " + v);
        }
    }

    /** Refuses a parameter that is not a finite number, naming it and its value. */
    static void finite(String family, String parameter, double v) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException(family + " prior: " + parameter + " must be a finite number, was " + v);
        }
    }
}
