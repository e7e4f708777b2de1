package dev.cairn.models.result;

/**
 * A posterior predictive check: the observed statistic and the share of replicated data sets whose
 * statistic is larger (ties count half). Values near 0 or 1 mean the model does not reproduce it.
 */
public record Check(String arm, String statistic, double observed, double pValue, boolean misfit) {
}
