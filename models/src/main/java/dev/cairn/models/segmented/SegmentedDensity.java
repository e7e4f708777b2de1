package dev.cairn.models.segmented;

import dev.cairn.samplers.GradientTarget;
import dev.cairn.samplers.Parameters;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * The segmented-spend posterior: spend per (segment j, arm k) cell, pooled across segments.
 *
 * <pre>
 *   payers_jk ~ Binomial(n_jk, p_jk),      logit p_jk   = alpha_j + d_jk        (d_j,control = 0)
 *   log y | payer ~ N(mu_jk, sigma_jk^2),  mu_jk        = beta_j  + e_jk        (e_j,control = 0)
 *                                          log sigma_jk = logSigma_j + G_k      (G_control = 0)
 *   alpha_j ~ N(alpha0, tauAlpha^2)     d_jk ~ N(D_k, tauD^2)
 *   beta_j  ~ N(beta0, tauBeta^2)       e_jk ~ N(E_k, tauE^2)
 *   logSigma_j ~ N(s0, tauS^2)          G_k ~ N(0, 0.5^2)
 * </pre>
 * G_k lets an arm change the spread of payers' spend (a discount that draws a few big spenders), which
 * changes ARPPU = exp(mu + sigma^2/2) even when the mean log spend does not move.
 * Hyperpriors (scale reasoning): alpha0 ~ N(-3, 2^2) puts the typical payer rate near 5% with 0.1%-50% inside
 * two sd; D_k, E_k ~ N(0, 1) allow arm effects up to a factor e^2 on the odds or on spend; beta0 ~ N(0, 5^2)
 * leaves the currency scale free; s0 ~ N(0, 1); tauAlpha, tauBeta ~ half-N(0, 1); tauD, tauE ~ half-N(0, 0.5^2)
 * and tauS ~ half-N(0, 0.5^2) (segments differ more in level than in how an arm acts on them).
 *
 * <p>Log likelihood per present cell in sufficient statistics (n, m, S1 = sum log y, S2 = sum (log y)^2):
 * <pre>
 *   m eta - n log(1 + e^eta)                                          d/d eta = m - n logistic(eta)
 *   - m log sigma - (S2 - 2 mu S1 + m mu^2) / (2 sigma^2)             d/d mu = (S1 - m mu) / sigma^2,
 *                                                                      d/d log sigma = -m + (S2 - 2 mu S1 + m mu^2) / sigma^2
 * </pre>
 * The three two-level structures ({@link HierarchicalCells}) add their priors and carry these derivatives
 * to the coordinates (centred or non-centred per segment, chosen in {@link SegmentedLayout}). The whole
 * density and its gradient cost one pass over the cells.
 */
final class SegmentedDensity implements GradientTarget {
    private final SegmentedCells cells;
    private final SegmentedLayout layout;
    private final ThreadLocal<double[][]> scratch;

    SegmentedDensity(SegmentedCells cells, SegmentedLayout layout) {
        this.cells = cells;
        this.layout = layout;
        int cellCount = cells.segmentCount() * cells.armCount();
        this.scratch = ThreadLocal.withInitial(() -> new double[7][Math.max(cellCount, cells.armCount())]);
    }

    @Override
    public Parameters parameters() {
        return layout.parameters;
    }

    @Override
    public double logDensityAndGradient(double[] x, double[] gradient) {
        return parts(x, gradient, true, cells.spend);
    }

    /**
     * The payer-rate part or the spend part alone: the posterior is their product (the binomial and the
     * lognormal likelihoods share no parameter, nor do their priors), so each is its block's full conditional
     * up to a constant, and a sampler can move each block on its own part.
     *
     * @param payer true for the payer-rate part (coordinates [0, payerEnd)), false for the spend part
     * @return a density over all coordinates whose value and gradient are those of the part
     */
    GradientTarget part(boolean payer) {
        return GradientTarget.of(layout.parameters, (x, gradient) -> parts(x, gradient, payer, !payer));
    }

    private double parts(double[] x, double[] gradient, boolean payerPart, boolean spendPart) {
        java.util.Arrays.fill(gradient, 0);
        double[][] s = scratch.get();
        double lp = 0;
        int cellCount = cells.segmentCount() * cells.armCount();
        double[] n = cells.users, m = cells.payers;
        if (payerPart) {
            lp += payer(x, gradient, s, cellCount, n, m);
        }
        if (spendPart) {
            lp += spend(x, gradient, s, cellCount, m);
        }
        return lp;
    }

    private double payer(double[] x, double[] gradient, double[][] s, int cellCount, double[] n, double[] m) {
        double[] eta = s[0], adjEta = s[1];
        layout.payer.values(x, eta);
        double lp = 0;
        for (int c = 0; c < cellCount; c++) {
            if (n[c] == 0) {
                adjEta[c] = 0;
                continue;
            }
            double e = eta[c];
            // softplus(e) = log(1 + e^e) and logistic(e) from one exponential
            double t = Math.exp(-Math.abs(e));
            double softplus = Math.max(e, 0) + Math.log(1 + t);
            double logistic = e >= 0 ? 1 / (1 + t) : t / (1 + t);
            lp += m[c] * e - n[c] * softplus;
            adjEta[c] = m[c] - n[c] * logistic;
        }
        return lp + layout.payer.backward(x, eta, adjEta, gradient);
    }

