package dev.cairn.models.spend;

import com.fasterxml.jackson.annotation.JsonInclude;
import dev.cairn.models.prior.Beta;
import dev.cairn.models.prior.HalfNormal;
import dev.cairn.models.prior.Normal;
import dev.cairn.models.prior.NormalInverseGamma;
import dev.cairn.models.prior.Priors;
import dev.cairn.models.spec.PriorsSpec;

/**
 * The priors a spend fit used, as reported in the result.
 *
 * <p>Defaults, and the scale reasoning behind them:
 * <ul>
 *   <li>payer rate ~ Beta(1, 1): every rate equally plausible; it weighs as much as two users, so any
 *       experiment with hundreds of users is driven by its data;</li>
 *   <li>log spend of payers ~ Normal-Inverse-Gamma(mu0 = 0, kappa0 = 0.01, alpha0 = 1, beta0 = 1): the
 *       mean log spend is centred on one currency unit with the weight of a hundredth of a payer, so
 *       any currency scale is fine; sigma^2 ~ Inv-Gamma(1, 1) has median 1.44 (sd of log spend about 1.2,
 *       typical of payer spend) and a heavy right tail, with the weight of two payers.</li>
 * </ul>
 * Non-conjugate alternative: mu ~ Normal(mean, sd), sigma ~ half-Normal(sd).
 *
 * @param source "default", "spec" or "history"
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record SpendPriors(Beta payerRate, NormalInverseGamma logSpend, Normal logSpendMean, HalfNormal logSpendSd,
                          String source, String note) implements dev.cairn.models.result.PriorsUsed {

    public static final Beta DEFAULT_PAYER_RATE = new Beta(1, 1);
    public static final NormalInverseGamma DEFAULT_LOG_SPEND = new NormalInverseGamma(0, 0.01, 1, 1);

    /**
     * {@return whether the log-spend prior is the conjugate normal-inverse-gamma}
     */
    public boolean conjugate() {
        return logSpend != null;
    }

    /**
     * The priors of a spec (defaults where it gives none).
     *
     * @param p the spec's priors
     * @return the priors
     * @throws dev.cairn.models.InputException naming a bad prior parameter
     */
    public static SpendPriors fromSpec(PriorsSpec p) {
        Beta beta = p.payerRate() == null ? DEFAULT_PAYER_RATE : Priors.of(p.payerRate());
        boolean any = p.payerRate() != null || p.logSpend() != null || p.nonConjugate();
        if (p.nonConjugate()) {
            return new SpendPriors(beta, null, Priors.of(p.logSpendMean(), "/priors/logSpendMean"),
                    Priors.of(p.logSpendSd(), "/priors/logSpendSd"), any ? "spec" : "default", null);
        }
        NormalInverseGamma nig = p.logSpend() == null ? DEFAULT_LOG_SPEND : Priors.of(p.logSpend());
        return new SpendPriors(beta, nig, null, null, any ? "spec" : "default", null);
    }
}
