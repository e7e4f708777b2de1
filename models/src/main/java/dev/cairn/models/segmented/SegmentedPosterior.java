package dev.cairn.models.segmented;

import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SegmentedSpendData;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import dev.cairn.samplers.Step;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Spend per (segment j, arm k) cell, pooled across segments:
 *
 * <pre>
 *   payers_jk ~ Binomial(n_jk, p_jk),     logit p_jk = alpha_j + d_jk       (d_j,control = 0)
 *   log y | payer ~ N(mu_jk, sigma_j^2),  mu_jk      = beta_j  + e_jk       (e_j,control = 0)
 *   alpha_j ~ N(alpha0, tauAlpha^2)    d_jk ~ N(D_k, tauD^2)
 *   beta_j  ~ N(beta0,  tauBeta^2)     e_jk ~ N(E_k, tauE^2)
 *   log sigma_jk = log sigma_j + G_k    (G_control = 0),   log sigma_j ~ N(s0, tauS^2),   G_k ~ N(0, 0.5^2)
 * </pre>
 * G_k lets an arm change the spread of payers' spend (a discount that draws a few big spenders), which
 * changes ARPPU = exp(mu + sigma^2/2) even when the mean log spend does not move.
 * Hyperpriors (scale reasoning): alpha0 ~ N(-3, 2^2) puts the typical payer rate near 5% with 0.1%-50%
 * inside two sd; D_k, E_k ~ N(0, 1) allow arm effects up to a factor e^2 on the odds or on spend;
 * beta0 ~ N(0, 5^2) leaves the currency scale free; s0 ~ N(0, 1); tauAlpha, tauBeta ~ half-N(0, 1) and
 * tauD, tauE, tauS ~ half-N(0, 0.5^2) (segments differ more in level than in how an arm acts on them).
 *
 * <p>Likelihood per cell in sufficient statistics (n, m, S1, S2) as in the spend model. Sampler
 * (Metropolis-within-Gibbs), per sweep:
 * <ul>
 *   <li>centred: slice updates of alpha_j, d_jk, log sigma_j (non-conjugate); exact normal draws of beta_j,
 *       e_jk (Gaussian likelihood given sigma_j) and of alpha0, D_k, beta0, E_k, s0 (normal-normal); slice
 *       updates of each log tau;</li>
 *   <li>non-centred (alpha_j = alpha0 + tauAlpha a_j, d_jk = D_k + tauD z_jk, beta_j = beta0 + tauBeta b_j,
 *       e_jk = E_k + tauE f_jk, log sigma_j = s0 + tauS w_j with standard-normal a, z, b, f, w): slice
 *       updates of a, z, w and of the hyperparameters, exact normal draws of b, f, beta0 and E_k. This
 *       removes the funnel between a scale and its effects when segments carry little data (Papaspiliopoulos,
 *       Roberts & Skold 2007, Statistical Science 22(1)).</li>
 * </ul>
 * A cell with no users contributes no likelihood; its effect comes from the pooling alone.
 */
public final class SegmentedPosterior {
    static final double ALPHA0_MEAN = -3, ALPHA0_SD = 2, EFFECT_SD = 1, BETA0_SD = 5, S0_SD = 1;
    static final double TAU_LEVEL_SD = 1, TAU_EFFECT_SD = 0.5, SPREAD_SD = 0.5;

    final int segments;
    final int arms;
    final int control;
    final boolean spend;
    /** Per cell [j][k]: n, m, S1, S2; present[j][k] when the cell has users. */
    final double[][] n, m, s1, s2;
    final boolean[][] present;
    final Layout at;
    /** Non-centred segment levels (alpha, beta, log sigma) and arm effects (d, e), chosen separately. */
    final boolean levelsNc;
    final boolean effectsNc;

