package dev.cairn.models.prior;

/**
 * Half-Cauchy with scale s on x &gt; 0. The log density drops log(pi s / 2).
 *
 * @param scale the scale s, &gt; 0
 */
public record HalfCauchy(double scale) implements Prior {
    public HalfCauchy {
        Prior.positive("half-cauchy", "scale", scale);
    }

    @Override
    public String family() {
        return "half-cauchy";
    }

    @Override
    public double logDensity(double x) {
        if (!(x > 0)) {
            return Double.NEGATIVE_INFINITY;
        }
        double t = x / scale;
        return -Math.log1p(t * t);
    }

    @Override
    public double derivative(double x) {
        double t = x / scale;
        return -2 * t / (scale * (1 + t * t));
    }
}
