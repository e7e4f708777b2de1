package dev.cairn.diagnostics;

/**
 * When draws are trusted: max R-hat below {@code maxRhat} and every bulk- and tail-ESS at least
 * {@code minEssPerChain} x chains. Defaults 1.01 and 100 follow Vehtari et al. (2021), section 4.
 */
public record Thresholds(double maxRhat, double minEssPerChain) {
    public static final Thresholds DEFAULT = new Thresholds(1.01, 100);

    public Thresholds {
        if (!(maxRhat > 1) || Double.isInfinite(maxRhat)) {
            throw new IllegalArgumentException("maxRhat must be a finite number > 1, was " + maxRhat);
        }
        if (!(minEssPerChain >= 0) || Double.isInfinite(minEssPerChain)) {
            throw new IllegalArgumentException("minEssPerChain must be a finite number >= 0, was " + minEssPerChain);
        }
    }
}
