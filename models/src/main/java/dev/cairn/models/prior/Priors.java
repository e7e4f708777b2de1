package dev.cairn.models.prior;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.PriorsSpec;

/**
 * The one place a spec's prior becomes a prior object. A bad value is refused with the spec field and
 * the family's own message (which names the value).
 */
public final class Priors {
    private Priors() {
    }

    /**
     * The payer-rate prior, {@code /priors/payerRate}.
     *
     * @param p the spec's block
     * @return the Beta prior
     * @throws dev.cairn.models.InputException naming the field and the bad value
     */
    public static Beta of(PriorsSpec.BetaPrior p) {
        return checked("/priors/payerRate", () -> new Beta(p.a(), p.b()));
    }

    /**
     * The conjugate log-spend prior, {@code /priors/logSpend}.
     *
     * @param p the spec's block
     * @return the normal-inverse-gamma prior
     * @throws dev.cairn.models.InputException naming the field and the bad value
     */
    public static NormalInverseGamma of(PriorsSpec.NigPrior p) {
        return checked("/priors/logSpend", () -> new NormalInverseGamma(p.mu0(), p.kappa0(), p.alpha0(), p.beta0()));
    }

    /**
     * A normal prior at {@code field}.
     *
     * @param p     the spec's block
     * @param field the block's path, for the message
     * @return the prior
     * @throws dev.cairn.models.InputException naming the field and the bad value
     */
    public static Normal of(PriorsSpec.NormalPrior p, String field) {
        return checked(field, () -> new Normal(p.mean(), p.sd()));
    }

    /**
     * A half-normal prior at {@code field}.
     *
     * @param p     the spec's block
     * @param field the block's path, for the message
     * @return the prior
     * @throws dev.cairn.models.InputException naming the field and the bad value
     */
    public static HalfNormal of(PriorsSpec.HalfNormalPrior p, String field) {
        return checked(field, () -> new HalfNormal(p.sd()));
    }

    /**
     * pooled-effects' mu, {@code /priors/mu}: {@code normal} or {@code flat}.
     *
     * @param p the spec's block
     * @return the prior
     * @throws dev.cairn.models.InputException naming the field and the bad value
     */
    public static Prior of(PriorsSpec.MuPrior p) {
        return checked("/priors/mu", () -> "normal".equals(p.family()) ? new Normal(p.mean(), p.sd()) : new Flat());
    }

    /**
     * pooled-effects' tau, {@code /priors/tau}: {@code uniform}, {@code half-normal} or {@code half-cauchy}.
     *
     * @param p the spec's block
     * @return the prior
     * @throws dev.cairn.models.InputException naming the field and the bad value
     */
    public static Prior of(PriorsSpec.TauPrior p) {
        return checked("/priors/tau", () -> switch (p.family()) {
            case "uniform" -> new Uniform(p.lower(), p.upper());
            case "half-normal" -> new HalfNormal(p.sd());
            case "half-cauchy" -> new HalfCauchy(p.scale());
            default -> throw new IllegalArgumentException("unknown family '" + p.family() + "'");
        });
    }

    private static <T> T checked(String field, java.util.function.Supplier<T> make) {
        try {
            return make.get();
        } catch (IllegalArgumentException | NullPointerException e) {
            throw new InputException(field + ": " + (e instanceof NullPointerException ? "a parameter is missing"
                    : e.getMessage()));
        }
    }
}
