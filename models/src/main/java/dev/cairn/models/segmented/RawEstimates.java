package dev.cairn.models.segmented;

/**
 * Each segment's own estimates and their approximate variances, for choosing the parameterisation
 * ({@link SegmentedLayout}): never used in the posterior.
 * <ul>
 *   <li>payer-rate level: the empirical logit of (m + 0.5) / (n + 1) over the segment's arms, variance
 *       1/(m + 0.5) + 1/(n - m + 0.5); arm effect: the difference of the arm's and the control's empirical
 *       logits, variance the sum of theirs;</li>
 *   <li>mean log spend: the payers' mean, variance s^2/m with s^2 the pooled variance of log spend; arm
 *       effect: the difference of means, variance s^2 (1/m_k + 1/m_control);</li>
 *   <li>log spread: log of the segment's sd of log spend, variance 1/(2(m - 1)) (m >= 2).</li>
 * </ul>
 * An effect's variance is the largest over the segment's arms (the least informed difference decides).
 * Missing estimates have infinite variance.
 */
final class RawEstimates {
    /** [structure: payer, mean, spread][segment]. */
    final double[][] level = new double[3][];
    final double[][] levelVariance = new double[3][];
    /** [structure: payer, mean][segment][arm]. */
    final double[][][] effect = new double[2][][];
    final double[][] effectVariance = new double[2][];

    private RawEstimates() {
    }

    static RawEstimates of(SegmentedCells cells) {
        int segs = cells.segmentCount(), arms = cells.armCount(), control = cells.control;
        RawEstimates r = new RawEstimates();
        for (int s = 0; s < 3; s++) {
            r.level[s] = new double[segs];
            r.levelVariance[s] = new double[segs];
        }
        for (int s = 0; s < 2; s++) {
            r.effect[s] = new double[segs][arms];
            r.effectVariance[s] = new double[segs];
        }
        double totalM = 0, totalS1 = 0, totalSquares = 0;
        for (int j = 0; j < segs; j++) {
            for (int k = 0; k < arms; k++) {
                double m = cells.m[j][k];
                if (m > 0) {
                    totalM += m;
                    totalS1 += cells.s1[j][k];
                    totalSquares += Math.max(0, cells.s2[j][k] - cells.s1[j][k] * cells.s1[j][k] / m);
                }
            }
        }
        double pooledVar = totalM > 1 ? Math.max(1e-6, totalSquares / (totalM - 1)) : 1;
        for (int j = 0; j < segs; j++) {
            double n = 0, m = 0, s1 = 0, s2 = 0;
            for (int k = 0; k < arms; k++) {
                n += cells.n[j][k];
                m += cells.m[j][k];
                s1 += cells.s1[j][k];
                s2 += cells.s2[j][k];
            }
            r.level[0][j] = logit(m, n);
            r.levelVariance[0][j] = n > 0 ? 1 / (m + 0.5) + 1 / (n - m + 0.5) : Double.POSITIVE_INFINITY;
            r.level[1][j] = m > 0 ? s1 / m : Double.NaN;
            r.levelVariance[1][j] = m > 0 ? pooledVar / m : Double.POSITIVE_INFINITY;
            double var = m > 1 ? Math.max(1e-12, (s2 - s1 * s1 / m) / (m - 1)) : Double.NaN;
            r.level[2][j] = m > 1 ? 0.5 * Math.log(var) : Double.NaN;
            r.levelVariance[2][j] = m > 1 ? 1 / (2 * (m - 1)) : Double.POSITIVE_INFINITY;
            double nc = cells.n[j][control], mc = cells.m[j][control];
            double worstPayer = 0, worstMean = 0;
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                double nk = cells.n[j][k], mk = cells.m[j][k];
                boolean both = cells.present[j][k] && cells.present[j][control];
                r.effect[0][j][k] = both ? logit(mk, nk) - logit(mc, nc) : Double.NaN;
                worstPayer = Math.max(worstPayer, both
                        ? 1 / (mk + 0.5) + 1 / (nk - mk + 0.5) + 1 / (mc + 0.5) + 1 / (nc - mc + 0.5)
                        : Double.POSITIVE_INFINITY);
                boolean payers = mk > 0 && mc > 0;
                r.effect[1][j][k] = payers ? cells.s1[j][k] / mk - cells.s1[j][control] / mc : Double.NaN;
                worstMean = Math.max(worstMean, payers ? pooledVar * (1 / mk + 1 / mc) : Double.POSITIVE_INFINITY);
            }
            r.effectVariance[0][j] = worstPayer;
            r.effectVariance[1][j] = worstMean;
        }
        return r;
    }

    /** The moment estimate of the between-segment variance of structure s's levels. */
    double levelSpread(int s) {
        return new MomentSpread().add(level[s], levelVariance[s]).variance();
    }

    /** The moment estimate of the between-segment variance of arm effects (structure s), pooled over arms. */
    double effectSpread(int s) {
        int segs = effect[s].length, arms = segs == 0 ? 0 : effect[s][0].length;
        MomentSpread spread = new MomentSpread();
        for (int k = 0; k < arms; k++) {
            double[] y = new double[segs], v = new double[segs];
            for (int j = 0; j < segs; j++) {
                y[j] = effect[s][j][k];
                v[j] = effectVariance[s][j];
            }
            spread.add(y, v);
        }
        return spread.variance();
    }

    private static double logit(double m, double n) {
        return n > 0 ? Math.log((m + 0.5) / (n - m + 0.5)) : Double.NaN;
    }
}
