package dev.cairn.models.segmented;

import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Moves of one structure's arm-effect scale tauEffect in partially non-centred coordinates (Papaspiliopoulos,
 * Roberts & Skold 2007, Statistical Science 22(1), section 4, "partially non-centred parameterisations").
 * Each cell's effect d_jk (value_jk = level_j + d_jk) is written as
 * <pre>
 *   d_jk = m_jk(tau) + s_jk(tau) zeta_jk,    s_jk^2 = 1 / (1/tau^2 + w_jk),
 *   m_jk = s_jk^2 (armMean_k / tau^2 + w_jk (y_jk - level_j))
 * </pre>
 * the conditional mean and sd of d_jk if cell jk's likelihood were the Gaussian N(y_jk | value_jk, 1/w_jk),
 * with y_jk and w_jk fixed from the data alone (for payer rates the empirical logit log((m + 1/2) / (n - m + 1/2))
 * and precision (m + 1/2)(n - m + 1/2) / (n + 1); w = 0 for a cell without users). Holding zeta (and the levels
 * and arm means), log tau takes random-walk Metropolis steps on
 * <pre>
 *   log p = log prior(log tau) + sum_jk [ log N(d_jk | armMean_k, tau^2) + log lik_jk(level_j + d_jk) + log s_jk ]
 * </pre>
 * (the last term the Jacobian of zeta -> d). A cell the data pin (w large) keeps its effect, one without
 * data keeps its standardised effect (d - armMean) / tau, and every cell in between moves as far as its
 * data allow: neither the centred nor the non-centred form alone moves tau when, as is common, the true
 * effects hardly differ between segments and the segments' sizes differ a thousandfold. The Gaussian is
 * only a map between coordinates; the exact likelihood is used, so any y and w give a valid move. The
 * steps are {@link ScaleWalk}'s (step size adapted in warmup). Cost O(cells) per proposal.
 */
final class EffectScaleMove implements Step {
    private static final int PROPOSALS = 2;
    private final HierarchicalCells s;
    private final HierarchicalCells.Prior prior;
    private final HyperStep.CellLikelihood likelihood;
    private final double[] estimate;
    private final double[] precision;

    /**
     * @param structure  the structure (with per-cell effects)
     * @param prior      its hyperpriors
     * @param likelihood the cells' log likelihood
     * @param estimate   per cell (segment-major), the data's own estimate of the cell value (not modified, kept)
     * @param precision  per cell, the precision of that estimate, >= 0 (not modified, kept)
     */
    EffectScaleMove(HierarchicalCells structure, HierarchicalCells.Prior prior, HyperStep.CellLikelihood likelihood,
                    double[] estimate, double[] precision) {
        this.s = structure;
        this.prior = prior;
        this.likelihood = likelihood;
        this.estimate = estimate;
        this.precision = precision;
    }

    /** Empirical logits and their precisions of every cell's payer rate, from the data alone. */
    static double[][] payerEstimates(SegmentedCells cells) {
        int count = cells.users.length;
        double[] y = new double[count], w = new double[count];
        for (int c = 0; c < count; c++) {
            double n = cells.users[c], m = cells.payers[c];
            y[c] = Math.log((m + 0.5) / (n - m + 0.5));
            w[c] = n > 0 ? (m + 0.5) * (n - m + 0.5) / (n + 1) : 0;
        }
        return new double[][] {y, w};
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Walk(stream);
    }

    private final class Walk implements Updater {
        private final ScaleWalk walk;
        private final int arms = s.arms, cellCount = s.segments * s.arms;
        private final double[] values = new double[cellCount], zeta = new double[cellCount];
        private final double[] prepared = new double[cellCount];
        private final double[] segment = new double[arms];

        Walk(UniformRandomProvider stream) {
            this.walk = new ScaleWalk(stream);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            s.values(x, values);
            likelihood.prepare(x, prepared);
            double l = x[s.logTauEffect], tau = Math.exp(l);
            for (int j = 0; j < s.segments; j++) {
                double level = values[j * arms + s.control];
                for (int k = 0; k < arms; k++) {
                    if (k == s.control) {
                        continue;
                    }
                    int c = j * arms + k;
                    double v = variance(c, tau);
                    zeta[c] = (values[c] - level - centre(x, c, k, level, tau, v)) / Math.sqrt(v);
                }
            }
            l = walk.move(v -> density(x, v), l, PROPOSALS, adapt);
            x[s.logTauEffect] = l;
            tau = Math.exp(l);
            for (int j = 0; j < s.segments; j++) {
                double level = values[j * arms + s.control];
                segment[s.control] = level;
                for (int k = 0; k < arms; k++) {
                    if (k != s.control) {
                        segment[k] = level + effect(x, j * arms + k, k, level, tau);
                    }
                }
                s.storeSegment(x, j, segment);
            }
            state.invalidate();
        }

        /** s_jk^2 at scale tau. */
        private double variance(int c, double tau) {
            return 1 / (1 / (tau * tau) + precision[c]);
        }

        /** m_jk at scale tau, given v = s_jk^2 at that scale. */
        private double centre(double[] x, int c, int k, double level, double tau, double v) {
            return v * (x[s.armMean[k]] / (tau * tau) + precision[c] * (estimate[c] - level));
        }

        /** d_jk at scale tau from the held zeta. */
        private double effect(double[] x, int c, int k, double level, double tau) {
            double v = variance(c, tau);
            return centre(x, c, k, level, tau, v) + Math.sqrt(v) * zeta[c];
        }

        /** The log density of log tau with zeta held (constants dropped). */
        private double density(double[] x, double l) {
            double tau = Math.exp(l), lp = prior.effect().logDensityOfLog(l);
            for (int j = 0; j < s.segments; j++) {
                double level = values[j * arms + s.control];
                for (int k = 0; k < arms; k++) {
                    if (k == s.control) {
                        continue;
                    }
                    int c = j * arms + k;
                    double v = variance(c, tau);
                    double d = centre(x, c, k, level, tau, v) + Math.sqrt(v) * zeta[c];
                    double r = (d - x[s.armMean[k]]) / tau;
                    lp += -0.5 * r * r - l + 0.5 * Math.log(v) + likelihood.at(prepared, c, level + d);
                }
            }
            return lp;
        }
    }
}