    private double spend(double[] x, double[] gradient, double[][] s, int cellCount, double[] m) {
        double lp = 0;
        {
            double[] mu = s[2], adjMu = s[3], logSigma = s[4], adjLogSigma = s[5];
            double[] s1 = cells.logSpendSum, s2 = cells.logSpendSqSum;
            layout.mean.values(x, mu);
            layout.spread.values(x, logSigma);
            // 1 / sigma_jk^2 = exp(-2 logSigma_j) exp(-2 G_k): one exponential per segment and per arm
            int arms = cells.armCount();
            double[] armPrecision = s[6];
            for (int k = 0; k < arms; k++) {
                armPrecision[k] = Math.exp(-2 * (logSigma[k] - logSigma[cells.control]));
            }
            int segs = cells.segmentCount();
            for (int j = 0; j < segs; j++) {
                int row = j * arms;
                double segmentPrecision = Math.exp(-2 * logSigma[row + cells.control]);
                for (int k = 0; k < arms; k++) {
                    int c = row + k;
                    double payers = m[c];
                    if (payers == 0) {
                        adjMu[c] = 0;
                        adjLogSigma[c] = 0;
                        continue;
                    }
                    double mean = mu[c], ls = logSigma[c];
                    double precision = segmentPrecision * armPrecision[k];
                    double squares = s2[c] - 2 * mean * s1[c] + payers * mean * mean;
                    lp += -payers * ls - 0.5 * squares * precision;
                    adjMu[c] = (s1[c] - payers * mean) * precision;
                    adjLogSigma[c] = -payers + squares * precision;
                }
            }
            lp += layout.mean.backward(x, mu, adjMu, gradient);
            lp += layout.spread.backward(x, logSigma, adjLogSigma, gradient);
        }
        return lp;
    }

    /** The binomial log likelihood of one cell as a function of its payer-rate logit (0 for a cell without users). */
    HyperStep.CellLikelihood payerCells() {
        return new HyperStep.CellLikelihood() {
            @Override
            public void prepare(double[] x, double[] prepared) {
                // the binomial needs nothing from the point
            }

            @Override
            public double at(double[] prepared, int cell, double eta) {
                double n = cells.users[cell];
                if (n == 0) {
                    return 0;
                }
                return cells.payers[cell] * eta - n * (Math.max(eta, 0) + Math.log(1 + Math.exp(-Math.abs(eta))));
            }

            @Override
            public double withDerivatives(double[] prepared, int cell, double eta, double[] derivatives) {
                double n = cells.users[cell], m = cells.payers[cell];
                if (n == 0) {
                    derivatives[0] = 0;
                    derivatives[1] = 0;
                    return 0;
                }
                double t = Math.exp(-Math.abs(eta));
                double p = eta >= 0 ? 1 / (1 + t) : t / (1 + t);
                derivatives[0] = m - n * p;
                derivatives[1] = -n * p * (1 - p);
                return m * eta - n * (Math.max(eta, 0) + Math.log(1 + t));
            }
        };
    }

    /**
     * The lognormal log likelihood of one cell's payers as a function of its mean log spend mu, with the
     * cell's sigma from the point (prepared: 1 / sigma_jk^2 per cell; 0 for a cell without payers).
     */
    HyperStep.CellLikelihood meanCells() {
        return new HyperStep.CellLikelihood() {
            @Override
            public void prepare(double[] x, double[] prepared) {
                layout.spread.values(x, prepared);
                for (int c = 0; c < prepared.length; c++) {
                    prepared[c] = Math.exp(-2 * prepared[c]);
                }
            }

            @Override
            public double at(double[] prepared, int cell, double mu) {
                double m = cells.payers[cell];
                if (m == 0) {
                    return 0;
                }
                double squares = cells.logSpendSqSum[cell] - 2 * mu * cells.logSpendSum[cell] + m * mu * mu;
                return -0.5 * squares * prepared[cell];
            }

            @Override
            public double withDerivatives(double[] prepared, int cell, double mu, double[] derivatives) {
                double m = cells.payers[cell], precision = prepared[cell];
                derivatives[0] = (cells.logSpendSum[cell] - m * mu) * precision;
                derivatives[1] = -m * precision;
                return at(prepared, cell, mu);
            }
        };
    }