    SegmentedPosterior(SegmentedSpendData data, String controlArm, boolean levelsNc, boolean effectsNc) {
        List<String> segs = data.segments();
        List<String> armNames = data.arms();
        this.segments = segs.size();
        this.arms = armNames.size();
        this.control = armNames.indexOf(controlArm);
        this.spend = data.hasSpend();
        this.levelsNc = levelsNc;
        this.effectsNc = effectsNc;
        n = new double[segments][arms];
        m = new double[segments][arms];
        s1 = new double[segments][arms];
        s2 = new double[segments][arms];
        present = new boolean[segments][arms];
        for (int j = 0; j < segments; j++) {
            for (int k = 0; k < arms; k++) {
                ArmStats c = data.cell(segs.get(j), armNames.get(k));
                if (c != null && c.users() > 0) {
                    present[j][k] = true;
                    n[j][k] = c.users();
                    m[j][k] = c.payers();
                    if (spend && c.payers() > 0) {
                        s1[j][k] = c.logSpendSum();
                        s2[j][k] = c.logSpendSqSum();
                    }
                }
            }
        }
        at = new Layout(segments, arms, control, spend);
    }

    /** Positions of the internal coordinates (all unconstrained; taus are on the log scale). */
    static final class Layout {
        final int segments, arms, control;
        final int alpha, d, beta, e, logSigma, alpha0, bigD, beta0, bigE, bigG, s0, tauAlpha, tauD, tauBeta, tauE, tauS, size;

        Layout(int segments, int arms, int control, boolean spend) {
            this.segments = segments;
            this.arms = arms;
            this.control = control;
            int i = 0;
            alpha = i;
            i += segments;
            d = i;
            i += segments * arms;
            alpha0 = i++;
            bigD = i;
            i += arms;
            tauAlpha = i++;
            tauD = i++;
            if (spend) {
                beta = i;
                i += segments;
                e = i;
                i += segments * arms;
                logSigma = i;
                i += segments;
                beta0 = i++;
                bigE = i;
                i += arms;
                bigG = i;
                i += arms;
                s0 = i++;
                tauBeta = i++;
                tauE = i++;
                tauS = i++;
            } else {
                beta = e = logSigma = beta0 = bigE = bigG = s0 = tauBeta = tauE = tauS = -1;
            }
            size = i;
        }

        int d(int j, int k) {
            return d + j * arms + k;
        }

        int e(int j, int k) {
            return e + j * arms + k;
        }
    }

    // ---- the model in terms of the centred quantities, computed from either parameterisation ----

    /**
     * A centred quantity from coordinate {@code raw}: as stored, or, non-centred, mean + exp(log scale) x raw
     * (x[mean] the population mean, x[logScale] the log of its spread).
     */
    private static double centred(boolean nonCentred, double[] x, int mean, int logScale, int raw) {
        return nonCentred ? x[mean] + Math.exp(x[logScale]) * x[raw] : x[raw];
    }

    double alpha(double[] x, int j) {
        return centred(levelsNc, x, at.alpha0, at.tauAlpha, at.alpha + j);
    }

    double d(double[] x, int j, int k) {
        if (k == control) {
            return 0;
        }
        return centred(effectsNc, x, at.bigD + k, at.tauD, at.d(j, k));
    }

    double beta(double[] x, int j) {
        return centred(levelsNc, x, at.beta0, at.tauBeta, at.beta + j);
    }

    double e(double[] x, int j, int k) {
        if (k == control) {
            return 0;
        }
        return centred(effectsNc, x, at.bigE + k, at.tauE, at.e(j, k));
    }

    double logSigma(double[] x, int j) {
        return centred(levelsNc, x, at.s0, at.tauS, at.logSigma + j);
    }

    /** log sigma of cell (j, k): the segment's log sigma plus the arm's shift G_k (G_control = 0). */
    double logSigmaCell(double[] x, int j, int k) {
        return logSigma(x, j) + (k == control ? 0 : x[at.bigG + k]);
    }

    /** m eta - n log(1 + e^eta): the binomial log likelihood of cell (j, k) at logit eta. */
    double binomial(int j, int k, double eta) {
        if (!present[j][k]) {
            return 0;
        }
        return m[j][k] * eta - n[j][k] * softplus(eta);
    }

    /** -m log sigma - (S2 - 2 mu S1 + m mu^2) / (2 sigma^2): payers' lognormal log likelihood in cell (j, k). */
    double lognormal(int j, int k, double mu, double logSigma) {
        double mm = m[j][k];
        if (!present[j][k] || mm == 0) {
            return 0;
        }
        double ss = s2[j][k] - 2 * mu * s1[j][k] + mm * mu * mu;
        return -mm * logSigma - ss / (2 * Math.exp(2 * logSigma));
    }

