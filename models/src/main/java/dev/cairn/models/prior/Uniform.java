package dev.cairn.models.prior;

/**
 * Uniform on [lower, upper]. The log density drops -log(upper - lower): it is 0 inside.
 *
 * @param lower the lower bound
 * @param upper the upper bound, &gt; lower
 */
public record Uniform(double lower, double upper) implements Prior {
    public Uniform {
        Prior.finite("uniform", "lower", lower);
        Prior.finite("uniform", "upper", upper);
        if (!(upper > lower)) {
            throw new IllegalArgumentException("uniform prior: upper must be greater than lower, was lower " + lower
                    + ", upper " + upper);
        }
    }

    @Override
    public String family() {
        return "uniform";
    }

    @Override
    public double logDensity(double x) {
        return x >= lower && x <= upper ? 0.0 : Double.NEGATIVE_INFINITY;
    }

    @Override
    public double derivative(double x) {
        return 0;
    }
}
