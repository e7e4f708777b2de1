package dev.cairn.models.prior;

/**
 * Normal(mean, sd²). The log density drops log(sd sqrt(2 pi)).
 *
 * @param mean the mean
 * @param sd   the standard deviation, &gt; 0
 */
public record Normal(double mean, double sd) implements Prior {
    public Normal {
        Prior.finite("normal", "mean", mean);
        Prior.positive("normal", "sd", sd);
    }

    @Override
    public String family() {
        return "normal";
    }

    @Override
    public double logDensity(double x) {
        double z = (x - mean) / sd;
        return -0.5 * z * z;
    }

    @Override
    public double derivative(double x) {
        return -(x - mean) / (sd * sd);
    }
}
