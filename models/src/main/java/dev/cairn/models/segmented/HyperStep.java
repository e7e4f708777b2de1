package dev.cairn.models.segmented;

import dev.cairn.models.prior.HalfNormal;

import dev.cairn.models.LocalSlice;
import dev.cairn.models.NormalMean;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Interweaving moves of one {@link HierarchicalCells} structure's hyperparameters in the centred
 * parameterisation (Yu & Meng 2011, "To center or not to center", J. Comput. Graph. Stat. 20(3)): holding
 * every centred level_j and effect_jk fixed,
 * <ul>
 *   <li>levelMean ~ N exactly (normal prior, levels normal around it: {@link NormalMean});</li>
 *   <li>log tauLevel by slice sampling from p(tau | levels) = half-N(tau) prod N(level_j | levelMean, tau^2)
 *       (with the log-Jacobian);</li>
 *   <li>each armMean_k exactly, then log tauEffect by slice sampling, from the effects in the same way;</li>
 * </ul>
 * then the coordinates are written back (non-centred ones move, centred ones stay). Each move is a Gibbs
 * update of the posterior, so the step leaves it invariant whatever parameterisation the chain stores. The
 * NUTS transitions already move the scales in the non-centred directions; these moves add the centred ones,
 * which mix well exactly where the others do not (scales near zero with weak data). Cost O(cells).
 */
final class HyperStep implements Step {
    private final HierarchicalCells s;
    private final HierarchicalCells.Prior prior;
    private final CellLikelihood likelihood;
    private final double[] effectNoise;

    /**
     * @param structure   the structure whose hyperparameters move
     * @param prior       its hyperpriors
     * @param likelihood  the log likelihood of one cell as a function of its value (for the partially centred
     *                    move of the effect scale; null: no such move)
     * @param effectNoise per segment, the variance of its raw arm-effect estimates (which segments the data
     *                    pin)
     */
    HyperStep(HierarchicalCells structure, HierarchicalCells.Prior prior, CellLikelihood likelihood,
              double[] effectNoise) {
        this.s = structure;
        this.prior = prior;
        this.likelihood = likelihood;
        this.effectNoise = effectNoise;
    }

    /** The log likelihood of cell (j * arms + k) at a value of the structure's cell value, others held. */
    interface CellLikelihood {
        /**
         * @param x     the current point (not modified)
         * @param cell  segment-major cell index
         * @param value the cell's value (payer-rate logit, or mean log spend)
         * @return the cell's log likelihood, constants dropped
         */
        double at(double[] x, int cell, double value);
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Interweave(target.parameters().size(), stream);
    }

    private final class Interweave implements Updater {
        private final LocalSlice slice;
        private final ZigguratSampler.NormalizedGaussian normal;
        private final double[] levels = new double[s.segments];
        private final double[] values = new double[s.segments * s.arms];
        /** Warmup draws of the effect scale, to place the split of the partially centred move. */
        private final java.util.ArrayList<Double> warmupScales = new java.util.ArrayList<>();
        private double split = Double.NaN;
        private boolean frozen;

        Interweave(int size, UniformRandomProvider stream) {
            slice = new LocalSlice(size, 0.5, stream);
            normal = ZigguratSampler.NormalizedGaussian.of(stream);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            slice.begin(adapt);
            double[] x = state.point();
            s.values(x, values);
            int arms = s.arms;
            for (int j = 0; j < s.segments; j++) {
                levels[j] = values[j * arms + s.control];
            }
            // levels: mean exactly, then the scale
            double tau = Math.exp(x[s.logTauLevel]);
            NormalMean mean = NormalMean.prior(prior.mean().mean(), prior.mean().sd() * prior.mean().sd());
            double sum = 0;
            for (double l : levels) {
                sum += l;
            }
            mean.addSum(sum, s.segments, tau * tau);
            x[s.levelMean] = mean.mean() + normal.sample() * Math.sqrt(mean.variance());
            double ss = 0;
            for (double l : levels) {
                ss += (l - x[s.levelMean]) * (l - x[s.levelMean]);
            }
            scale(x, s.logTauLevel, prior.level(), s.segments, ss);
            double newTau = Math.exp(x[s.logTauLevel]);
            for (int j = 0; j < s.segments; j++) {
                if (s.levelNc[j]) {
                    x[s.level[j]] = (levels[j] - x[s.levelMean]) / newTau;
                }
            }
            if (!s.sharedEffects) {
                effects(x);
                if (likelihood != null) {
                    partiallyCentred(x, adapt);
                }
            }
            state.invalidate();
        }

