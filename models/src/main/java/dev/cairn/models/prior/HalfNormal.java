package dev.cairn.models.prior;

/**
 * Half-normal with scale sd on x &gt; 0: a normal(0, sd²) folded at 0. The log density drops
 * log(sd sqrt(pi / 2)).
 *
 * @param sd the scale, &gt; 0
 */
public record HalfNormal(double sd) implements Prior {
    public HalfNormal {
        Prior.positive("half-normal", "sd", sd);
    }

    @Override
    public String family() {
        return "half-normal";
    }

    @Override
    public double logDensity(double x) {
        if (!(x > 0)) {
            return Double.NEGATIVE_INFINITY;
        }
        double t = x / sd;
        return -0.5 * t * t;
    }

    @Override
    public double derivative(double x) {
        return -x / (sd * sd);
    }

    /** The log density of l = log x, Jacobian included: -(e^l / sd)² / 2 + l (finite for every l). */
    @Override
    public double logDensityOfLog(double l) {
        double t = Math.exp(l) / sd;
        return -0.5 * t * t + l;
    }

    /** d/dl of the log density of l = log x: -(e^l / sd)² + 1. */
    @Override
    public double derivativeOfLog(double l) {
        double t = Math.exp(l) / sd;
        return -t * t + 1;
    }
}
