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
 * A collapsed Gibbs update of the spend levels (tauBeta, beta0, beta_j). Given every cell's sigma_jk and arm
 * effect e_jk, segment j's payers give beta_j a Gaussian estimate: the cells' lognormal likelihood in
 * mu_jk = beta_j + e_jk is proportional to N(bhat_j | beta_j, 1/P_j) with
 * <pre>
 *   P_j = sum_k m_jk / sigma_jk^2,   bhat_j = sum_k (S1_jk - m_jk e_jk) / sigma_jk^2 / P_j
 * </pre>
 * so (bhat_j) is a normal hierarchy with known variances ({@link KnownVarianceHierarchy}): log tauBeta is
 * slice-sampled from its marginal (beta0 and every beta_j integrated out, half-normal prior and log-Jacobian
 * added), then beta0 and each beta_j are drawn exactly, and the coordinates are written back with the arm
 * effects held. It moves the spend scale without waiting for the levels to follow, which matters when
 * segments have a handful of payers each.
 */
final class CollapsedSpendLevels implements Step {
    private final SegmentedCells cells;
    private final HierarchicalCells mean;
    private final HierarchicalCells spread;

    CollapsedSpendLevels(SegmentedCells cells, SegmentedLayout layout) {
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
        private final double[] estimate = new double[segs], variance = new double[segs];

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
            for (int j = 0; j < segs; j++) {
                double level = mu[j * arms + cells.control];
                double precision = 0, weighted = 0;
                for (int k = 0; k < arms; k++) {
                    int c = j * arms + k;
                    double m = cells.payers[c];
                    if (m == 0) {
                        continue;
                    }
                    double w = Math.exp(-2 * logSigma[c]);
                    precision += m * w;
                    weighted += (cells.logSpendSum[c] - m * (mu[c] - level)) * w;
                }
                variance[j] = precision > 0 ? 1 / precision : Double.POSITIVE_INFINITY;
                estimate[j] = precision > 0 ? weighted / precision : 0;
            }
            HierarchicalCells.Prior prior = SegmentedLayout.MEAN;
            KnownVarianceHierarchy h = KnownVarianceHierarchy.of(estimate, variance, prior.mean().mean(),
                    prior.mean().sd() * prior.mean().sd());
            slice.update(x, mean.logTauLevel, l -> prior.level().logDensityOfLog(l)
                    + h.logMarginal(Math.exp(l)));
            double tau = Math.exp(x[mean.logTauLevel]);
            NormalMean m = h.meanGivenTau(tau);
            double beta0 = m.mean() + normal.sample() * Math.sqrt(m.variance());
            x[mean.levelMean] = beta0;
            for (int j = 0; j < segs; j++) {
                NormalMean b = h.effectGiven(j, beta0, tau);
                double level = b.mean() + normal.sample() * Math.sqrt(b.variance());
                double old = mu[j * arms + cells.control];
                x[mean.level[j]] = mean.levelNc[j] ? (level - beta0) / tau : level;
                if (!mean.effectNc[j]) {
                    // centred effects are stored as cell values level + effect: keep the effects, move the level
                    for (int k = 0; k < arms; k++) {
                        if (k != cells.control) {
                            x[mean.effect[j][k]] += level - old;
                        }
                    }
                }
            }
            state.invalidate();
        }
    }
}
