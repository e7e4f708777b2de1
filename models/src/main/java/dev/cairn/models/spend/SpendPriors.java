package dev.cairn.models.spend;

import com.fasterxml.jackson.annotation.JsonInclude;
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
public record SpendPriors(Beta payerRate, Nig logSpend, NormalMean logSpendMean, HalfNormalSd logSpendSd,
                          String source, String note) {

    public record Beta(double a, double b) {
        public Beta {
            positive("payerRate.a", a);
            positive("payerRate.b", b);
        }
    }

    /** mu | sigma^2 ~ N(mu0, sigma^2 / kappa0), sigma^2 ~ Inv-Gamma(alpha0, beta0). */
    public record Nig(double mu0, double kappa0, double alpha0, double beta0) {
        public Nig {
            if (!Double.isFinite(mu0)) {
                throw new IllegalArgumentException("logSpend.mu0 must be finite, was " + mu0);
            }
            positive("logSpend.kappa0", kappa0);
            positive("logSpend.alpha0", alpha0);
            positive("logSpend.beta0", beta0);
        }
    }

    public record NormalMean(double mean, double sd) {
        public NormalMean {
            positive("logSpendMean.sd", sd);
        }
    }

    public record HalfNormalSd(double sd) {
        public HalfNormalSd {
            positive("logSpendSd.sd", sd);
        }
    }

    public static final Beta DEFAULT_PAYER_RATE = new Beta(1, 1);
    public static final Nig DEFAULT_LOG_SPEND = new Nig(0, 0.01, 1, 1);

    public boolean conjugate() {
        return logSpend != null;
    }

    /** The priors of a spec (defaults where it gives none). */
    public static SpendPriors fromSpec(PriorsSpec p) {
        Beta beta = p.payerRate() == null ? DEFAULT_PAYER_RATE : new Beta(p.payerRate().a(), p.payerRate().b());
        boolean any = p.payerRate() != null || p.logSpend() != null || p.nonConjugate();
        if (p.nonConjugate()) {
            return new SpendPriors(beta, null, new NormalMean(p.logSpendMean().mean(), p.logSpendMean().sd()),
                    new HalfNormalSd(p.logSpendSd().sd()), any ? "spec" : "default", null);
        }
        Nig nig = p.logSpend() == null ? DEFAULT_LOG_SPEND
                : new Nig(p.logSpend().mu0(), p.logSpend().kappa0(), p.logSpend().alpha0(), p.logSpend().beta0());
        return new SpendPriors(beta, nig, null, null, any ? "spec" : "default", null);
    }

    private static void positive(String name, double v) {
        if (!(v > 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException(name + " must be a finite number > 0, was " + v);
        }
    }
}