        /**
         * The effect scale given the centred effects of the segments whose data pin them (raw-estimate variance
         * below split^2) and the non-centred effects z of the others: the likelihood of those others' cells
         * moves with tau, the prior of the pinned ones too. Neither extreme parameterisation moves tau when a
         * few segments are large and many are small; this one does. The split is the median effect scale of
         * the second half of warmup, fixed for the kept draws.
         */
        private void partiallyCentred(double[] x, boolean adapt) {
            double tau = Math.exp(x[s.logTauEffect]);
            if (adapt) {
                warmupScales.add(tau);
                split = median(warmupScales.subList(warmupScales.size() / 2, warmupScales.size()));
            } else if (!frozen) {
                frozen = true;
                if (!warmupScales.isEmpty()) {
                    split = median(warmupScales.subList(warmupScales.size() / 2, warmupScales.size()));
                }
            }
            if (Double.isNaN(split)) {
                return;
            }
            int arms = s.arms;
            s.values(x, values);
            double pinnedSquares = 0;
            int pinnedCount = 0;
            int free = 0;
            int[] freeCells = new int[s.segments * arms];
            double[] freeBase = new double[s.segments * arms];
            double[] freeZ = new double[s.segments * arms];
            double[] effect = new double[s.segments * arms];
            for (int j = 0; j < s.segments; j++) {
                boolean pinned = effectNoise[j] < split * split;
                double level = values[j * arms + s.control];
                for (int k = 0; k < arms; k++) {
                    if (k == s.control) {
                        continue;
                    }
                    double e = values[j * arms + k] - level - x[s.armMean[k]];
                    effect[j * arms + k] = e;
                    if (pinned) {
                        pinnedSquares += e * e;
                        pinnedCount++;
                    } else {
                        freeCells[free] = j * arms + k;
                        freeBase[free] = level + x[s.armMean[k]];
                        freeZ[free] = e / tau;
                        free++;
                    }
                }
            }
            double ss = pinnedSquares;
            int n = pinnedCount, f = free;
            slice.update(x, s.logTauEffect, l -> {
                double t = Math.exp(l);
                double lp = prior.effect().logDensityOfLog(l) - n * l - ss / (2 * t * t);
                for (int i = 0; i < f; i++) {
                    lp += likelihood.at(x, freeCells[i], freeBase[i] + t * freeZ[i]);
                }
                return lp;
            });
            double newTau = Math.exp(x[s.logTauEffect]);
            // write back: pinned effects keep their centred value, free ones their z
            for (int j = 0; j < s.segments; j++) {
                boolean pinned = effectNoise[j] < split * split;
                double level = values[j * arms + s.control];
                for (int k = 0; k < arms; k++) {
                    if (k != s.control) {
                        double e = effect[j * arms + k];
                        double newEffect = pinned ? e : e / tau * newTau;
                        x[s.effect[j][k]] = s.effectNc[j] ? newEffect / newTau : level + x[s.armMean[k]] + newEffect;
                    }
                }
            }
        }

        private void effects(double[] x) {
            int arms = s.arms;
            double tauE = Math.exp(x[s.logTauEffect]);
            double ss = 0;
            int count = 0;
            for (int k = 0; k < arms; k++) {
                if (k == s.control) {
                    continue;
                }
                double sum = 0;
                for (int j = 0; j < s.segments; j++) {
                    sum += values[j * arms + k] - values[j * arms + s.control];
                }
                NormalMean m = NormalMean.prior(0, prior.armMean().sd() * prior.armMean().sd()).addSum(sum, s.segments, tauE * tauE);
                x[s.armMean[k]] = m.mean() + normal.sample() * Math.sqrt(m.variance());
                for (int j = 0; j < s.segments; j++) {
                    double e = values[j * arms + k] - values[j * arms + s.control] - x[s.armMean[k]];
                    ss += e * e;
                    count++;
                }
            }
            scale(x, s.logTauEffect, prior.effect(), count, ss);
            double newTau = Math.exp(x[s.logTauEffect]);
            for (int j = 0; j < s.segments; j++) {
                if (!s.effectNc[j]) {
                    continue;
                }
                for (int k = 0; k < arms; k++) {
                    if (k != s.control) {
                        double e = values[j * arms + k] - values[j * arms + s.control];
                        x[s.effect[j][k]] = (e - x[s.armMean[k]]) / newTau;
                    }
                }
            }
        }

        private double median(java.util.List<Double> v) {
            double[] a = v.stream().mapToDouble(Double::doubleValue).sorted().toArray();
            return a.length == 0 ? Double.NaN : a[a.length / 2];
        }

        /** Slice update of log tau given n centred values with squared deviations ss around their mean. */
        private void scale(double[] x, int at, HalfNormal scalePrior, int n, double ss) {
            slice.update(x, at, l -> scalePrior.logDensityOfLog(l) - n * l
                    - ss / (2 * Math.exp(2 * l)));
        }
    }
}
