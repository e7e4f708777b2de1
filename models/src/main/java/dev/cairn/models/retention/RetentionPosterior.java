package dev.cairn.models.retention;

import dev.cairn.models.data.CohortDays;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.ChainRunner;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.MetropolisStep;
import dev.cairn.samplers.NutsStep;
import dev.cairn.samplers.Parameters;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import dev.cairn.samplers.SliceStep;
import dev.cairn.samplers.Sweep;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Retention curves per install cohort c and arm k, drifting over cohorts: the data, the named coordinates
 * and the update schedule. The density (likelihood, priors and gradient) is {@link RetentionDensity}.
 *
 * <p><b>activity</b> (share of a cohort active on day t, t >= 1):
 * <pre>
 *   logit r_ck(t) = (L_c + A_k) + (S_c + B_k) (log(1 + t) - log 8)
 *   active_ckt ~ BetaBinomial(n_ck, r kappa, (1 - r) kappa)     (over-dispersion for user heterogeneity)
 * </pre>
 * <b>survival</b> (share still retained; shifted-beta-geometric, Fader & Hardie 2007, Journal of
 * Interactive Marketing 21(1):76-90): alpha_ck = exp(L_c + A_k), beta_ck = exp(S_c + B_k),
 * S(t) = B(alpha, beta + t) / B(alpha, beta); with retained counts s at the observed days d_1 < d_2 < ...
 * (s_0 = n at day 0) the log likelihood is sum_i (s_{i-1} - s_i) log(S(d_{i-1}) - S(d_i)) + s_last log S(d_last):
 * right-censored at each cohort's last observed day.
 *
 * <p>The design's curve a + b log(1 + t) is written around day 7 (a = L - S log 8): the same family, but the
 * level L is then the day-7 logit, nearly uncorrelated with the slope.
 *
 * <p>Drift: L_c = L_{c-1} + sigmaL eps, S_c = S_{c-1} + sigmaS eps (a Gaussian random walk over cohort
 * order); arms are offsets A_k, B_k (none for the control). Priors (scale reasoning): activity L_1 ~
 * N(-1.5, 2^2) (D7 from 1% to 90% within 2 sd), S_1 ~ N(-0.6, 1); survival log alpha_1 ~ N(0, 1.5^2),
 * log beta_1 ~ N(1, 1.5^2); offsets ~ N(0, 1); sigmaL, sigmaS ~ half-N(0, 0.25^2) (curves move a little from
 * one cohort to the next); log kappa ~ N(log 100, 1.5^2).
 *
 * <p>Samplers. "auto" = "laplace-metropolis" ({@link LaplaceMetropolis}): the walks stored centred, every
 * coordinate proposed at once from a Gaussian approximation given the drift scales, the drift scales moved under
 * their approximate marginal, each move accepted with the exact density; then each drift scale is also moved given
 * its series' increments ({@link DriftStep}). "nuts": one No-U-Turn transition over every coordinate per
 * iteration (each walk centred or non-centred as {@link WalkChoice} decides from the data), then the
 * drift-scale moves (the centred direction: interweaving, Yu & Meng 2011). "slice" and
 * "metropolis-within-gibbs" update one coordinate at a time through the same density.
 */
public final class RetentionPosterior {
    /** The sampler "auto" runs, and the name of the Laplace-Metropolis method. */
    static final String LAPLACE_METROPOLIS = "laplace-metropolis", AUTO = LAPLACE_METROPOLIS;
    static final double OFFSET_SD = 1, DRIFT_SD = 0.25, LOG_KAPPA_MEAN = Math.log(100), LOG_KAPPA_SD = 1.5;
    /** The drift scales' prior: half-normal with sd {@link #DRIFT_SD}. */
    static final dev.cairn.models.prior.HalfNormal DRIFT = new dev.cairn.models.prior.HalfNormal(DRIFT_SD);
    /** Activity curves are centred on day 7: the covariate is log(1 + t) - log 8. */
    static final double CENTRE = Math.log(8);

    final boolean survival;
    final int cohorts;
    final int arms;
    final int control;
    final long[][] n;
    final int[][] days;
    final long[][][] active;
    /**
     * Coordinates: the level series as L_1..L_C (centred) or as L_1 and standardised steps eps_2..eps_C
     * (L_c = L_{c-1} + sigmaL eps_c, non-centred; chosen from the data by {@link WalkChoice}), the slope series
     * likewise, arm offsets (non-control arms only), log drift
     * scales, log kappa. {@link #centred} turns a point into one whose series blocks hold L_c and S_c.
     */
    final int level, slope, offLevel, offSlope, logSigmaL, logSigmaS, logKappa, size;
    final Parameters parameters;
    final RetentionDensity density;
    /** Whether the level and the slope series are stored non-centred (first value and standardised steps). */
    final boolean levelNc, slopeNc;

