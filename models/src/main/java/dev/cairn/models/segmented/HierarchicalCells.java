package dev.cairn.models.segmented;

import dev.cairn.models.prior.HalfNormal;
import dev.cairn.models.prior.Normal;

/**
 * One two-level structure of cell values over segments j and arms k, as the segmented-spend model uses it
 * three times (payer-rate logits, mean log spend, log spread):
 * <pre>
 *   value_jk = level_j + effect_jk                          (effect_j,control = 0)
 *   level_j  ~ N(levelMean, tauLevel^2)                     levelMean ~ N(meanPrior, meanPriorSd^2)
 *   effect_jk ~ N(armMean_k, tauEffect^2)   (per cell)      armMean_k ~ N(0, armMeanSd^2)
 *   tauLevel ~ half-N(0, levelScale^2)                      tauEffect ~ half-N(0, effectScale^2)
 * </pre>
 * or, with <em>shared</em> effects, effect_jk = armMean_k in every segment (no tauEffect; the arm shift of
 * the log spread).
 *
 * <p>Coordinates, chosen per segment (Papaspiliopoulos, Roberts & Skold 2007, Statistical Science 22(1)):
 * a <b>centred</b> level is stored as level_j, a <b>non-centred</b> one as a_j with level_j = levelMean +
 * tauLevel a_j, a_j ~ N(0, 1). Centred effects are stored as the cell values value_jk themselves (k not the
 * control; effect_jk = value_jk - level_j, a change of variables with unit Jacobian), so that a segment with
 * strong data sees a nearly diagonal likelihood; non-centred effects as z_jk with effect_jk = armMean_k +
 * tauEffect z_jk. Strong data favour the centred form, weak data the non-centred one; the choice only
 * changes the sampler's geometry, never the posterior. Scales are stored as log tau with the log-Jacobian
 * added. Every density here drops the constant -log(2 pi)/2 per normal term.
 */
final class HierarchicalCells {
    final int segments;
    final int arms;
    final int control;
    final boolean sharedEffects;
    /** Coordinate positions: hyperparameters, per-segment level, per-cell effect (-1 for the control). */
    final int levelMean, logTauLevel, logTauEffect;
    final int[] armMean;
    final int[] level;
    final int[][] effect;
    final boolean[] levelNc, effectNc;
    private final Normal meanPrior, armMeanPrior;
    private final HalfNormal levelPrior, effectPrior;

    HierarchicalCells(Prior prior, int segments, int arms, int control, boolean sharedEffects, int levelMean,
                      int logTauLevel, int logTauEffect, int[] armMean, int[] level, int[][] effect, boolean[] levelNc,
                      boolean[] effectNc) {
        this.segments = segments;
        this.arms = arms;
        this.control = control;
        this.sharedEffects = sharedEffects;
        this.levelMean = levelMean;
        this.logTauLevel = logTauLevel;
        this.logTauEffect = logTauEffect;
        this.armMean = armMean;
        this.level = level;
        this.effect = effect;
        this.levelNc = levelNc;
        this.effectNc = effectNc;
        this.meanPrior = prior.mean();
        this.armMeanPrior = prior.armMean();
        this.levelPrior = prior.level();
        this.effectPrior = prior.effect();
    }

    /**
     * Hyperpriors of one structure.
     *
     * @param mean    prior of levelMean
     * @param armMean prior of each armMean_k (centred on 0)
     * @param level   prior of tauLevel
     * @param effect  prior of tauEffect; null with shared effects
     */
    record Prior(Normal mean, Normal armMean, HalfNormal level, HalfNormal effect) {
    }

    /** The centred level of segment j at point x. */
    double level(double[] x, int j) {
        double v = x[level[j]];
        return levelNc[j] ? x[levelMean] + Math.exp(x[logTauLevel]) * v : v;
    }

