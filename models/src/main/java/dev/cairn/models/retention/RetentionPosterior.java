package dev.cairn.models.retention;

import dev.cairn.models.data.CohortDays;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import dev.cairn.samplers.Step;
import java.util.Map;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.special.Gamma;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Retention curves per install cohort c and arm k, drifting over cohorts.
 *
 * <p><b>activity</b> (share of a cohort active on day t, t >= 1):
 * <pre>
 *   logit r_ck(t) = (L_c + A_k) + (S_c + B_k) (log(1 + t) - log 8)
 *   active_ckt ~ BetaBinomial(n_ck, r kappa, (1 - r) kappa)     (over-dispersion for user heterogeneity)
 * </pre>
 * <b>survival</b> (share still retained; shifted-beta-geometric, Fader & Hardie 2007, Journal of
 * Interactive Marketing 21(1):76-90): alpha_ck = exp(L_c + A_k), beta_ck = exp(S_c + B_k),
 * P(T = 1) = alpha / (alpha + beta), P(T = t) = P(T = t - 1) (beta + t - 2) / (alpha + beta + t - 1),
 * S(t) = 1 - sum_{i <= t} P(T = i) = B(alpha, beta + t) / B(alpha, beta). With retained counts s at the
 * observed days d_1 < d_2 < ... (s_0 = n at day 0), the log likelihood is
 * sum_i (s_{i-1} - s_i) log(S(d_{i-1}) - S(d_i)) + s_last log S(d_last): right-censored at each cohort's
 * last observed day.
 *
 * The design's curve a + b log(1 + t) is written around day 7 (a = L - S log 8): the same family, but the
 * level L is then the day-7 logit, nearly uncorrelated with the slope, which Gibbs-style updates need.
 *
 * <p>Drift: L_c = L_{c-1} + sigmaL eps, S_c = S_{c-1} + sigmaS eps (a Gaussian random walk over cohort
 * order); arms are offsets A_k, B_k (zero for the control). Priors (scale reasoning): activity L_1 ~
 * N(-1.5, 2^2) (D7 from 1% to 90% within 2 sd), S_1 ~ N(-0.6, 1); survival log alpha_1 ~
 * N(0, 1.5^2), log beta_1 ~ N(1, 1.5^2); offsets ~ N(0, 1); sigmaL, sigmaS ~ half-N(0, 0.25^2) (curves move
 * a little from one cohort to the next); log kappa ~ N(log 100, 1.5^2).
 *
 * <p>Sampler: Metropolis-within-Gibbs with slice updates through local conditionals (each cohort
 * coefficient sees its own cells and its two random-walk neighbours), plus an interweaving move of each
 * drift scale in the random walk's innovations (Yu & Meng 2011), which keeps the chain moving when the
 * curves barely drift.
 */
public final class RetentionPosterior {
    static final double OFFSET_SD = 1, DRIFT_SD = 0.25, LOG_KAPPA_MEAN = Math.log(100), LOG_KAPPA_SD = 1.5;

    final boolean survival;
    final int cohorts;
    final int arms;
    final int control;
    final long[][] n;
    final int[][][] days;
    final long[][][] active;
    // coordinates
    final int level, slope, offLevel, offSlope, logSigmaL, logSigmaS, logKappa, size;

    RetentionPosterior(CohortDays data, String controlArm, boolean survival) {
        this.survival = survival;
        this.cohorts = data.cohorts().size();
        this.arms = data.arms().size();
        this.control = data.arms().indexOf(controlArm);
        n = new long[cohorts][arms];
        days = new int[cohorts][arms][];
        active = new long[cohorts][arms][];
        for (int c = 0; c < cohorts; c++) {
            for (int k = 0; k < arms; k++) {
                n[c][k] = data.installs(c, k);
                Map<Integer, Long> obs = data.observed(c, k);
                days[c][k] = obs.keySet().stream().mapToInt(Integer::intValue).toArray();
                active[c][k] = obs.values().stream().mapToLong(Long::longValue).toArray();
            }
        }
        int i = 0;
        level = i;
        i += cohorts;
        slope = i;
        i += cohorts;
        offLevel = i;
        i += arms;
        offSlope = i;
        i += arms;
        logSigmaL = i++;
        logSigmaS = i++;
        logKappa = survival ? -1 : i++;
        size = i;
    }

