package dev.cairn.models.spec;

/** Convergence thresholds overriding the defaults (max R-hat 1.01, ESS 100 per chain). */
public record ConvergenceSpec(Double maxRhat, Double minEssPerChain) {
}
