package dev.cairn.models.spec;

/** How results are summarised: the credible interval mass (default 0.95). */
public record DecisionSpec(Double interval) {
}