    /** The posterior as the default sampler ({@link #AUTO}) runs it: both walks stored centred. */
    RetentionPosterior(CohortDays data, String controlArm, boolean survival) {
        this(data, controlArm, survival, true);
    }

    /**
     * @param centredWalks store both walks centred (the Laplace-Metropolis step needs it) instead of choosing
     *                     centred or non-centred from the data ({@link WalkChoice}, for the other samplers)
     */
    RetentionPosterior(CohortDays data, String controlArm, boolean survival, boolean centredWalks) {
        this.survival = survival;
        this.cohorts = data.cohorts().size();
        this.arms = data.arms().size();
        this.control = data.arms().indexOf(controlArm);
        n = new long[cohorts][arms];
        int[][][] d = new int[cohorts][arms][];
        active = new long[cohorts][arms][];
        for (int c = 0; c < cohorts; c++) {
            for (int k = 0; k < arms; k++) {
                n[c][k] = data.installs(c, k);
                Map<Integer, Long> obs = data.observed(c, k);
                d[c][k] = obs.keySet().stream().mapToInt(Integer::intValue).toArray();
                active[c][k] = obs.values().stream().mapToLong(Long::longValue).toArray();
            }
        }
        this.days = flatten(d);
        boolean[] nc = centredWalks ? new boolean[2] : WalkChoice.nonCentred(this);
        levelNc = nc[0];
        slopeNc = nc[1];
        Parameters.Builder names = Parameters.builder();
        int i = 0;
        level = i;
        for (int c = 0; c < cohorts; c++) {
            names.real((c == 0 || !levelNc ? "level[" : "level step[") + data.cohorts().get(c) + "]");
            i++;
        }
        slope = i;
        for (int c = 0; c < cohorts; c++) {
            names.real((c == 0 || !slopeNc ? "slope[" : "slope step[") + data.cohorts().get(c) + "]");
            i++;
        }
        offLevel = i;
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                names.real("armLevel[" + data.arms().get(k) + "]");
                i++;
            }
        }
        offSlope = i;
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                names.real("armSlope[" + data.arms().get(k) + "]");
                i++;
            }
        }
        names.real("log driftLevel");
        logSigmaL = i++;
        names.real("log driftSlope");
        logSigmaS = i++;
        if (!survival) {
            names.real("log kappa");
        }
        logKappa = survival ? -1 : i++;
        size = i;
        parameters = names.build();
        density = new RetentionDensity(this);
    }

    /** days[c * arms + k]: the observed days of cohort c, arm k, ascending. */
    private int[][] flatten(int[][][] d) {
        int[][] out = new int[cohorts * arms][];
        for (int c = 0; c < cohorts; c++) {
            for (int k = 0; k < arms; k++) {
                out[c * arms + k] = d[c][k];
            }
        }
        return out;
    }

    int[] days(int c, int k) {
        return days[c * arms + k];
    }

    double levelMean() {
        return survival ? 0 : -1.5;
    }

    double levelSd() {
        return survival ? 1.5 : 2;
    }

    double slopeMean() {
        return survival ? 1 : -0.6;
    }

    double slopeSd() {
        return survival ? 1.5 : 1;
    }

    /** The coordinate of arm k's offset in a block starting at {@code first}; -1 for the control. */
    int offset(int first, int k) {
        return k == control ? -1 : first + (k < control ? k : k - 1);
    }

    double offL(double[] x, int k) {
        return k == control ? 0 : x[offset(offLevel, k)];
    }

    double offS(double[] x, int k) {
        return k == control ? 0 : x[offset(offSlope, k)];
    }

    /**
     * Writes into {@code out} the point x with its level and slope blocks replaced by the series L_c and S_c
     * (the centred values that {@link #curve} and the outputs read).
     *
     * @param x   coordinates (not modified)
     * @param out same length (modified)
     */
    void centred(double[] x, double[] out) {
        System.arraycopy(x, 0, out, 0, x.length);
        double sl = Math.exp(x[logSigmaL]), ss = Math.exp(x[logSigmaS]);
        for (int c = 1; c < cohorts; c++) {
            if (levelNc) {
                out[level + c] = out[level + c - 1] + sl * x[level + c];
            }
            if (slopeNc) {
                out[slope + c] = out[slope + c - 1] + ss * x[slope + c];
            }
        }
    }

    /**
     * The inverse of {@link #centred}: coordinates from a point whose series blocks hold L_c and S_c.
     *
     * @param centred the point with centred series (not modified)
     * @return the coordinates
     */
    double[] coordinates(double[] centred) {
        double[] x = centred.clone();
        double sl = Math.exp(centred[logSigmaL]), ss = Math.exp(centred[logSigmaS]);
        for (int c = 1; c < cohorts; c++) {
            if (levelNc) {
                x[level + c] = (centred[level + c] - centred[level + c - 1]) / sl;
            }
            if (slopeNc) {
                x[slope + c] = (centred[slope + c] - centred[slope + c - 1]) / ss;
            }
        }
        return x;
    }

    /** The curve of cohort c, arm k at day t (activity share or survival), from a centred point. */
    double curve(double[] x, int c, int k, int t) {
        double l = x[level + c] + offL(x, k);
        double s = x[slope + c] + offS(x, k);
        if (!survival) {
            double z = l + s * (Math.log1p(t) - CENTRE);
            return z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
        }
        double alpha = Math.exp(l), beta = Math.exp(s);
        double surv = 1;
        double p = 0;
        for (int i = 1; i <= t; i++) {
            p = i == 1 ? alpha / (alpha + beta) : p * (beta + i - 2) / (alpha + beta + i - 1);
            surv -= p;
        }
        return Math.max(surv, 0);
    }

    Draws sample(RunSettings settings, Progress progress, Cancellation cancellation) {
        return sample(AUTO, settings, progress, cancellation);
    }

    Draws sample(String method, RunSettings settings, Progress progress, Cancellation cancellation) {
        Sweep sweep = switch (method) {
            case "slice" -> Sweep.of(SliceStep.of(0.5));
            case "metropolis-within-gibbs" -> Sweep.of(MetropolisStep.of(0.2));
            case "laplace-metropolis" -> Sweep.of(new LaplaceMetropolis(this, settings.warmup()),
                    new DriftStep(this, level, logSigmaL, false), new DriftStep(this, slope, logSigmaS, false));
            default -> Sweep.of(NutsStep.of(settings.warmup()), new DriftStep(this, level, logSigmaL, levelNc),
                    new DriftStep(this, slope, logSigmaS, slopeNc));
        };
        return ChainRunner.of(settings).withProgress(progress).withCancellation(cancellation)
                .run(density, sweep, (chain, p, rng) -> start(rng));
    }

    /**
     * Dispersed starts. Activity: each cohort's level and slope at its own estimate ({@link WalkChoice}) plus a
     * uniform jitter of +-2 standard errors (at most 0.5; the series' first value where a cohort has none);
     * survival: the first cohort around the prior centres, the others at it. Non-centred steps uniform on
     * (-1, 1); small offsets; drift scales around 0.05.
     */
    double[] start(UniformRandomProvider rng) {
        double[] x = new double[size];
        double[][] est = survival ? new double[cohorts][] : WalkChoice.estimates(this);
        double[] centred = new double[size];
        for (int c = 0; c < cohorts; c++) {
            double[] e = est[c];
            double l = e != null ? e[0] + Math.min(0.5, 2 * Math.sqrt(e[2])) * (2 * rng.nextDouble() - 1)
                    : c == 0 ? levelMean() + 0.5 * (2 * rng.nextDouble() - 1) : centred[level + c - 1];
            double s = e != null ? e[1] + Math.min(0.5, 2 * Math.sqrt(e[3])) * (2 * rng.nextDouble() - 1)
                    : c == 0 ? slopeMean() + 0.3 * (2 * rng.nextDouble() - 1) : centred[slope + c - 1];
            centred[level + c] = l;
            centred[slope + c] = s;
        }
        for (int c = 0; c < cohorts; c++) {
            x[level + c] = levelNc && c > 0 ? 2 * rng.nextDouble() - 1 : centred[level + c];
            x[slope + c] = slopeNc && c > 0 ? 2 * rng.nextDouble() - 1 : centred[slope + c];
        }
        for (int i = offLevel; i < logSigmaL; i++) {
            x[i] = 0.1 * (2 * rng.nextDouble() - 1);
        }
        x[logSigmaL] = Math.log(0.05) + (2 * rng.nextDouble() - 1);
        x[logSigmaS] = Math.log(0.05) + (2 * rng.nextDouble() - 1);
        if (!survival) {
            x[logKappa] = LOG_KAPPA_MEAN + (2 * rng.nextDouble() - 1);
        }
        return x;
    }
}
