package dev.cairn.models.prior;

/**
 * Beta(a, b) on 0 &lt; p &lt; 1. The log density drops log B(a, b).
 *
 * @param a the first shape, &gt; 0
 * @param b the second shape, &gt; 0
 */
public record Beta(double a, double b) implements Prior {
    public Beta {
        Prior.positive("beta", "a", a);
        Prior.positive("beta", "b", b);
    }

    @Override
    public String family() {
        return "beta";
    }

    @Override
    public double logDensity(double p) {
        if (!(p > 0 && p < 1)) {
            return Double.NEGATIVE_INFINITY;
        }
        return (a - 1) * Math.log(p) + (b - 1) * Math.log1p(-p);
    }

    @Override
    public double derivative(double p) {
        return (a - 1) / p - (b - 1) / (1 - p);
    }
}
