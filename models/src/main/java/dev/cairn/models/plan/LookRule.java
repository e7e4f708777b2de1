package dev.cairn.models.plan;

import dev.cairn.models.prior.Beta;
import dev.cairn.models.prior.NormalInverseGamma;
import dev.cairn.models.result.Metric;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.apache.commons.numbers.gamma.Digamma;
import org.apache.commons.numbers.gamma.Erfc;
import org.apache.commons.numbers.gamma.Trigamma;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.AhrensDieterMarsagliaTsangGammaSampler;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ContinuousSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * The decision a planned test takes at one look, from the arms' data so far, in one of two ways:
 * <ul>
 *   <li><b>approximate</b>: each arm's posterior of the metric X is written as a small mixture of lognormals
 *       and the rule's expected losses and P(above) become one-dimensional Gauss-Hermite integrals, with no
 *       random draws;</li>
 *   <li><b>draws</b>: exact posterior draws, as a fit takes them, and the rule applied to the draws.</li>
 * </ul>
 * The mixture, per arm with n users, m payers and log-spend sums S1, S2, analysis priors p ~ Beta(a0, b0)
 * and Normal-Inverse-Gamma(mu0, kappa0, alpha0, beta0) for (mu, sigma^2), posterior (mu_n, kappa_n, alpha_n,
 * beta_n) as in Murphy 2007, eqs. 86-89:
 * <pre>
 *   log p ~ N(psi(a) - psi(a + b), psi'(a) - psi'(a + b))    a = a0 + m, b = b0 + n - m (exact moments of log Beta)
 *   log sigma^2 = log beta_n - log G, G ~ Gamma(alpha_n): mean log beta_n - psi(alpha_n), variance psi'(alpha_n),
 *       integrated by 3-point Gauss-Hermite (nodes 0, +-sqrt 3; weights 2/3, 1/6, 1/6)
 *   given sigma^2: mu ~ N(mu_n, sigma^2 / kappa_n) exactly, and log ARPPU = mu + sigma^2 / 2
 *   log ARPU = log p + log ARPPU   (p and (mu, sigma) are independent a posteriori)
 * </pre>
 * For lognormal components L ~ N(m, s^2), X = e^L: E[X] = exp(m + s^2/2), and the expected maximum is
 * E[max_j X_j] = sum_k E[X_k 1{X_k largest}] with E[X_k 1{..}] = E[X_k] E_w[prod_{j != k} F_j(exp(m_k + s_k (w + s_k)))],
 * w ~ N(0, 1) (the lognormal's size-biased law is a shift by s_k on the log scale), by 12-point Gauss-Hermite.
 * The expected loss of acting on arm c is E[max] - E[X_c] (never below 0). The approximation is used when every arm has at
 * least {@link #APPROXIMATE_FROM} payers and as many non-payers; below that a look takes exact draws. (With
 * few payers sigma^2's inverse-gamma posterior gives ARPU so heavy a right tail that the expected loss is
 * dominated by rare draws — strictly, E[exp(sigma^2 / 2)] is infinite under it — and no smooth approximation
 * follows the draws there.)
 * {@code LookRuleTest} bounds its error against exact draws: in expected loss within 0.2% of the control's
 * mean (a fifth of the default tolerance) plus 2% of the loss itself, and within 0.01 in P(above).
 */
public final class LookRule {
    /** Fewest payers (and non-payers) per arm for the approximation; fewer and the look takes exact draws. */
    public static final int APPROXIMATE_FROM = 100;
    /** A share of P(largest) below which the rest of a product is not evaluated (it adds under 1e-15 x E[X]). */
    private static final double NEGLIGIBLE = 1e-15;
    /** Beyond this many sds the normal distribution function is 0 or 1 to double precision (1 - Phi(8.3) < 6e-17). */
    static final double TAIL = 8.3;
    /** Gauss-Hermite nodes of the expected-maximum integral. */
    static final int NODES = 12;
    private static final double[] Z;
    private static final double[] W;
    /** Gauss-Hermite nodes and weights (standard normal) over log sigma^2. */
    static final double[] SPEND_NODES = {-Math.sqrt(3), 0, Math.sqrt(3)};
    static final double[] SPEND_WEIGHTS = {1.0 / 6, 2.0 / 3, 1.0 / 6};

    static {
        var rule = new GaussIntegratorFactory().hermite(NODES); // weight e^{-x^2}: z = sqrt(2) x, w / sqrt(pi)
        Z = new double[NODES];
        W = new double[NODES];
        for (int i = 0; i < NODES; i++) {
            Z[i] = Math.sqrt(2) * rule.getPoint(i);
            W[i] = rule.getWeight(i) / Math.sqrt(Math.PI);
        }
    }

    /** The two rules a plan may follow. */
    public enum Kind {
        /** Act once the chosen arm's expected loss is below the tolerance (the fit's rule). */
        EXPECTED_LOSS,
        /** Ship the arm most likely above the control once that probability exceeds a threshold. */
        PROB_ABOVE
    }

    /** Outcome codes of a look. */
    public static final byte KEEP_COLLECTING = 0, SHIP = 1, KEEP_CONTROL = 2;

    private final Kind kind;
    private final Metric metric;
    private final int control;
    private final Double tolerance;
    private final double threshold;
    private final Beta payerPrior;
    private final NormalInverseGamma spendPrior;
    private final boolean approximate;
    private final int draws;

    /**
     * @param kind        the rule
     * @param metric      arpu, payerRate or arppu
     * @param control     the control arm's index
     * @param tolerance   the expected loss accepted (metric units), or null for 1% of the control's posterior mean
     * @param threshold   P(above control) needed to ship, for {@link Kind#PROB_ABOVE}
     * @param payerPrior  the analysis prior of the payer rate
     * @param spendPrior  the analysis prior of log spend
     * @param approximate whether to use the approximation where it holds (else every look takes draws)
     * @param draws       posterior draws per arm when a look takes draws
     */
    public LookRule(Kind kind, Metric metric, int control, Double tolerance, double threshold, Beta payerPrior,
                    NormalInverseGamma spendPrior, boolean approximate, int draws) {
        this.kind = kind;
        this.metric = metric;
        this.control = control;
        this.tolerance = tolerance;
        this.threshold = threshold;
        this.payerPrior = payerPrior;
        this.spendPrior = spendPrior;
        this.approximate = approximate;
        this.draws = draws;
    }

    /** What a look decided. */
    public static final class Outcome {
        /** {@link #KEEP_COLLECTING}, {@link #SHIP} or {@link #KEEP_CONTROL}. */
        public byte code;
        /** The arm acted on (the shipped arm, or the control), or the arm that looks best when collecting. */
        public int arm;
        /** The posterior expected loss of acting on {@link #arm} now, in the metric's unit. */
        public double expectedLoss;
        /** Whether the look took exact draws. */
        public boolean drew;
        /** Per arm, the posterior expected loss of acting on it now. */
        public double[] loss;
    }

    /**
     * Decides at one look.
     *
     * @param stats per arm the running sums {users, payers, S1, S2}
     * @param rng   the stream for draws, when the look takes them
     * @param out   receives the outcome
     */
    public void decide(double[][] stats, UniformRandomProvider rng, Outcome out) {
        if (approximate && approximable(stats)) {
            decideApproximately(mixtures(stats), out);
            out.drew = false;
        } else {
            decideWithDraws(posteriorDraws(stats, rng), out);
            out.drew = true;
        }
    }

    private boolean approximable(double[][] stats) {
        for (double[] a : stats) {
            if (a[1] < APPROXIMATE_FROM || a[0] - a[1] < APPROXIMATE_FROM) {
                return false;
            }
        }
        return true;
    }

    /**
     * Each arm's posterior of the metric as a mixture of lognormals (see the class comment).
     *
     * @param stats per arm the running sums {users, payers, S1, S2}
     * @return the mixtures
     */
    LognormalMixtures mixtures(double[][] stats) {
        int k = stats.length;
        int c = metric == Metric.PAYER_RATE ? 1 : SPEND_NODES.length;
        LognormalMixtures x = new LognormalMixtures(k, c);
        for (int a = 0; a < k; a++) {
            double[] st = stats[a];
            double mean = 0, variance = 0;
            if (metric != Metric.ARPPU) {
                double pa = payerPrior.a() + st[1], pb = payerPrior.b() + st[0] - st[1];
                mean += Digamma.value(pa) - Digamma.value(pa + pb);
                variance += Trigamma.value(pa) - Trigamma.value(pa + pb);
            }
            if (metric == Metric.PAYER_RATE) {
                x.set(a, 0, 1, mean, variance);
                continue;
            }
            double[] nig = nig(st);
            double logCentre = Math.log(nig[3]) - Digamma.value(nig[2]);
            double logSpread = Math.sqrt(Trigamma.value(nig[2]));
            for (int j = 0; j < c; j++) {
                double sigma2 = Math.exp(logCentre + logSpread * SPEND_NODES[j]);
                x.set(a, j, SPEND_WEIGHTS[j], mean + nig[0] + 0.5 * sigma2, variance + sigma2 / nig[1]);
            }
        }
        x.finish();
        return x;
    }

    /** The rule on mixture posteriors. */
    void decideApproximately(LognormalMixtures x, Outcome out) {
        int k = x.mean.length;
        double max = expectedMax(x);
        out.loss = new double[k];
        for (int a = 0; a < k; a++) {
            out.loss[a] = Math.max(max - x.mean[a], 0);
        }
        if (kind == Kind.EXPECTED_LOSS) {
            int chosen = control;
            for (int a = 0; a < k; a++) {
                if (x.mean[a] > x.mean[chosen]) {
                    chosen = a;
                }
            }
            act(out.loss[chosen], x.mean[control], chosen, out);
        } else {
            int best = -1;
            double bestP = -1;
            for (int a = 0; a < k; a++) {
                if (a != control) {
                    double p = x.above(a, control);
                    if (p > bestP) {
                        bestP = p;
                        best = a;
                    }
                }
            }
            ship(bestP > threshold, best, out);
        }
    }

    /** E[max_j X_j] by Gauss-Hermite quadrature over each lognormal component. */
    static double expectedMax(LognormalMixtures x) {
        int k = x.mean.length;
        double max = 0;
        for (int a = 0; a < k; a++) {
            for (int c = 0; c < x.w[a].length; c++) {
                double m = x.m[a][c], s = x.s[a][c];
                double integral = 0; // P(a is the largest) under the component's size-biased law
                for (int i = 0; i < NODES; i++) {
                    double u = m + s * (Z[i] + s);
                    double product = 1;
                    for (int j = 0; j < k && product > NEGLIGIBLE; j++) {
                        if (j != a) {
                            product *= x.cdf(j, u);
                        }
                    }
                    integral += W[i] * product;
                }
                max += x.w[a][c] * Math.exp(m + 0.5 * s * s) * integral;
            }
        }
        return max;
    }

    private void ship(boolean ship, int best, Outcome out) {
        out.code = ship ? SHIP : KEEP_COLLECTING;
        out.arm = ship ? best : control;
        out.expectedLoss = out.loss[out.arm];
    }

    /** The standard normal distribution function, from Erfc (accurate in both tails). */
    static double phi(double x) {
        return 0.5 * Erfc.value(-x / Math.sqrt(2));
    }

    private void act(double loss, double controlMean, int chosen, Outcome out) {
        double tol = tolerance != null ? tolerance : dev.cairn.models.decision.Decisions.DEFAULT_RELATIVE_TOLERANCE
                * Math.abs(controlMean);
        out.arm = chosen;
        out.expectedLoss = loss;
        if (loss < tol || loss == 0) {
            out.code = chosen == control ? KEEP_CONTROL : SHIP;
        } else {
            out.code = KEEP_COLLECTING;
        }
    }

    /** {mu_n, kappa_n, alpha_n, beta_n} from an arm's sums {users, payers, S1, S2}. */
    private double[] nig(double[] a) {
        return spendPrior.posterior((long) a[1], a[2], a[3]);
    }

    /**
     * Exact posterior draws of each arm's metric, as the spend model's exact sampler takes them.
     *
     * @param stats per arm the running sums {users, payers, S1, S2}
     * @param rng   the stream
     * @return per arm, {@code draws} draws of the metric
     */
    public double[][] posteriorDraws(double[][] stats, UniformRandomProvider rng) {
        int k = stats.length;
        double[][] x = new double[k][draws];
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        for (int a = 0; a < k; a++) {
            double[] st = stats[a];
            ContinuousSampler rate = metric == Metric.ARPPU ? null : ChengBetaSampler.of(rng,
                    payerPrior.a() + st[1], payerPrior.b() + st[0] - st[1]);
            double[] nig = metric == Metric.PAYER_RATE ? null : nig(st);
            ContinuousSampler gamma = nig == null ? null
                    : AhrensDieterMarsagliaTsangGammaSampler.of(rng, nig[2], 1.0);
            for (int d = 0; d < draws; d++) {
                double value = rate == null ? 1 : rate.sample();
                if (nig != null) {
                    double variance = nig[3] / gamma.sample();
                    double mu = nig[0] + Math.sqrt(variance / nig[1]) * normal.sample();
                    value *= Math.exp(mu + 0.5 * variance);
                }
                x[a][d] = value;
            }
        }
        return x;
    }

    /** The rule on draws, as {@link dev.cairn.models.decision.Decisions#decide} applies it in a fit. */
    void decideWithDraws(double[][] x, Outcome out) {
        int k = x.length;
        int n = x[0].length;
        double[] loss = new double[k];
        double[] above = new double[k];
        double controlSum = 0;
        for (int d = 0; d < n; d++) {
            double max = x[0][d];
            for (int a = 1; a < k; a++) {
                max = Math.max(max, x[a][d]);
            }
            for (int a = 0; a < k; a++) {
                loss[a] += max - x[a][d];
                above[a] += x[a][d] > x[control][d] ? 1 : 0;
            }
            controlSum += x[control][d];
        }
        int chosen = control;
        for (int a = 0; a < k; a++) {
            loss[a] /= n;
            if (loss[a] < loss[chosen]) {
                chosen = a;
            }
        }
        out.loss = loss;
        if (kind == Kind.EXPECTED_LOSS) {
            act(loss[chosen], controlSum / n, chosen, out);
        } else {
            int best = -1;
            for (int a = 0; a < k; a++) {
                if (a != control && (best < 0 || above[a] > above[best])) {
                    best = a;
                }
            }
            ship(above[best] / n > threshold, best, out);
        }
    }
}
