package dev.cairn.models.spend;

import dev.cairn.models.result.Metric;

import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SpendData;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.ChainRunner;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.ExactSampler;
import dev.cairn.samplers.GibbsStep;
import dev.cairn.samplers.Initializer;
import dev.cairn.samplers.MetropolisStep;
import dev.cairn.samplers.Parameters;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import dev.cairn.samplers.SliceStep;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Sweep;
import dev.cairn.samplers.Target;
import dev.cairn.samplers.Transform;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.AhrensDieterMarsagliaTsangGammaSampler;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ContinuousSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Posterior of the spend model (revenue per user as a hurdle / zero-inflated lognormal), per arm k:
 *
 * <pre>
 *   payer_i ~ Bernoulli(p_k),        p_k ~ Beta(a, b)
 *   log y_i | payer ~ Normal(mu_k, sigma_k^2)
 *   ARPPU_k = exp(mu_k + sigma_k^2 / 2)     (mean of a lognormal)
 *   ARPU_k  = p_k x ARPPU_k
 * </pre>
 *
 * Sufficient statistics per arm: n users, m payers, S1 = sum log y, S2 = sum (log y)^2 over payers. The
 * likelihood is Binomial(m | n, p) x prod_i N(log y_i | mu, sigma^2), i.e. in S1, S2:
 * -m log sigma - (S2 - 2 mu S1 + m mu^2) / (2 sigma^2). Arms share nothing, so the posterior factorises.
 *
 * <p>Conjugate prior (Murphy 2007, "Conjugate Bayesian analysis of the Gaussian distribution", section 3,
 * eqs. 85-89): mu | sigma^2 ~ N(mu0, sigma^2/kappa0), sigma^2 ~ Inv-Gamma(alpha0, beta0) gives
 * kappa_n = kappa0 + m, mu_n = (kappa0 mu0 + S1) / kappa_n, alpha_n = alpha0 + m/2,
 * beta_n = beta0 + (S2 - S1^2/m)/2 + kappa0 m (S1/m - mu0)^2 / (2 kappa_n), drawn exactly; and
 * p_k | data ~ Beta(a + m, b + n - m) (BDA3 section 2.4).
 *
 * <p>Non-conjugate prior mu ~ N(m0, s0^2), sigma ~ half-N(0, t^2): Metropolis-within-Gibbs with the exact
 * Beta draw for p_k and slice (or random-walk Metropolis) updates of mu_k and log sigma_k.
 *
 * <p>Conversion-only data (no spend) keep only p_k: the Beta-Binomial model.
 */
public final class SpendPosterior {
    public static final String PAYER_RATE = Metric.PAYER_RATE.key();
    public static final String LOG_SPEND_MEAN = "logSpendMean";
    public static final String LOG_SPEND_SD = "logSpendSd";
    public static final String ARPPU = Metric.ARPPU.key();
    public static final String ARPU = Metric.ARPU.key();

    private SpendPosterior() {
    }

    /**
     * The draw column of a quantity for an arm.
     *
     * @param quantity e.g. "payerRate", "mu", "sigma"
     * @param arm      the arm
     * @return the column name, {@code quantity[arm]}
     */
    public static String name(String quantity, String arm) {
        return quantity + "[" + arm + "]";
    }

    /** Parameters in order: for each arm, payerRate then (with spend) logSpendMean and logSpendSd. */
    static Parameters parameters(SpendData data) {
        Parameters.Builder b = Parameters.builder();
        for (ArmStats a : data.arms()) {
            b.add(name(PAYER_RATE, a.arm()), Transform.UNIT_INTERVAL);
            if (data.hasSpend()) {
                b.add(name(LOG_SPEND_MEAN, a.arm()), Transform.REAL);
                b.add(name(LOG_SPEND_SD, a.arm()), Transform.POSITIVE);
            }
        }
        return b.build();
    }

    /**
     * Exact i.i.d. draws (conjugate priors or conversion-only data).
     *
     * @param data         the arms' data
     * @param priors       the priors (conjugate)
     * @param settings     chains, draws, seed, threads
     * @param progress     receives each chain's progress
     * @param cancellation stops the chains when cancelled
     * @return the draws
     */
    public static Draws exact(SpendData data, SpendPriors priors, RunSettings settings, Progress progress,
                              Cancellation cancellation) {
        List<ArmStats> arms = data.arms();
        int perArm = data.hasSpend() ? 3 : 1;
        ExactSampler sampler = rng -> {
            ContinuousSampler[] rates = new ContinuousSampler[arms.size()];
            ContinuousSampler[] gammas = new ContinuousSampler[arms.size()];
            double[][] nig = new double[arms.size()][];
            for (int k = 0; k < arms.size(); k++) {
                ArmStats a = arms.get(k);
                rates[k] = ChengBetaSampler.of(rng, priors.payerRate().a() + a.payers(),
                        priors.payerRate().b() + a.users() - a.payers());
                if (data.hasSpend()) {
                    nig[k] = nigPosterior(priors.logSpend(), a);
                    gammas[k] = AhrensDieterMarsagliaTsangGammaSampler.of(rng, nig[k][2], 1.0);
                }
            }
            ZigguratSampler.NormalizedGaussian gaussian = ZigguratSampler.NormalizedGaussian.of(rng);
            return out -> {
                for (int k = 0; k < arms.size(); k++) {
                    out[k * perArm] = rates[k].sample();
                    if (perArm == 3) {
                        double[] post = nig[k];
                        double variance = post[3] / gammas[k].sample();
                        out[k * perArm + 1] = post[0] + Math.sqrt(variance / post[1]) * gaussian.sample();
                        out[k * perArm + 2] = Math.sqrt(variance);
                    }
                }
            };
        };
        return ChainRunner.of(settings).withProgress(progress).withCancellation(cancellation)
                .runExact(parameters(data), sampler);
    }

