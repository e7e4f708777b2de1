package dev.cairn.models.pooled;

import com.fasterxml.jackson.annotation.JsonInclude;
import dev.cairn.models.data.Estimates;
import dev.cairn.models.prior.Flat;
import dev.cairn.models.prior.HalfCauchy;
import dev.cairn.models.prior.HalfNormal;
import dev.cairn.models.prior.Normal;
import dev.cairn.models.prior.Prior;
import dev.cairn.models.prior.Uniform;
import dev.cairn.models.spec.PriorsSpec;

/**
 * Priors of the pooled-effects model, as reported in the result.
 *
 * <p>mu: {@code normal} (mean, sd) or {@code flat} (the default; the data identify mu whenever there are
 * two or more estimates). tau: {@code uniform} (lower, upper), {@code half-normal} (sd) or
 * {@code half-cauchy} (scale). Default tau prior: half-Cauchy with scale equal to the largest standard
 * error - weakly informative on the scale of the data, as recommended for hierarchical scales by Gelman
 * (2006, "Prior distributions for variance parameters in hierarchical models", Bayesian Analysis 1(3));
 * tying the scale to the noisiest estimate is common practice, not a result.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record PooledPriors(String muFamily, Double muMean, Double muSd, String tauFamily, Double tauLower,
                           Double tauUpper, Double tauScale, String source) implements dev.cairn.models.result.PriorsUsed {

    /**
     * The mu and tau priors of a spec, defaults where it gives none (tau's half-Cauchy scale is the largest
     * standard error).
     *
     * @param p    the spec's priors
     * @param data the estimates (for the default tau scale)
     * @return the priors
     * @throws InputException naming a bad prior parameter
     */
    public static PooledPriors of(PriorsSpec p, Estimates data) {
        String muFamily = "flat";
        Double muMean = null, muSd = null;
        if (p.mu() != null && "normal".equals(p.mu().family())) {
            muFamily = "normal";
            muMean = p.mu().mean();
            muSd = p.mu().sd();
        }
        double largestSe = 0;
        for (double s : data.se()) {
            largestSe = Math.max(largestSe, s);
        }
        if (p.tau() == null) {
            return new PooledPriors(muFamily, muMean, muSd, "half-cauchy", null, null, largestSe,
                    p.mu() == null ? "default" : "spec (tau: default)");
        }
        return switch (p.tau().family()) {
            case "uniform" -> new PooledPriors(muFamily, muMean, muSd, "uniform", p.tau().lower(), p.tau().upper(), null, "spec");
            case "half-normal" -> new PooledPriors(muFamily, muMean, muSd, "half-normal", null, null, p.tau().sd(), "spec");
            default -> new PooledPriors(muFamily, muMean, muSd, "half-cauchy", null, null, p.tau().scale(), "spec");
        };
    }

    /** Variance of the normal prior on mu; infinite for the flat prior. */
    double muVariance() {
        return muSd == null ? Double.POSITIVE_INFINITY : muSd * muSd;
    }

    /** mu's prior as an object. */
    Prior muPrior() {
        return muSd == null ? new Flat() : new Normal(muMean, muSd);
    }

    /** tau's prior as an object. */
    Prior tauPrior() {
        return switch (tauFamily) {
            case "uniform" -> new Uniform(tauLower, tauUpper);
            case "half-normal" -> new HalfNormal(tauScale);
            default -> new HalfCauchy(tauScale);
        };
    }
}