    /**
     * Writes every cell value value_jk at point x into {@code out[j * arms + k]} (modified).
     *
     * @param x   the unconstrained point (not modified)
     * @param out per segment and arm, segment-major (modified)
     */
    void values(double[] x, double[] out) {
        double tauEffect = sharedEffects ? 0 : Math.exp(x[logTauEffect]);
        double mean = x[levelMean], tauLevel = Math.exp(x[logTauLevel]);
        for (int j = 0; j < segments; j++) {
            double l = levelNc[j] ? mean + tauLevel * x[level[j]] : x[level[j]];
            int row = j * arms;
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    out[row + k] = l;
                } else if (sharedEffects) {
                    out[row + k] = l + x[armMean[k]];
                } else if (effectNc[j]) {
                    out[row + k] = l + x[armMean[k]] + tauEffect * x[effect[j][k]];
                } else {
                    out[row + k] = x[effect[j][k]];
                }
            }
        }
    }

    /**
     * The log prior of this structure's coordinates, and the chain rule: given d(log likelihood)/d(value_jk)
     * in {@code adjoint}, adds d(log likelihood + log prior)/d(coordinate) for every coordinate it owns to
     * {@code gradient} (modified).
     *
     * @param x        the unconstrained point (not modified)
     * @param values   the cell values at x, from {@link #values}, segment-major (not modified)
     * @param adjoint  the likelihood's derivative with respect to each cell value, segment-major (not modified)
     * @param gradient accumulates the gradient (modified)
     * @return the log prior density of the structure (constants dropped), log-Jacobians of the scales included
     */
    double backward(double[] x, double[] values, double[] adjoint, double[] gradient) {
        double mean = x[levelMean], logTauL = x[logTauLevel], tauL = Math.exp(logTauL);
        double lp = meanPrior.logDensity(mean) + levelPrior.logDensityOfLog(logTauL);
        gradient[levelMean] += meanPrior.derivative(mean);
        gradient[logTauLevel] += levelPrior.derivativeOfLog(logTauL);
        double logTauE = sharedEffects ? 0 : x[logTauEffect], tauE = Math.exp(logTauE);
        if (!sharedEffects) {
            lp += effectPrior.logDensityOfLog(logTauE);
            gradient[logTauEffect] += effectPrior.derivativeOfLog(logTauE);
        }
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                double m = x[armMean[k]];
                lp += armMeanPrior.logDensity(m);
                gradient[armMean[k]] += armMeanPrior.derivative(m);
            }
        }
        for (int j = 0; j < segments; j++) {
            int row = j * arms;
            double lj = values[row + control];
            // total derivative with respect to the centred level, holding the effect coordinates fixed
            double gLevel = adjoint[row + control];
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                int am = armMean[k];
                double adj = adjoint[row + k];
                if (sharedEffects) {
                    gLevel += adj;
                    gradient[am] += adj;
                } else if (effectNc[j]) {
                    int c = effect[j][k];
                    double z = x[c];
                    lp -= 0.5 * z * z;
                    gLevel += adj;
                    gradient[c] += adj * tauE - z;
                    gradient[am] += adj;
                    gradient[logTauEffect] += adj * tauE * z;
                } else {
                    int c = effect[j][k];
                    double r = (values[row + k] - lj - x[am]) / tauE;
                    lp -= 0.5 * r * r + logTauE;
                    gradient[c] += adj - r / tauE;
                    gLevel += r / tauE;
                    gradient[am] += r / tauE;
                    gradient[logTauEffect] += r * r - 1;
                }
            }
            int c = level[j];
            if (levelNc[j]) {
                double a = x[c];
                lp -= 0.5 * a * a;
                gradient[c] += gLevel * tauL - a;
                gradient[levelMean] += gLevel;
                gradient[logTauLevel] += gLevel * tauL * a;
            } else {
                double r = (lj - mean) / tauL;
                lp -= 0.5 * r * r + logTauL;
                gradient[c] += gLevel - r / tauL;
                gradient[levelMean] += r / tauL;
                gradient[logTauLevel] += r * r - 1;
            }
        }
        return lp;
    }

    /**
     * Segment j's cell values at point x: value_jk for every arm k.
     *
     * @param x   the unconstrained point (not modified)
     * @param j   the segment
     * @param out per arm (modified)
     */
    void segmentValues(double[] x, int j, double[] out) {
        double l = level(x, j);
        double tauEffect = sharedEffects ? 0 : Math.exp(x[logTauEffect]);
        for (int k = 0; k < arms; k++) {
            if (k == control) {
                out[k] = l;
            } else if (sharedEffects) {
                out[k] = l + x[armMean[k]];
            } else if (effectNc[j]) {
                out[k] = l + x[armMean[k]] + tauEffect * x[effect[j][k]];
            } else {
                out[k] = x[effect[j][k]];
            }
        }
    }

    /**
     * Stores new cell values of segment j in its coordinates, the hyperparameters at x held (for shared
     * effects only the level is read from {@code values}).
     *
     * @param x      the unconstrained point (segment j's coordinates modified)
     * @param j      the segment
     * @param values per arm, the new value_jk (not modified)
     */
    void storeSegment(double[] x, int j, double[] values) {
        double l = values[control];
        x[level[j]] = levelNc[j] ? (l - x[levelMean]) / Math.exp(x[logTauLevel]) : l;
        if (sharedEffects) {
            return;
        }
        double tauEffect = Math.exp(x[logTauEffect]);
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                x[effect[j][k]] = effectNc[j] ? (values[k] - l - x[armMean[k]]) / tauEffect : values[k];
            }
        }
    }

    /**
     * The prior of one segment's centred coordinates u = (level at the control position, effect_k elsewhere)
     * given the hyperparameters at x: independent normals, the same for every segment.
     *
     * @param x         the unconstrained point (not modified)
     * @param precision per position, 1/tauLevel^2 or 1/tauEffect^2 (modified)
     * @param mean      per position, levelMean or armMean_k (modified)
     */
    void segmentPrior(double[] x, double[] precision, double[] mean) {
        double tauLevel = Math.exp(x[logTauLevel]);
        double tauEffect = sharedEffects ? 0 : Math.exp(x[logTauEffect]);
        for (int k = 0; k < arms; k++) {
            if (k == control) {
                precision[k] = 1 / (tauLevel * tauLevel);
                mean[k] = x[levelMean];
            } else {
                precision[k] = sharedEffects ? Double.POSITIVE_INFINITY : 1 / (tauEffect * tauEffect);
                mean[k] = x[armMean[k]];
            }
        }
    }

    /** Unconstrained coordinates from centred values (for starting points): levels, effects and log taus. */
    void store(double[] x, double mean, double tauLevel, double tauEffect, double[] levels, double[][] effects) {
        x[levelMean] = mean;
        x[logTauLevel] = Math.log(tauLevel);
        if (!sharedEffects) {
            x[logTauEffect] = Math.log(tauEffect);
        }
        for (int j = 0; j < segments; j++) {
            x[level[j]] = levelNc[j] ? (levels[j] - mean) / tauLevel : levels[j];
            if (sharedEffects) {
                continue;
            }
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    x[effect[j][k]] = effectNc[j] ? (effects[j][k] - x[armMean[k]]) / tauEffect : levels[j] + effects[j][k];
                }
            }
        }
    }
}
