package dev.cairn.models.prior;

/** The improper flat prior on the real line: log density 0 everywhere (proper posteriors need data). */
public record Flat() implements Prior {
    @Override
    public String family() {
        return "flat";
    }

    @Override
    public double logDensity(double x) {
        return 0;
    }

    @Override
    public double derivative(double x) {
        return 0;
    }
}
