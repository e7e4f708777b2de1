package dev.cairn.models.segmented;

import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Moves of one structure's level scale tauLevel in partially non-centred coordinates, the levels'
 * counterpart of {@link EffectScaleMove} (Papaspiliopoulos, Roberts & Skold 2007, Statistical Science 22(1),
 * section 4). Holding every cell's offset from its level (the effects) and the level mean, segment j's level
 * is written as
 * <pre>
 *   level_j = m_j(tau) + s_j(tau) zeta_j,   s_j^2 = 1 / (1/tau^2 + w_j),   m_j = s_j^2 (levelMean / tau^2 + w_j y_j)
 * </pre>
 * with w_j = sum_k w_jk and y_j = sum_k w_jk (y_jk - offset_jk) / w_j from the cells' estimates y_jk and
 * precisions w_jk taken from the data alone (none given: w = 0, the plain non-centred form). Holding zeta,
 * log tau takes {@link ScaleWalk} steps on
 * <pre>
 *   log prior(log tau) + sum_j [ log N(level_j | levelMean, tau^2) + log s_j + sum_k log lik_jk(level_j + offset_jk) ]
 * </pre>
 * A segment the data pin keeps its level, one without data keeps its standardised level. Where many
 * segments have a few payers each, the centred move of tau given the levels crawls (the levels pin tau);
 * this one moves it. The map only chooses coordinates; the exact likelihood decides. Cost O(cells) per
 * proposal.
 */
final class LevelScaleMove implements Step {
    private static final int PROPOSALS = 2;
    private final HierarchicalCells s;
    private final HierarchicalCells.Prior prior;
    private final HyperStep.CellLikelihood likelihood;
    private final double[] estimate;
    private final double[] precision;

    /**
     * @param structure  the structure
     * @param prior      its hyperpriors
     * @param likelihood the cells' log likelihood
     * @param estimate   per cell (segment-major), the data's own estimate of the cell value, or null (kept)
     * @param precision  per cell, the precision of that estimate, >= 0, or null for none (kept)
     */
    LevelScaleMove(HierarchicalCells structure, HierarchicalCells.Prior prior, HyperStep.CellLikelihood likelihood,
                   double[] estimate, double[] precision) {
        this.s = structure;
        this.prior = prior;
        this.likelihood = likelihood;
        this.estimate = estimate;
        this.precision = precision;
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Walk(stream);
    }

    private final class Walk implements Updater {
        private final ScaleWalk walk;
        private final int arms = s.arms, cellCount = s.segments * s.arms;
        private final double[] values = new double[cellCount], prepared = new double[cellCount];
        private final double[] zeta = new double[s.segments], weight = new double[s.segments];
        private final double[] pseudo = new double[s.segments], segment = new double[s.arms];

        Walk(UniformRandomProvider stream) {
            this.walk = new ScaleWalk(stream);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            s.values(x, values);
            likelihood.prepare(x, prepared);
            double l = x[s.logTauLevel], tau = Math.exp(l), mean = x[s.levelMean];
            for (int j = 0; j < s.segments; j++) {
                double level = values[j * arms + s.control], w = 0, wy = 0;
                for (int k = 0; k < arms && precision != null; k++) {
                    int c = j * arms + k;
                    w += precision[c];
                    wy += precision[c] * (estimate[c] - (values[c] - level));
                }
                weight[j] = w;
                pseudo[j] = w > 0 ? wy / w : 0;
                double v = 1 / (1 / (tau * tau) + w);
                zeta[j] = (level - v * (mean / (tau * tau) + w * pseudo[j])) / Math.sqrt(v);
            }
            l = walk.move(v -> density(v, mean), l, PROPOSALS, adapt);
            x[s.logTauLevel] = l;
            tau = Math.exp(l);
            for (int j = 0; j < s.segments; j++) {
                double old = values[j * arms + s.control], level = level(j, tau, mean);
                for (int k = 0; k < arms; k++) {
                    segment[k] = values[j * arms + k] - old + level;
                }
                s.storeSegment(x, j, segment);
            }
            state.invalidate();
        }

        private double level(int j, double tau, double mean) {
            double v = 1 / (1 / (tau * tau) + weight[j]);
            return v * (mean / (tau * tau) + weight[j] * pseudo[j]) + Math.sqrt(v) * zeta[j];
        }

        /** The log density of log tau with zeta held (constants dropped). */
        private double density(double l, double mean) {
            double tau = Math.exp(l), lp = prior.level().logDensityOfLog(l);
            for (int j = 0; j < s.segments; j++) {
                double v = 1 / (1 / (tau * tau) + weight[j]);
                double level = v * (mean / (tau * tau) + weight[j] * pseudo[j]) + Math.sqrt(v) * zeta[j];
                double r = (level - mean) / tau, old = values[j * arms + s.control];
                lp += -0.5 * r * r - l + 0.5 * Math.log(v);
                for (int k = 0; k < arms; k++) {
                    int c = j * arms + k;
                    lp += likelihood.at(prepared, c, values[c] - old + level);
                }
            }
            return lp;
        }
    }
}
