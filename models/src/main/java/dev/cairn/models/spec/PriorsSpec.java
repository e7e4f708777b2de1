package dev.cairn.models.spec;

import com.fasterxml.jackson.annotation.JsonInclude;

/**
 * Priors of the spend model. {@code logSpend} (conjugate Normal-Inverse-Gamma) and
 * {@code logSpendMean} + {@code logSpendSd} (non-conjugate) are alternatives; {@code fromHistory} fits
 * the payer-rate and log-spend priors to past periods.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record PriorsSpec(BetaPrior payerRate, NigPrior logSpend, NormalPrior logSpendMean,
                         HalfNormalPrior logSpendSd, HistorySpec fromHistory, MuPrior mu, TauPrior tau) {

    /** Convenience for the spend priors alone. */
    public PriorsSpec(BetaPrior payerRate, NigPrior logSpend, NormalPrior logSpendMean, HalfNormalPrior logSpendSd,
                      HistorySpec fromHistory) {
        this(payerRate, logSpend, logSpendMean, logSpendSd, fromHistory, null, null);
    }

    /** pooled-effects: the population mean's prior, {@code normal} (mean, sd) or {@code flat}. */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record MuPrior(String family, Double mean, Double sd) {
    }

    /** pooled-effects: tau's prior, {@code uniform} (lower, upper), {@code half-normal} (sd) or {@code half-cauchy} (scale). */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record TauPrior(String family, Double lower, Double upper, Double sd, Double scale) {
    }

    /** {@return whether any spend-model prior is given} */
    public boolean anySpend() {
        return payerRate != null || logSpend != null || logSpendMean != null || logSpendSd != null || fromHistory != null;
    }

    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record BetaPrior(String family, double a, double b) {
    }

    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record NigPrior(String family, double mu0, double kappa0, double alpha0, double beta0) {
    }

    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record NormalPrior(String family, double mean, double sd) {
    }

    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record HalfNormalPrior(String family, double sd) {
    }

    public record HistorySpec(String path) {
    }

    /**
     * {@return whether the non-conjugate spend priors (logSpendMean, logSpendSd) are given, either of them}
     */
    public boolean nonConjugate() {
        return logSpendMean != null || logSpendSd != null;
    }

    /**
     * Refuses the pooled-effects priors (mu, tau) in another model's spec.
     *
     * @param origin the spec's name, for the message
     * @param model  the spec's model
     * @throws dev.cairn.models.InputException naming the prior and the model it belongs to
     */
    public void refusePooledPriors(String origin, String model) {
        if (mu != null || tau != null) {
            throw new dev.cairn.models.InputException(origin + ": /priors/" + (mu != null ? "mu" : "tau")
                    + ": belongs to model 'pooled-effects', not '" + model + "'");
        }
    }
}