    /** {mu_n, kappa_n, alpha_n, beta_n} of the Normal-Inverse-Gamma posterior (Murphy 2007, eqs. 86-89). */
    static double[] nigPosterior(dev.cairn.models.prior.NormalInverseGamma prior, ArmStats a) {
        return prior.posterior(a.payers(), a.logSpendSum(), a.logSpendSqSum());
    }

    /**
     * Metropolis-within-Gibbs: exact Beta draws for payer rates, {@code update} steps for mu and sigma.
     *
     * @param data         the arms' data
     * @param priors       the priors (non-conjugate)
     * @param slice        slice steps for mu and sigma, else Metropolis steps
     * @param settings     chains, warmup, draws, seed, threads
     * @param progress     receives each chain's progress
     * @param cancellation stops the chains when cancelled
     * @return the draws
     */
    public static Draws mcmc(SpendData data, SpendPriors priors, boolean slice, RunSettings settings, Progress progress,
                             Cancellation cancellation) {
        Parameters parameters = parameters(data);
        List<ArmStats> arms = data.arms();
        int perArm = data.hasSpend() ? 3 : 1;
        double a0 = priors.payerRate().a();
        double b0 = priors.payerRate().b();
        Target target = Target.onConstrainedScale(parameters, x -> {
            double lp = 0;
            for (int k = 0; k < arms.size(); k++) {
                ArmStats a = arms.get(k);
                double p = x[k * perArm];
                lp += (a0 - 1 + a.payers()) * Math.log(p) + (b0 - 1 + a.users() - a.payers()) * Math.log1p(-p);
                if (perArm == 3) {
                    lp += logSpendDensity(x[k * perArm + 1], x[k * perArm + 2], a, priors);
                }
            }
            return lp;
        });
        List<Step> steps = new ArrayList<>();
        steps.add(GibbsStep.perChain(stream -> new PayerRateDraw(arms, perArm, a0, b0, stream)));
        if (perArm == 3) {
            int[] spendCoordinates = new int[2 * arms.size()];
            for (int k = 0; k < arms.size(); k++) {
                spendCoordinates[2 * k] = k * perArm + 1;
                spendCoordinates[2 * k + 1] = k * perArm + 2;
            }
            steps.add(slice ? SliceStep.of(1.0, spendCoordinates) : MetropolisStep.of(0.5, spendCoordinates));
        }
        return ChainRunner.of(settings).withProgress(progress).withCancellation(cancellation)
                .run(target, Sweep.of(steps.toArray(new Step[0])), Initializer.uniform(2));
    }

    /**
     * Log prior of (mu, sigma) plus the lognormal log likelihood of one arm's payers, in S1 and S2. With the
     * conjugate prior written as a density of (mu, sigma): sigma^2 ~ Inv-Gamma(alpha0, beta0) has density
     * in sigma of p(sigma^2) x 2 sigma, and mu | sigma ~ N(mu0, sigma^2 / kappa0) contributes 1 / sigma; the
     * sigma and 1 / sigma cancel, leaving (sigma^2)^-(alpha0+1) exp(-(beta0 + kappa0 (mu - mu0)^2 / 2) / sigma^2).
     */
    static double logSpendDensity(double mu, double sigma, ArmStats a, SpendPriors priors) {
        double lp;
        if (priors.conjugate()) {
            lp = priors.logSpend().logDensityOnSd(mu, sigma);
        } else {
            lp = priors.logSpendMean().logDensity(mu) + priors.logSpendSd().logDensity(sigma);
        }
        long m = a.payers();
        if (m > 0) {
            double ss = a.logSpendSqSum() - 2 * mu * a.logSpendSum() + m * mu * mu;
            lp += -m * Math.log(sigma) - ss / (2 * sigma * sigma);
        }
        return lp;
    }

    /** The exact conditional of every payer rate: Beta(a + m, b + n - m), written on the logit scale. */
    private static final class PayerRateDraw implements GibbsStep.ConditionalDraw {
        private final List<ArmStats> arms;
        private final int perArm;
        /** One Beta sampler per arm, bound to the chain's stream. */
        private final ContinuousSampler[] samplers;

        PayerRateDraw(List<ArmStats> arms, int perArm, double a0, double b0, UniformRandomProvider stream) {
            this.arms = arms;
            this.perArm = perArm;
            this.samplers = new ContinuousSampler[arms.size()];
            for (int k = 0; k < arms.size(); k++) {
                ArmStats a = arms.get(k);
                samplers[k] = ChengBetaSampler.of(stream, a0 + a.payers(), b0 + a.users() - a.payers());
            }
        }

        @Override
        public void draw(double[] point) {
            for (int k = 0; k < arms.size(); k++) {
                point[k * perArm] = Transform.UNIT_INTERVAL.unconstrain(clamp(samplers[k].sample()));
            }
        }

        /** A Beta draw of exactly 0 or 1 has no logit; move it to the nearest representable interior value. */
        private static double clamp(double p) {
            return Math.min(Math.max(p, Double.MIN_NORMAL), 1 - 0x1p-53);
        }
    }
}