    /**
     * The lognormal log likelihood of one cell's payers as a function of its log spread l = log sigma_jk, with
     * the cell's mean log spend from the point (prepared: the squared deviations SS_jk around it):
     * -m l - SS e^(-2l) / 2.
     */
    HyperStep.CellLikelihood spreadCells() {
        return new HyperStep.CellLikelihood() {
            @Override
            public void prepare(double[] x, double[] prepared) {
                layout.mean.values(x, prepared);
                for (int c = 0; c < prepared.length; c++) {
                    double m = cells.payers[c], mu = prepared[c];
                    prepared[c] = m == 0 ? 0
                            : Math.max(0, cells.logSpendSqSum[c] - 2 * mu * cells.logSpendSum[c] + m * mu * mu);
                }
            }

            @Override
            public double at(double[] prepared, int cell, double l) {
                return -cells.payers[cell] * l - 0.5 * prepared[cell] * Math.exp(-2 * l);
            }

            @Override
            public double withDerivatives(double[] prepared, int cell, double l, double[] derivatives) {
                double q = prepared[cell] * Math.exp(-2 * l);
                derivatives[0] = -cells.payers[cell] + q;
                derivatives[1] = -2 * q;
                return -cells.payers[cell] * l - 0.5 * q;
            }
        };
    }

    /**
     * A dispersed start around each segment's own estimates ({@link RawEstimates}): a level or a centred
     * effect at its raw estimate plus a uniform jitter of +-2 of the estimate's standard errors (at most
     * +-0.5 for levels, +-0.2 for effects; the pooled value where the segment has none); arm means at the
     * precision-weighted average of the raw effects +-0.05; non-centred effects uniform on (-1, 1); scales
     * at the moment estimates of the between-segment spread (at least 0.02) times a factor between e^-0.5
     * and e^0.5. Chains start apart on the posterior's own scale, and the first warmup trajectories stay
     * short.
     */
    double[] start(UniformRandomProvider rng) {
        double[] x = new double[layout.size()];
        RawEstimates raw = layout.raw;
        fill(x, layout.payer, raw, 0, rng);
        if (cells.spend) {
            fill(x, layout.mean, raw, 1, rng);
            fill(x, layout.spread, raw, 2, rng);
        }
        return x;
    }

    private static void fill(double[] x, HierarchicalCells s, RawEstimates raw, int structure, UniformRandomProvider rng) {
        double[] y = raw.level[structure], v = raw.levelVariance[structure];
        double pooled = weightedMean(y, v);
        double[] levels = new double[s.segments];
        for (int j = 0; j < s.segments; j++) {
            boolean known = Double.isFinite(y[j]) && Double.isFinite(v[j]);
            levels[j] = known ? y[j] + jitter(rng, Math.min(0.5, 2 * Math.sqrt(v[j]))) : pooled + jitter(rng, 0.5);
        }
        double[][] effects = new double[s.segments][s.arms];
        boolean hasEffects = structure < 2;
        for (int k = 0; k < s.arms; k++) {
            if (k == s.control) {
                continue;
            }
            double armMean = 0;
            if (hasEffects) {
                double[] yk = new double[s.segments];
                for (int j = 0; j < s.segments; j++) {
                    yk[j] = raw.effect[structure][j][k];
                }
                armMean = weightedMean(yk, raw.effectVariance[structure]);
                armMean = Double.isFinite(armMean) ? armMean : 0;
            }
            x[s.armMean[k]] = armMean + jitter(rng, 0.05);
            for (int j = 0; j < s.segments; j++) {
                double e = hasEffects ? raw.effect[structure][j][k] : Double.NaN;
                double sd = hasEffects ? Math.sqrt(raw.effectVariance[structure][j]) : Double.NaN;
                effects[j][k] = Double.isFinite(e) && Double.isFinite(sd) ? e + jitter(rng, Math.min(0.2, 2 * sd))
                        : x[s.armMean[k]] + jitter(rng, 0.2);
            }
        }
        double tauLevel = Math.max(0.02, Math.min(1, Math.sqrt(raw.levelSpread(structure)))) * Math.exp(jitter(rng, 0.5));
        double tauEffect = hasEffects
                ? Math.max(0.02, Math.min(1, Math.sqrt(raw.effectSpread(structure)))) * Math.exp(jitter(rng, 0.5)) : 1;
        s.store(x, pooled + jitter(rng, 0.1), tauLevel, tauEffect, levels, effects);
        if (hasEffects) {
            for (int j = 0; j < s.segments; j++) {
                if (s.effectNc[j]) {
                    for (int k = 0; k < s.arms; k++) {
                        if (k != s.control) {
                            x[s.effect[j][k]] = jitter(rng, 1);
                        }
                    }
                }
            }
        }
    }

    /** The precision-weighted mean of the finite estimates (0 when there are none). */
    private static double weightedMean(double[] y, double[] v) {
        double sw = 0, swy = 0;
        for (int i = 0; i < y.length; i++) {
            if (Double.isFinite(y[i]) && Double.isFinite(v[i]) && v[i] > 0) {
                sw += 1 / v[i];
                swy += y[i] / v[i];
            }
        }
        return sw > 0 ? swy / sw : 0;
    }

    /** Uniform on (-half, half). */
    private static double jitter(UniformRandomProvider rng, double half) {
        return half * (2 * rng.nextDouble() - 1);
    }

    private static double logit(double p) {
        return Math.log(p / (1 - p));
    }
}
