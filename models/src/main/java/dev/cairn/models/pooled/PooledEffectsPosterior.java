package dev.cairn.models.pooled;

import dev.cairn.models.KnownVarianceHierarchy;
import dev.cairn.models.NormalMean;
import dev.cairn.models.data.Estimates;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.ChainRunner;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Initializer;
import dev.cairn.samplers.Parameters;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import dev.cairn.samplers.SliceStep;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Sweep;
import dev.cairn.samplers.Target;
import dev.cairn.samplers.Transform;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Pooled effects with known standard errors (Gelman et al., Bayesian Data Analysis 3rd ed., sections
 * 5.4-5.5):
 *
 * <pre>
 *   y_j | theta_j ~ N(theta_j, s_j^2)      (s_j known)
 *   theta_j | mu, tau ~ N(mu, tau^2)
 *   mu ~ N(m0, v0) or flat,   tau ~ p(tau)
 *   predictive: theta_new | mu, tau ~ N(mu, tau^2)
 * </pre>
 *
 * Sampler (collapsed Metropolis-within-Gibbs): with w_j = 1 / (s_j^2 + tau^2), the marginal posterior of
 * tau is (BDA3 eq. 5.21, with the normal prior on mu as one more "observation" m0 of variance v0)
 * <pre>
 *   log p(tau | y) = log p(tau) + 1/2 log V - 1/2 sum_j (log(s_j^2 + tau^2) + w_j (y_j - mu_hat)^2)
 *                    - (mu_hat - m0)^2 / (2 v0),
 *   V = 1 / (sum_j w_j + 1/v0),   mu_hat = V (sum_j w_j y_j + m0 / v0);
 * </pre>
 * each sweep slice-samples log tau from it, then draws mu | tau, y ~ N(mu_hat, V) and
 * theta_j | mu, tau, y ~ N((y_j/s_j^2 + mu/tau^2) / (1/s_j^2 + 1/tau^2), 1 / (1/s_j^2 + 1/tau^2)) exactly
 * (BDA3 eqs. 5.17, 5.20). Integrating mu and theta out of the tau update removes the funnel between tau
 * and the effects that makes plain Gibbs sampling stick near tau = 0.
 */
public final class PooledEffectsPosterior {
    public static final String MU = "mu";
    public static final String TAU = "tau";
    public static final String PREDICTIVE = "predictive";
    static final int I_MU = 0;
    static final int I_TAU = 1;
    static final int I_PREDICTIVE = 2;
    static final int FIRST_EFFECT = 3;

    private final double[] y;
    private final double[] s2;
    private final PooledPriors priors;
    private final dev.cairn.models.prior.Prior tauPrior;
    private final KnownVarianceHierarchy hierarchy;

    PooledEffectsPosterior(Estimates data, PooledPriors priors) {
        this.y = data.estimate();
        this.s2 = new double[y.length];
        for (int j = 0; j < y.length; j++) {
            s2[j] = data.se()[j] * data.se()[j];
        }
        this.priors = priors;
        this.tauPrior = priors.tauPrior();
        double v0 = priors.muVariance();
        this.hierarchy = KnownVarianceHierarchy.of(y, s2, Double.isFinite(v0) ? priors.muMean() : 0, v0);
    }

    /**
     * The draw column of an estimate's pooled effect.
     *
     * @param name the estimate's name
     * @return the column name, {@code effect[name]}
     */
    public static String effect(String name) {
        return "effect[" + name + "]";
    }

    static Parameters parameters(Estimates data) {
        Parameters.Builder b = Parameters.builder().real(MU).positive(TAU).real(PREDICTIVE);
        for (String n : data.names()) {
            b.real(effect(n));
        }
        return b.build();
    }

    /**
     * Draws of the pooled-effects posterior: tau slice-sampled from its marginal, then mu, every effect and a
     * new effect drawn exactly.
     *
     * @param data         the estimates
     * @param priors       the mu and tau priors
     * @param settings     chains, warmup, draws, seed, threads
     * @param progress     receives each chain's progress
     * @param cancellation stops the chains when cancelled
     * @return the draws of tau, mu, the effects and the predictive effect
     */
    public static Draws sample(Estimates data, PooledPriors priors, RunSettings settings, Progress progress,
                               Cancellation cancellation) {
        PooledEffectsPosterior model = new PooledEffectsPosterior(data, priors);
        Parameters parameters = parameters(data);
        Target joint = Target.onConstrainedScale(parameters, model::logJoint);
        return ChainRunner.of(settings).withProgress(progress).withCancellation(cancellation)
                .run(joint, Sweep.of(model.new CollapsedStep()), model.initializer(data));
    }