    static double softplus(double z) {
        return z > 0 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z));
    }

    static double normal(double x, double mean, double sd) {
        double z = (x - mean) / sd;
        return -0.5 * z * z;
    }

    /** log half-normal prior of tau = e^l plus the log-Jacobian l. */
    static double logTau(double l, double scale) {
        double tau = Math.exp(l);
        return -0.5 * (tau / scale) * (tau / scale) + l;
    }

    /** The joint log density over the internal coordinates (used for the chain's bookkeeping). */
    double logJoint(double[] x) {
        double lp = normal(x[at.alpha0], ALPHA0_MEAN, ALPHA0_SD) + logTau(x[at.tauAlpha], TAU_LEVEL_SD)
                + logTau(x[at.tauD], TAU_EFFECT_SD);
        double tA = Math.exp(x[at.tauAlpha]), tD = Math.exp(x[at.tauD]);
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                lp += normal(x[at.bigD + k], 0, EFFECT_SD);
            }
        }
        for (int j = 0; j < segments; j++) {
            lp += levelsNc ? normal(x[at.alpha + j], 0, 1) : normal(x[at.alpha + j], x[at.alpha0], tA) - Math.log(tA);
            double a = alpha(x, j);
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    lp += effectsNc ? normal(x[at.d(j, k)], 0, 1)
                            : normal(x[at.d(j, k)], x[at.bigD + k], tD) - Math.log(tD);
                }
                lp += binomial(j, k, a + d(x, j, k));
            }
        }
        if (spend) {
            lp += normal(x[at.beta0], 0, BETA0_SD) + normal(x[at.s0], 0, S0_SD) + logTau(x[at.tauBeta], TAU_LEVEL_SD)
                    + logTau(x[at.tauE], TAU_EFFECT_SD) + logTau(x[at.tauS], TAU_EFFECT_SD);
            double tB = Math.exp(x[at.tauBeta]), tE = Math.exp(x[at.tauE]), tS = Math.exp(x[at.tauS]);
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    lp += normal(x[at.bigE + k], 0, EFFECT_SD) + normal(x[at.bigG + k], 0, SPREAD_SD);
                }
            }
            for (int j = 0; j < segments; j++) {
                lp += levelsNc ? normal(x[at.beta + j], 0, 1) + normal(x[at.logSigma + j], 0, 1)
                        : normal(x[at.beta + j], x[at.beta0], tB) - Math.log(tB)
                                + normal(x[at.logSigma + j], x[at.s0], tS) - Math.log(tS);
                double b = beta(x, j), ls = logSigma(x, j);
                for (int k = 0; k < arms; k++) {
                    if (k != control) {
                        lp += effectsNc ? normal(x[at.e(j, k)], 0, 1)
                                : normal(x[at.e(j, k)], x[at.bigE + k], tE) - Math.log(tE);
                    }
                    lp += lognormal(j, k, b + e(x, j, k), ls + (k == control ? 0 : x[at.bigG + k]));
                }
            }
        }
        return lp;
    }

    /** Runs the chains and returns the internal draws (see {@link SegmentedOutputs} for named quantities). */
    Draws sample(RunSettings settings, Progress progress, Cancellation cancellation) {
        return dev.cairn.models.FitSupport.runInternal(at.size, this::logJoint, SweepUpdater::new, this::start, settings,
                progress, cancellation);
    }

    /** Dispersed starts: level parameters near their prior centres, effects near zero, scales around 0.3. */
    double[] start(UniformRandomProvider rng) {
        double[] x = new double[at.size];
        for (int i = 0; i < x.length; i++) {
            x[i] = 0.5 * (2 * rng.nextDouble() - 1);
        }
        x[at.alpha0] += ALPHA0_MEAN;
        for (int t : spend ? new int[] {at.tauAlpha, at.tauD, at.tauBeta, at.tauE, at.tauS} : new int[] {at.tauAlpha, at.tauD}) {
            x[t] = Math.log(0.3) + (2 * rng.nextDouble() - 1);
        }
        if (!levelsNc) {
            for (int j = 0; j < segments; j++) {
                x[at.alpha + j] += ALPHA0_MEAN;
            }
        }
        return x;
    }

    /** One Metropolis-within-Gibbs sweep over every internal coordinate, using local conditionals. */
    final class SweepUpdater implements Step.Updater {
        private final dev.cairn.models.LocalSlice local = new dev.cairn.models.LocalSlice(at.size, 1.0);
        private final org.ejml.data.DMatrixRMaj blockQ = new org.ejml.data.DMatrixRMaj(arms, arms);
        private final org.ejml.data.DMatrixRMaj blockL = new org.ejml.data.DMatrixRMaj(arms, arms);
        private final double[] blockH = new double[arms];
        private final org.ejml.interfaces.decomposition.CholeskyDecomposition_F64<org.ejml.data.DMatrixRMaj> cholesky =
                org.ejml.dense.row.factory.DecompositionFactory_DDRM.chol(arms, true);
        private final dev.cairn.samplers.ChainGaussian normal = new dev.cairn.samplers.ChainGaussian();
        private UniformRandomProvider stream;

        @Override
        public void update(ChainState state, UniformRandomProvider r, boolean adaptNow) {
            stream = r;
            local.begin(r, adaptNow);
            double[] x = state.point();
            sweep(x);
            state.refresh();
        }

        private void slice(double[] x, int i, DoubleUnaryOperator f) {
            local.update(x, i, f);
        }

        private double normalDraw(double mean, double precision) {
            return mean + normal.sample(stream) / Math.sqrt(precision);
        }

        private void sweep(double[] x) {
            // ---- payer rate: segment levels alpha_j and arm effects d_jk ----
            double tA = Math.exp(x[at.tauAlpha]), tD = Math.exp(x[at.tauD]);
            for (int j = 0; j < segments; j++) {
                int jj = j;
                slice(x, at.alpha + j, v -> {
                    double level = levelsNc ? x[at.alpha0] + tA * v : v;
                    double lp = levelsNc ? -0.5 * v * v : normal(v, x[at.alpha0], tA);
                    for (int k = 0; k < arms; k++) {
                        lp += binomial(jj, k, level + d(x, jj, k));
                    }
                    return lp;
                });
                for (int k = 0; k < arms; k++) {
                    if (k == control) {
                        continue;
                    }
                    int kk = k;
                    if (!present[j][k]) {
                        x[at.d(j, k)] = effectsNc ? normal.sample(stream) : x[at.bigD + k] + tD * normal.sample(stream);
                    } else {
                        slice(x, at.d(j, k), v -> effectsNc
                                ? -0.5 * v * v + binomial(jj, kk, alpha(x, jj) + x[at.bigD + kk] + tD * v)
                                : normal(v, x[at.bigD + kk], tD) + binomial(jj, kk, alpha(x, jj) + v));
                    }
                }
            }
            if (levelsNc) {
                slice(x, at.alpha0, v -> normal(v, ALPHA0_MEAN, ALPHA0_SD) + allBinomial(x, at.alpha0, v));
                slice(x, at.tauAlpha, l -> logTau(l, TAU_LEVEL_SD) + allBinomial(x, at.tauAlpha, l));
            } else {
                double p = 1 / (ALPHA0_SD * ALPHA0_SD) + segments / (tA * tA);
                x[at.alpha0] = normalDraw((ALPHA0_MEAN / (ALPHA0_SD * ALPHA0_SD) + sum(x, at.alpha, segments) / (tA * tA)) / p, p);
                sliceScale(x, at.tauAlpha, TAU_LEVEL_SD, at.alpha, segments, 1, x[at.alpha0], -1);
                interweave(x, at.alpha, at.alpha0, at.tauAlpha, ALPHA0_MEAN, ALPHA0_SD, TAU_LEVEL_SD, true);
            }
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                int i = at.bigD + k;
                if (effectsNc) {
                    slice(x, i, v -> normal(v, 0, EFFECT_SD) + allBinomial(x, i, v));
                } else {
                    double s = 0;
                    for (int j = 0; j < segments; j++) {
                        s += x[at.d(j, k)];
                    }
                    double p = 1 / (EFFECT_SD * EFFECT_SD) + segments / (tD * tD);
                    x[i] = normalDraw(s / (tD * tD) / p, p);
                }
            }
            if (effectsNc) {
                slice(x, at.tauD, l -> logTau(l, TAU_EFFECT_SD) + allBinomial(x, at.tauD, l));
                interweaveEffects(x, at.d, at.bigD, at.tauD);
            } else {
                sliceScale(x, at.tauD, TAU_EFFECT_SD, at.d, segments, arms, 0, at.bigD);
            }
            if (!spend) {
                return;
            }
            // ---- spend of payers: log sigma_j, segment levels beta_j and arm effects e_jk ----
            double tB = Math.exp(x[at.tauBeta]), tE = Math.exp(x[at.tauE]), tS = Math.exp(x[at.tauS]);
            for (int j = 0; j < segments; j++) {
                int jj = j;
                slice(x, at.logSigma + j, v -> {
                    double ls = levelsNc ? x[at.s0] + tS * v : v;
                    double lp = levelsNc ? -0.5 * v * v : normal(v, x[at.s0], tS);
                    for (int k = 0; k < arms; k++) {
                        lp += lognormal(jj, k, beta(x, jj) + e(x, jj, k), ls + (k == control ? 0 : x[at.bigG + k]));
                    }
                    return lp;
                });
                spendBlock(x, j);
            }
            if (levelsNc) {
                // beta0 is Gaussian in every cell's lognormal term.
                double pb = 1 / (BETA0_SD * BETA0_SD);
                double wb = 0;
                for (int j = 0; j < segments; j++) {
                    double rest = tB * x[at.beta + j];
                    for (int k = 0; k < arms; k++) {
                        double v = Math.exp(2 * logSigmaCell(x, j, k));
                        pb += m[j][k] / v;
                        wb += (s1[j][k] - m[j][k] * (rest + e(x, j, k))) / v;
                    }
                }
                x[at.beta0] = normalDraw(wb / pb, pb);
                slice(x, at.s0, v -> normal(v, 0, S0_SD) + allLognormal(x, at.s0, v));
                slice(x, at.tauBeta, l -> logTau(l, TAU_LEVEL_SD) + allLognormal(x, at.tauBeta, l));
                slice(x, at.tauS, l -> logTau(l, TAU_EFFECT_SD) + allLognormal(x, at.tauS, l));
            } else {
                collapsedLevels(x);
                double ps = 1 / (S0_SD * S0_SD) + segments / (tS * tS);
                x[at.s0] = normalDraw(sum(x, at.logSigma, segments) / (tS * tS) / ps, ps);
                sliceScale(x, at.tauS, TAU_EFFECT_SD, at.logSigma, segments, 1, x[at.s0], -1);
                interweave(x, at.logSigma, at.s0, at.tauS, 0, S0_SD, TAU_EFFECT_SD, false);
            }
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                if (effectsNc) {
                    double p = 1 / (EFFECT_SD * EFFECT_SD);
                    double w = 0;
                    for (int j = 0; j < segments; j++) {
                        double v = Math.exp(2 * logSigmaCell(x, j, k));
                        p += m[j][k] / v;
                        w += (s1[j][k] - m[j][k] * (beta(x, j) + tE * x[at.e(j, k)])) / v;
                    }
                    x[at.bigE + k] = normalDraw(w / p, p);
                } else {
                    double s = 0;
                    for (int j = 0; j < segments; j++) {
                        s += x[at.e(j, k)];
                    }
                    double p = 1 / (EFFECT_SD * EFFECT_SD) + segments / (tE * tE);
                    x[at.bigE + k] = normalDraw(s / (tE * tE) / p, p);
                }
            }
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    int i = at.bigG + k;
                    slice(x, i, v -> normal(v, 0, SPREAD_SD) + allLognormal(x, i, v));
                }
            }
            if (effectsNc) {
                slice(x, at.tauE, l -> logTau(l, TAU_EFFECT_SD) + allLognormal(x, at.tauE, l));
                interweaveEffects(x, at.e, at.bigE, at.tauE);
            } else {
                sliceScale(x, at.tauE, TAU_EFFECT_SD, at.e, segments, arms, 0, at.bigE);
            }
        }

        /**
         * Interweaving (Yu & Meng 2011, "To center or not to center", J. Comput. Graph. Stat. 20(3)): after
         * the centred updates of a level mean and scale, the same pair is moved again in the non-centred
         * coordinates a_j = (level_j - mean) / tau, holding a_j fixed, and the levels follow. Either move
         * alone leaves the posterior invariant; together they mix whether tau is large (centred works) or
         * near zero (non-centred works).
         *
         * @param payer true for the payer-rate levels alpha_j (binomial terms), false for log sigma_j
         */
        private void interweave(double[] x, int levels, int mean, int scale, double priorMean, double priorSd,
                                double tauSd, boolean payer) {
            double[] a = new double[segments];
            double tau = Math.exp(x[scale]);
            for (int j = 0; j < segments; j++) {
                a[j] = (x[levels + j] - x[mean]) / tau;
            }
            slice(x, mean, v -> normal(v, priorMean, priorSd) + levelsLikelihood(x, a, levels, v, Math.exp(x[scale]), payer));
            slice(x, scale, l -> logTau(l, tauSd) + levelsLikelihood(x, a, levels, x[mean], Math.exp(l), payer));
            tau = Math.exp(x[scale]);
            for (int j = 0; j < segments; j++) {
                x[levels + j] = x[mean] + tau * a[j];
            }
        }

        /**
         * The other half of interweaving for non-centred arm effects: hold the effects d_jk = D_k + tau z_jk
         * fixed and redraw D_k (normal-normal, exact) and tau (slice, given the d_jk) as in the centred
         * parameterisation, then re-express z. Helps when segments really differ (large tau, strong data).
         */
        private void interweaveEffects(double[] x, int first, int means, int scale) {
            double tau = Math.exp(x[scale]);
            double[] effect = new double[segments * arms];
            for (int j = 0; j < segments; j++) {
                for (int k = 0; k < arms; k++) {
                    if (k != control) {
                        effect[j * arms + k] = x[means + k] + tau * x[first + j * arms + k];
                    }
                }
            }
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                double sum = 0;
                for (int j = 0; j < segments; j++) {
                    sum += effect[j * arms + k];
                }
                double p = 1 / (EFFECT_SD * EFFECT_SD) + segments / (tau * tau);
                x[means + k] = normalDraw(sum / (tau * tau) / p, p);
            }
            double ss = 0;
            int count = 0;
            for (int j = 0; j < segments; j++) {
                for (int k = 0; k < arms; k++) {
                    if (k != control) {
                        double dev = effect[j * arms + k] - x[means + k];
                        ss += dev * dev;
                        count++;
                    }
                }
            }
            double sumSquares = ss;
            int c = count;
            slice(x, scale, l -> logTau(l, TAU_EFFECT_SD) - c * l - sumSquares / (2 * Math.exp(2 * l)));
            tau = Math.exp(x[scale]);
            for (int j = 0; j < segments; j++) {
                for (int k = 0; k < arms; k++) {
                    if (k != control) {
                        x[first + j * arms + k] = (effect[j * arms + k] - x[means + k]) / tau;
                    }
                }
            }
        }

        /** The likelihood of every cell with levels mean + tau a_j (payer: binomial; else lognormal). */
        private double levelsLikelihood(double[] x, double[] a, int levels, double mean, double tau, boolean payer) {
            double lp = 0;
            for (int j = 0; j < segments; j++) {
                double level = mean + tau * a[j];
                for (int k = 0; k < arms; k++) {
                    lp += payer ? binomial(j, k, level + d(x, j, k))
                            : lognormal(j, k, beta(x, j) + e(x, j, k), level + (k == control ? 0 : x[at.bigG + k]));
                }
            }
            return lp;
        }

        /**
         * Centred spend levels: (tauBeta, beta0, beta_j) updated with the beta_j integrated out, as in the
         * pooled-effects model. Given sigma_j and the arm effects, segment j's cells give beta_j a Gaussian
         * "estimate" bhat_j with precision P_j = sum_k m_jk / sigma_j^2, so bhat_j ~ N(beta0, tauBeta^2 + 1/P_j)
         * (BDA3 section 5.4): log tauBeta is slice-sampled from its marginal (beta0 integrated too, under its
         * N(0, 5^2) prior), then beta0 and every beta_j are drawn exactly. This moves the hyperparameters
         * without waiting for the beta_j to follow.
         */
        private void collapsedLevels(double[] x) {
            double[] estimate = new double[segments];
            double[] variance = new double[segments];
            int informative = 0;
            for (int j = 0; j < segments; j++) {
                double p = 0, w = 0;
                for (int k = 0; k < arms; k++) {
                    double v = Math.exp(2 * logSigmaCell(x, j, k));
                    p += m[j][k] / v;
                    w += (s1[j][k] - m[j][k] * e(x, j, k)) / v;
                }
                variance[j] = p > 0 ? 1 / p : Double.POSITIVE_INFINITY;
                estimate[j] = p > 0 ? w / p : 0;
                informative += p > 0 ? 1 : 0;
            }
            double priorVar = BETA0_SD * BETA0_SD;
            DoubleUnaryOperator marginal = l -> {
                double t2 = Math.exp(2 * l);
                double precision = 1 / priorVar, weighted = 0;
                for (int j = 0; j < segments; j++) {
                    if (Double.isFinite(variance[j])) {
                        double w = 1 / (t2 + variance[j]);
                        precision += w;
                        weighted += w * estimate[j];
                    }
                }
                double mean = weighted / precision;
                double lp = logTau(l, TAU_LEVEL_SD) - 0.5 * Math.log(precision) - mean * mean / (2 * priorVar);
                for (int j = 0; j < segments; j++) {
                    if (Double.isFinite(variance[j])) {
                        double total = t2 + variance[j];
                        lp -= 0.5 * (Math.log(total) + (estimate[j] - mean) * (estimate[j] - mean) / total);
                    }
                }
                return lp;
            };
            if (informative > 0) {
                slice(x, at.tauBeta, marginal);
            }
            double t2 = Math.exp(2 * x[at.tauBeta]);
            double precision = 1 / priorVar, weighted = 0;
            for (int j = 0; j < segments; j++) {
                if (Double.isFinite(variance[j])) {
                    double w = 1 / (t2 + variance[j]);
                    precision += w;
                    weighted += w * estimate[j];
                }
            }
            x[at.beta0] = normalDraw(weighted / precision, precision);
            for (int j = 0; j < segments; j++) {
                double p = 1 / t2 + (Double.isFinite(variance[j]) ? 1 / variance[j] : 0);
                double w = x[at.beta0] / t2 + (Double.isFinite(variance[j]) ? estimate[j] / variance[j] : 0);
                x[at.beta + j] = normalDraw(w / p, p);
            }
        }

        /**
         * Exact joint draw of segment j's spend level and arm effects (beta_j or b_j, and e_jk or f_jk for
         * every non-control arm) given everything else. Each cell's mean log spend is linear in them,
         * mu_jk = c_k + L_k' theta, with a Gaussian likelihood of precision m_jk / sigma_j^2 for the
         * observation S1_jk / m_jk, and their priors are independent normals, so the conditional is normal
         * with precision Q = diag(1/prior var) + sum_k (m_jk/sigma^2) L_k L_k' and mean Q^-1 h,
         * h = diag(1/prior var) prior mean + sum_k ((S1_jk - m_jk c_k)/sigma^2) L_k. Drawing the block at
         * once removes the strong negative correlation between a segment's level and its arm effects.
         */
        private void spendBlock(double[] x, int j) {
            double tB = Math.exp(x[at.tauBeta]), tE = Math.exp(x[at.tauE]);
            double levelCoef = levelsNc ? tB : 1, levelOffset = levelsNc ? x[at.beta0] : 0;
            double effectCoef = effectsNc ? tE : 1;
            int dim = arms;
            blockQ.zero();
            java.util.Arrays.fill(blockH, 0);
            // priors: index 0 the level, index k the effect of arm k (the control's index stays unused)
            double levelPriorVar = levelsNc ? 1 : tB * tB;
            double levelPriorMean = levelsNc ? 0 : x[at.beta0];
            blockQ.set(0, 0, 1 / levelPriorVar);
            blockH[0] = levelPriorMean / levelPriorVar;
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                double var = effectsNc ? 1 : tE * tE;
                double mean = effectsNc ? 0 : x[at.bigE + k];
                int r = k < control ? k + 1 : k;
                blockQ.set(r, r, 1 / var);
                blockH[r] = mean / var;
            }
            for (int k = 0; k < arms; k++) {
                double v = Math.exp(2 * logSigmaCell(x, j, k));
                double w = m[j][k] / v;
                if (w == 0) {
                    continue;
                }
                double offset = levelOffset + (k != control && effectsNc ? x[at.bigE + k] : 0);
                double residual = (s1[j][k] - m[j][k] * offset) / v;
                blockQ.set(0, 0, blockQ.get(0, 0) + w * levelCoef * levelCoef);
                blockH[0] += residual * levelCoef;
                if (k != control) {
                    int r = k < control ? k + 1 : k;
                    blockQ.set(r, r, blockQ.get(r, r) + w * effectCoef * effectCoef);
                    blockQ.set(0, r, blockQ.get(0, r) + w * levelCoef * effectCoef);
                    blockQ.set(r, 0, blockQ.get(0, r));
                    blockH[r] += residual * effectCoef;
                }
            }
            if (!cholesky.decompose(blockQ)) {
                throw new IllegalStateException("spend block precision is not positive definite in segment " + j);
            }
            org.ejml.data.DMatrixRMaj lower = cholesky.getT(blockL);
            // mean = Q^-1 h: forward then back substitution with L L' = Q; add L'^-1 z for the noise.
            double[] y = new double[dim];
            for (int r = 0; r < dim; r++) {
                double sum = blockH[r];
                for (int c = 0; c < r; c++) {
                    sum -= lower.get(r, c) * y[c];
                }
                y[r] = sum / lower.get(r, r);
            }
            for (int r = 0; r < dim; r++) {
                y[r] += normal.sample(stream);
            }
            double[] theta = new double[dim];
            for (int r = dim - 1; r >= 0; r--) {
                double sum = y[r];
                for (int c = r + 1; c < dim; c++) {
                    sum -= lower.get(c, r) * theta[c];
                }
                theta[r] = sum / lower.get(r, r);
            }
            x[at.beta + j] = theta[0];
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    x[at.e(j, k)] = theta[k < control ? k + 1 : k];
                }
            }
        }

        /**
         * Slice update of log tau for centred effects x[first + j*width + k] ~ N(mean_k, tau^2); with
         * width = arms the control column is skipped, and means come from x[meanAt + k] when meanAt >= 0.
         */
        private void sliceScale(double[] x, int i, double scale, int first, int rows, int width, double mean, int meanAt) {
            double ss = 0;
            int count = 0;
            for (int j = 0; j < rows; j++) {
                for (int k = 0; k < width; k++) {
                    if (width > 1 && k == control) {
                        continue;
                    }
                    double mu = meanAt >= 0 ? x[meanAt + k] : mean;
                    double dev = x[first + j * width + k] - mu;
                    ss += dev * dev;
                    count++;
                }
            }
            double sumSquares = ss;
            int c = count;
            slice(x, i, l -> logTau(l, scale) - c * l - sumSquares / (2 * Math.exp(2 * l)));
        }

        /** Sum of every cell's binomial term with coordinate i set to v. */
        private double allBinomial(double[] x, int i, double v) {
            double saved = x[i];
            x[i] = v;
            double lp = 0;
            for (int j = 0; j < segments; j++) {
                double a = alpha(x, j);
                for (int k = 0; k < arms; k++) {
                    lp += binomial(j, k, a + d(x, j, k));
                }
            }
            x[i] = saved;
            return lp;
        }

        /** Sum of every cell's lognormal term with coordinate i set to v. */
        private double allLognormal(double[] x, int i, double v) {
            double saved = x[i];
            x[i] = v;
            double lp = 0;
            for (int j = 0; j < segments; j++) {
                double b = beta(x, j);
                for (int k = 0; k < arms; k++) {
                    lp += lognormal(j, k, b + e(x, j, k), logSigmaCell(x, j, k));
                }
            }
            x[i] = saved;
            return lp;
        }
    }

    static double sum(double[] x, int first, int count) {
        double s = 0;
        for (int i = 0; i < count; i++) {
            s += x[first + i];
        }
        return s;
    }
}