    /** Activity curves are centred on day 7: the covariate is log(1 + t) - log 8. */
    static final double CENTRE = Math.log(8);

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

    double offL(double[] x, int k) {
        return k == control ? 0 : x[offLevel + k];
    }

    double offS(double[] x, int k) {
        return k == control ? 0 : x[offSlope + k];
    }

    /** The curve of cohort c, arm k at day t (activity share or survival), from internal coordinates. */
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

    /**
     * Log likelihood of cohort c, arm k given the cohort's level and slope (before arm offsets). The
     * beta-binomial terms that depend on kappa alone (log Gamma(kappa) - log Gamma(n + kappa)) are left
     * out unless {@code kappaTerms}: they are constant in every update but kappa's, and cost a third of the
     * log-Gamma calls.
     */
    double cell(double[] x, int c, int k, double lv, double sl) {
        return cell(x, c, k, lv, sl, false);
    }

    double cell(double[] x, int c, int k, double lv, double sl, boolean kappaTerms) {
        if (n[c][k] == 0 || days[c][k].length == 0) {
            return 0;
        }
        double l = lv + offL(x, k);
        double s = sl + offS(x, k);
        int[] ds = days[c][k];
        long[] ys = active[c][k];
        if (!survival) {
            double kappa = Math.exp(x[logKappa]);
            double lp = 0;
            for (int i = 0; i < ds.length; i++) {
                double z = l + s * (Math.log1p(ds[i]) - CENTRE);
                double r = z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
                r = Math.min(Math.max(r, 1e-12), 1 - 1e-12);
                double a = r * kappa, b = (1 - r) * kappa;
                long y = ys[i], m = n[c][k];
                lp += Gamma.logGamma(y + a) + Gamma.logGamma(m - y + b) - Gamma.logGamma(a) - Gamma.logGamma(b);
                if (kappaTerms) {
                    lp += Gamma.logGamma(kappa) - Gamma.logGamma(m + kappa);
                }
            }
            return lp;
        }
        double alpha = Math.exp(l), beta = Math.exp(s);
        double lp = 0;
        double surv = 1, p = 0;
        long previous = n[c][k];
        double previousSurv = 1;
        int t = 0;
        for (int i = 0; i < ds.length; i++) {
            while (t < ds[i]) {
                t++;
                p = t == 1 ? alpha / (alpha + beta) : p * (beta + t - 2) / (alpha + beta + t - 1);
                surv -= p;
            }
            double churned = previousSurv - surv;
            long lost = previous - ys[i];
            if (lost > 0) {
                lp += lost * Math.log(Math.max(churned, 1e-300));
            }
            previous = ys[i];
            previousSurv = surv;
        }
        lp += previous * Math.log(Math.max(surv, 1e-300));
        return lp;
    }

    double cohortLikelihood(double[] x, int c, double lv, double sl) {
        double lp = 0;
        for (int k = 0; k < arms; k++) {
            lp += cell(x, c, k, lv, sl);
        }
        return lp;
    }

    double allLikelihood(double[] x) {
        return allLikelihood(x, false);
    }

    double allLikelihood(double[] x, boolean kappaTerms) {
        double lp = 0;
        for (int c = 0; c < cohorts; c++) {
            for (int k = 0; k < arms; k++) {
                lp += cell(x, c, k, x[level + c], x[slope + c], kappaTerms);
            }
        }
        return lp;
    }

    static double normal(double x, double mean, double sd) {
        double z = (x - mean) / sd;
        return -0.5 * z * z;
    }

    /** Random-walk prior of a coefficient series at first..first+C-1 with scale e^logSigma. */
    double walk(double[] x, int first, double firstMean, double firstSd, double logSigma) {
        double sigma = Math.exp(logSigma);
        double lp = normal(x[first], firstMean, firstSd);
        for (int c = 1; c < cohorts; c++) {
            lp += normal(x[first + c], x[first + c - 1], sigma) - logSigma;
        }
        return lp;
    }

