package dev.cairn.models.segmented;

import dev.cairn.models.KnownVarianceHierarchy;
import dev.cairn.models.LocalSlice;
import dev.cairn.models.NormalMean;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * A collapsed Gibbs update of the arm effects on mean log spend (tauE, E_k, e_jk), the companion of
 * {@link CollapsedSpendLevels}. Given every segment's level beta_j and every cell's sigma_jk, cell jk's payers
 * give e_jk the Gaussian estimate y_jk = S1_jk / m_jk - beta_j with variance sigma_jk^2 / m_jk, so for each
 * arm k the estimates over segments form a normal hierarchy with known variances and mean E_k
 * ({@link KnownVarianceHierarchy}); the arms share tauE. log tauE is slice-sampled from its marginal (every
 * E_k and e_jk integrated out: the sum of the arms' equation-5.21 marginals, half-normal prior and
 * log-Jacobian added), then each E_k and each e_jk are drawn exactly, and the coordinates are written back
 * with the levels held. Where segments' effects barely differ beyond their noise, updating E_k given the
 * e_jk (or the reverse) crawls; this update moves them together. Cost O(cells) per density evaluation.
 */
final class CollapsedSpendEffects implements Step {
    private final SegmentedCells cells;
    private final HierarchicalCells mean;
    private final HierarchicalCells spread;

    CollapsedSpendEffects(SegmentedCells cells, SegmentedLayout layout) {
        this.cells = cells;
        this.mean = layout.mean;
        this.spread = layout.spread;
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Collapse(target.parameters().size(), stream);
    }

    private final class Collapse implements Updater {
        private final LocalSlice slice;
        private final ZigguratSampler.NormalizedGaussian normal;
        private final int segs = cells.segmentCount(), arms = cells.armCount();
        private final double[] mu = new double[segs * arms], logSigma = new double[segs * arms];
        private final double[][] estimate = new double[arms][segs], variance = new double[arms][segs];
        private final KnownVarianceHierarchy[] hierarchies = new KnownVarianceHierarchy[arms];
        private final double[] values = new double[arms];

        Collapse(int size, UniformRandomProvider stream) {
            slice = new LocalSlice(size, 0.5, stream);
            normal = ZigguratSampler.NormalizedGaussian.of(stream);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            slice.begin(adapt);
            double[] x = state.point();
            mean.values(x, mu);
            spread.values(x, logSigma);
            HierarchicalCells.Prior prior = SegmentedLayout.MEAN;
            double armMeanVariance = prior.armMean().sd() * prior.armMean().sd();
            for (int k = 0; k < arms; k++) {
                if (k == cells.control) {
                    continue;
                }
                for (int j = 0; j < segs; j++) {
                    int c = j * arms + k;
                    double m = cells.payers[c];
                    estimate[k][j] = m > 0 ? cells.logSpendSum[c] / m - mu[j * arms + cells.control] : 0;
                    variance[k][j] = m > 0 ? Math.exp(2 * logSigma[c]) / m : Double.POSITIVE_INFINITY;
                }
                hierarchies[k] = KnownVarianceHierarchy.of(estimate[k], variance[k], prior.armMean().mean(),
                        armMeanVariance);
            }
            slice.update(x, mean.logTauEffect, l -> {
                double lp = prior.effect().logDensityOfLog(l), tau = Math.exp(l);
                for (int k = 0; k < arms; k++) {
                    if (k != cells.control) {
                        lp += hierarchies[k].logMarginal(tau);
                    }
                }
                return lp;
            });
            double tau = Math.exp(x[mean.logTauEffect]);
            for (int k = 0; k < arms; k++) {
                if (k == cells.control) {
                    continue;
                }
                NormalMean armMean = hierarchies[k].meanGivenTau(tau);
                x[mean.armMean[k]] = armMean.mean() + normal.sample() * Math.sqrt(armMean.variance());
            }
            for (int j = 0; j < segs; j++) {
                double level = mu[j * arms + cells.control];
                values[cells.control] = level;
                for (int k = 0; k < arms; k++) {
                    if (k != cells.control) {
                        NormalMean e = hierarchies[k].effectGiven(j, x[mean.armMean[k]], tau);
                        values[k] = level + e.mean() + normal.sample() * Math.sqrt(e.variance());
                    }
                }
                mean.storeSegment(x, j, values);
            }
            state.invalidate();
        }
    }
}