    /** log p(tau) up to a constant; -infinity outside the support (tau > 0, and the family's own). */
    private double logTau(double tau) {
        return tau > 0 ? tauPrior.logDensity(tau) : Double.NEGATIVE_INFINITY;
    }

    /** log p(mu, tau, theta_new, theta | y) up to a constant, on the natural scale. */
    double logJoint(double[] x) {
        double mu = x[I_MU];
        double tau = x[I_TAU];
        double lp = logTau(tau);
        if (lp == Double.NEGATIVE_INFINITY) {
            return lp;
        }
        double v0 = priors.muVariance();
        if (Double.isFinite(v0)) {
            lp -= (mu - priors.muMean()) * (mu - priors.muMean()) / (2 * v0);
        }
        double t2 = tau * tau;
        double d = x[I_PREDICTIVE] - mu;
        lp += -Math.log(tau) - d * d / (2 * t2);
        for (int j = 0; j < y.length; j++) {
            double theta = x[FIRST_EFFECT + j];
            lp += -Math.log(tau) - (theta - mu) * (theta - mu) / (2 * t2) - (y[j] - theta) * (y[j] - theta) / (2 * s2[j]);
        }
        return lp;
    }

    /** log p(tau | y) up to a constant (mu and theta integrated out). */
    double logMarginalTau(double tau) {
        double lp = logTau(tau);
        if (lp == Double.NEGATIVE_INFINITY) {
            return lp;
        }
        return lp + hierarchy.logMarginal(tau);
    }

    /** {mu_hat, V}: the normal conditional of mu given tau and y. */
    double[] muGivenTau(double tau) {
        NormalMean m = hierarchy.meanGivenTau(tau);
        return new double[] {m.mean(), m.variance()};
    }

    /** Dispersed starts on the data's scale: effects near their estimates, tau around the largest se. */
    Initializer initializer(Estimates data) {
        double largest = 0;
        double mean = 0;
        for (int j = 0; j < y.length; j++) {
            largest = Math.max(largest, data.se()[j]);
            mean += y[j] / y.length;
        }
        double scale = largest;
        double centre = mean;
        return (chain, parameters, rng) -> {
            double[] u = new double[parameters.size()];
            double tau = scale * Math.exp(2 * rng.nextDouble() - 1);
            if (logTau(tau) == Double.NEGATIVE_INFINITY && "uniform".equals(priors.tauFamily())) {
                tau = priors.tauLower() + rng.nextDouble() * (priors.tauUpper() - priors.tauLower());
            }
            u[I_MU] = centre + scale * (2 * rng.nextDouble() - 1);
            u[I_TAU] = Transform.POSITIVE.unconstrain(tau);
            u[I_PREDICTIVE] = u[I_MU];
            for (int j = 0; j < y.length; j++) {
                u[FIRST_EFFECT + j] = y[j] + data.se()[j] * (2 * rng.nextDouble() - 1);
            }
            return u;
        };
    }

    /** Slice on log tau under its marginal, then exact draws of mu, the effects and the predictive effect. */
    final class CollapsedStep implements Step {
        @Override
        public Updater start(Target target, UniformRandomProvider stream) {
            Target marginal = Target.onConstrainedScale(Parameters.builder().positive(TAU).build(),
                    x -> logMarginalTau(x[0]));
            Updater slice = SliceStep.of(1.0).start(marginal, stream);
            return new Updater() {
                private ChainState tauState;
                private final org.apache.commons.rng.sampling.distribution.ZigguratSampler.NormalizedGaussian normal =
                        org.apache.commons.rng.sampling.distribution.ZigguratSampler.NormalizedGaussian.of(stream);

                @Override
                public void update(ChainState state, boolean adapt) {
                    double[] x = state.point();
                    if (tauState == null) {
                        tauState = ChainState.of(marginal, new double[] {x[I_TAU]});
                    } else {
                        tauState.point()[0] = x[I_TAU];
                        tauState.refresh();
                    }
                    slice.update(tauState, adapt);
                    x[I_TAU] = tauState.point()[0];
                    double tau = Math.exp(x[I_TAU]);
                    double[] m = muGivenTau(tau);
                    double mu = m[0] + Math.sqrt(m[1]) * normal.sample();
                    x[I_MU] = mu;
                    for (int j = 0; j < y.length; j++) {
                        NormalMean effect = hierarchy.effectGiven(j, mu, tau);
                        x[FIRST_EFFECT + j] = effect.mean() + normal.sample() * Math.sqrt(effect.variance());
                    }
                    x[I_PREDICTIVE] = mu + tau * normal.sample();
                    state.refresh();
                }
            };
        }
    }
}