    double logJoint(double[] x) {
        double lp = walk(x, level, levelMean(), levelSd(), x[logSigmaL]) + walk(x, slope, slopeMean(), slopeSd(), x[logSigmaS]);
        lp += logScale(x[logSigmaL]) + logScale(x[logSigmaS]);
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                lp += normal(x[offLevel + k], 0, OFFSET_SD) + normal(x[offSlope + k], 0, OFFSET_SD);
            }
        }
        if (!survival) {
            lp += normal(x[logKappa], LOG_KAPPA_MEAN, LOG_KAPPA_SD);
        }
        return lp + allLikelihood(x, true);
    }

    /** Half-normal prior of a drift scale e^l plus the log-Jacobian l. */
    static double logScale(double l) {
        double s = Math.exp(l) / DRIFT_SD;
        return -0.5 * s * s + l;
    }

    Draws sample(RunSettings settings, Progress progress, Cancellation cancellation) {
        return dev.cairn.models.FitSupport.runInternal(size, this::logJoint, SweepUpdater::new, this::start, settings,
                progress, cancellation);
    }

    double[] start(UniformRandomProvider rng) {
        double[] x = new double[size];
        double l0 = levelMean() + 0.5 * (2 * rng.nextDouble() - 1);
        double s0 = slopeMean() + 0.3 * (2 * rng.nextDouble() - 1);
        for (int c = 0; c < cohorts; c++) {
            x[level + c] = l0;
            x[slope + c] = s0;
        }
        for (int k = 0; k < arms; k++) {
            x[offLevel + k] = 0.1 * (2 * rng.nextDouble() - 1);
            x[offSlope + k] = 0.1 * (2 * rng.nextDouble() - 1);
        }
        x[logSigmaL] = Math.log(0.05) + (2 * rng.nextDouble() - 1);
        x[logSigmaS] = Math.log(0.05) + (2 * rng.nextDouble() - 1);
        if (!survival) {
            x[logKappa] = LOG_KAPPA_MEAN + (2 * rng.nextDouble() - 1);
        }
        return x;
    }

    final class SweepUpdater implements Step.Updater {
        private final dev.cairn.models.LocalSlice local = new dev.cairn.models.LocalSlice(size, 0.5);

        private void slice(double[] x, int i, DoubleUnaryOperator f) {
            local.update(x, i, f);
        }

        @Override
        public void update(ChainState state, UniformRandomProvider r, boolean adaptNow) {
            local.begin(r, adaptNow);
            double[] x = state.point();
            for (int c = 0; c < cohorts; c++) {
                int cc = c;
                slice(x, level + c, v -> walkLocal(x, level, cc, v, levelMean(), levelSd(), x[logSigmaL])
                        + cohortLikelihood(x, cc, v, x[slope + cc]));
                slice(x, slope + c, v -> walkLocal(x, slope, cc, v, slopeMean(), slopeSd(), x[logSigmaS])
                        + cohortLikelihood(x, cc, x[level + cc], v));
            }
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                int kk = k;
                slice(x, offLevel + k, v -> normal(v, 0, OFFSET_SD) + withValue(x, offLevel + kk, v, () -> armLikelihood(x, kk)));
                slice(x, offSlope + k, v -> normal(v, 0, OFFSET_SD) + withValue(x, offSlope + kk, v, () -> armLikelihood(x, kk)));
            }
            slice(x, logSigmaL, l -> logScale(l) + walkIncrements(x, level, l));
            slice(x, logSigmaS, l -> logScale(l) + walkIncrements(x, slope, l));
            interweave(x, level, logSigmaL);
            interweave(x, slope, logSigmaS);
            shift(x, level, offLevel, levelMean(), levelSd());
            shift(x, slope, offSlope, slopeMean(), slopeSd());
            if (!survival) {
                slice(x, logKappa, v -> normal(v, LOG_KAPPA_MEAN, LOG_KAPPA_SD)
                        + withValue(x, logKappa, v, () -> allLikelihood(x, true)));
            }
            state.refresh();
        }

        /** The random-walk terms that involve coefficient c of a series, with its value set to v. */
        private double walkLocal(double[] x, int first, int c, double v, double firstMean, double firstSd, double logSigma) {
            double sigma = Math.exp(logSigma);
            double lp = c == 0 ? normal(v, firstMean, firstSd) : normal(v, x[first + c - 1], sigma);
            if (c + 1 < cohorts) {
                lp += normal(x[first + c + 1], v, sigma);
            }
            return lp;
        }

        private double walkIncrements(double[] x, int first, double logSigma) {
            double sigma = Math.exp(logSigma);
            double lp = 0;
            for (int c = 1; c < cohorts; c++) {
                lp += normal(x[first + c], x[first + c - 1], sigma) - logSigma;
            }
            return lp;
        }

        private double armLikelihood(double[] x, int k) {
            double lp = 0;
            for (int c = 0; c < cohorts; c++) {
                lp += cell(x, c, k, x[level + c], x[slope + c]);
            }
            return lp;
        }

        /**
         * Interweaving move of a drift scale: hold the walk's first value and its standardised innovations
         * fixed, slice-sample log sigma against the likelihood of every cohort (the series follows), then
         * rebuild the series. Valid on its own; together with the centred update it mixes whether sigma is
         * large or near zero.
         */
        private void interweave(double[] x, int first, int scaleAt) {
            if (cohorts < 2) {
                return;
            }
            double sigma = Math.exp(x[scaleAt]);
            double[] eps = new double[cohorts];
            for (int c = 1; c < cohorts; c++) {
                eps[c] = (x[first + c] - x[first + c - 1]) / sigma;
            }
            double[] saved = new double[cohorts];
            for (int c = 0; c < cohorts; c++) {
                saved[c] = x[first + c];
            }
            slice(x, scaleAt, l -> {
                double s = Math.exp(l);
                for (int c = 1; c < cohorts; c++) {
                    x[first + c] = x[first + c - 1] + s * eps[c];
                }
                double lp = logScale(l) + allLikelihood(x);
                return lp;
            });
            double s = Math.exp(x[scaleAt]);
            x[first] = saved[0];
            for (int c = 1; c < cohorts; c++) {
                x[first + c] = x[first + c - 1] + s * eps[c];
            }
        }

        /**
         * Two joint moves along directions single-coordinate updates crawl along: every cohort coefficient of
         * a series shifted by the same delta (the random-walk increments do not change, so the series moves
         * as a whole), and that shift with the arm offsets shifted back by delta (only the control's curves
         * change). Each is a slice update of delta, which leaves the posterior invariant (a translation has
         * unit Jacobian).
         */
        private void shift(double[] x, int first, int offsets, double firstMean, double firstSd) {
            double[] base = new double[cohorts];
            double[] offsetBase = new double[arms];
            for (int pass = 0; pass < 2; pass++) {
                boolean withOffsets = pass == 1;
                if (withOffsets && arms < 2) {
                    return;
                }
                for (int c = 0; c < cohorts; c++) {
                    base[c] = x[first + c];
                }
                for (int k = 0; k < arms; k++) {
                    offsetBase[k] = x[offsets + k];
                }
                DoubleUnaryOperator density = delta -> {
                    apply(x, first, offsets, base, offsetBase, delta, withOffsets);
                    double lp = normal(x[first], firstMean, firstSd) + allLikelihood(x);
                    if (withOffsets) {
                        for (int k = 0; k < arms; k++) {
                            if (k != control) {
                                lp += normal(x[offsets + k], 0, OFFSET_SD);
                            }
                        }
                    }
                    return lp;
                };
                apply(x, first, offsets, base, offsetBase, local.move(density, 0, 0.1), withOffsets);
            }
        }

        private void apply(double[] x, int first, int offsets, double[] base, double[] offsetBase, double delta,
                           boolean withOffsets) {
            for (int c = 0; c < cohorts; c++) {
                x[first + c] = base[c] + delta;
            }
            if (withOffsets) {
                for (int k = 0; k < arms; k++) {
                    if (k != control) {
                        x[offsets + k] = offsetBase[k] - delta;
                    }
                }
            }
        }

        private double withValue(double[] x, int i, double v, java.util.function.DoubleSupplier f) {
            double saved = x[i];
            x[i] = v;
            double lp = f.getAsDouble();
            x[i] = saved;
            return lp;
        }
    }
}
