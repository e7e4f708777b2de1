package dev.cairn.models.segmented;

import dev.cairn.models.LocalSlice;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Gibbs updates of the spend coordinates, one segment at a time (segments are independent given the
 * hyperparameters):
 * <ul>
 *   <li><b>mean log spend</b>, exactly: given the cells' sigma_jk, the lognormal likelihood of cell jk is
 *       N(S1_jk / m_jk | mu_jk, sigma_jk^2 / m_jk) in mu_jk, so segment j's centred coordinates
 *       u = (beta_j, e_jk) have the Gaussian conditional with precision H = diag(lambda) + B' diag(w) B,
 *       w_k = m_jk / sigma_jk^2, and mean H^-1 (lambda u0 + B' r), r_k = S1_jk / sigma_jk^2
 *       (Gelman et al., Bayesian Data Analysis, 3rd ed., section 3.5 for the normal likelihood; H is an arrow
 *       matrix, {@link SegmentGaussian});</li>
 *   <li><b>log spread</b> logSigma_j by slice sampling (Neal 2003, Annals of Statistics 31(3)) from
 *       <pre>  -(l - s0)^2 / (2 tauS^2) - M_j l - Q_j e^(-2 l) / 2,
 *  M_j = sum_k m_jk,  Q_j = sum_k SS_jk e^(-2 G_k),  SS_jk = S2_jk - 2 mu_jk S1_jk + m_jk mu_jk^2</pre>
 *       and each arm's shift G_k the same way from the sums over segments; each evaluation is O(1)
 *       (the direction these two leave slow, the arms' shifts against the control's spread, is moved by the
 *       hyperparameter step's joint move of s0 and the G_k).</li>
 * </ul>
 * Cost O(cells) per sweep.
 */
final class SpendSegments implements Step {
    private final SegmentedCells cells;
    private final HierarchicalCells mean;
    private final HierarchicalCells spread;

    SpendSegments(SegmentedCells cells, SegmentedLayout layout) {
        this.cells = cells;
        this.mean = layout.mean;
        this.spread = layout.spread;
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Blocks(target.parameters().size(), stream);
    }

    private final class Blocks implements Updater {
        private final ZigguratSampler.NormalizedGaussian normal;
        private final LocalSlice slice;
        private final int arms = cells.armCount(), control = cells.control, segs = cells.segmentCount();
        private final SegmentGaussian gauss = new SegmentGaussian(arms, control);
        private final double[] lambda = new double[arms], prior = new double[arms];
        private final double[] w = new double[arms], b = new double[arms], draw = new double[arms];
        private final double[] logSigma = new double[arms], mu = new double[arms];
        /** Per cell, the squared deviations SS_jk of log spend around the cell's mean. */
        private final double[] squares;
        private final double[] armPrecision, levelPrecisions;

        Blocks(int size, UniformRandomProvider stream) {
            this.normal = ZigguratSampler.NormalizedGaussian.of(stream);
            this.slice = new LocalSlice(size, 0.5, stream);
            this.squares = new double[segs * arms];
            this.armPrecision = new double[arms];
            this.levelPrecisions = new double[segs];
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            slice.begin(adapt);
            double[] x = state.point();
            mean.segmentPrior(x, lambda, prior);
            for (int j = 0; j < segs; j++) {
                means(x, j);
            }
            spreads(x);
            state.invalidate();
        }

        private void means(double[] x, int j) {
            spread.segmentValues(x, j, logSigma);
            double total = 0;
            for (int k = 0; k < arms; k++) {
                double precision = Math.exp(-2 * logSigma[k]);
                w[k] = cells.m[j][k] * precision;
                double r = cells.s1[j][k] * precision;
                b[k] = lambda[k] * prior[k] + r;
                total += r;
            }
            b[control] += total - cells.s1[j][control] * Math.exp(-2 * logSigma[control]);
            gauss.set(lambda, w);
            gauss.solve(b, b);
            for (int k = 0; k < arms; k++) {
                draw[k] = normal.sample();
            }
            gauss.whiten(draw, draw);
            for (int k = 0; k < arms; k++) {
                draw[k] += b[k];
            }
            // centred coordinates to cell values
            for (int k = 0; k < arms; k++) {
                mu[k] = k == control ? draw[control] : draw[control] + draw[k];
            }
            mean.storeSegment(x, j, mu);
            for (int k = 0; k < arms; k++) {
                double m = cells.m[j][k], v = mu[k];
                squares[j * arms + k] = m == 0 ? 0 : Math.max(0, cells.s2[j][k] - 2 * v * cells.s1[j][k] + m * v * v);
            }
        }

        private void spreads(double[] x) {
            double s0 = x[spread.levelMean], tau = Math.exp(x[spread.logTauLevel]);
            double levelPrecision = 1 / (tau * tau);
            for (int k = 0; k < arms; k++) {
                armPrecision[k] = k == control ? 1 : Math.exp(-2 * x[spread.armMean[k]]);
            }
            for (int j = 0; j < segs; j++) {
                double payers = 0, q = 0;
                for (int k = 0; k < arms; k++) {
                    payers += cells.m[j][k];
                    q += squares[j * arms + k] * armPrecision[k];
                }
                double mj = payers, qj = q;
                double width = 2.5 / Math.sqrt(2 * mj + levelPrecision);
                double l = slice.move(v -> -0.5 * levelPrecision * (v - s0) * (v - s0) - mj * v - 0.5 * qj * Math.exp(-2 * v),
                        spread.level(x, j), width);
                logSigma[control] = l;
                spread.storeSegment(x, j, logSigma);
            }
            for (int j = 0; j < segs; j++) {
                levelPrecisions[j] = Math.exp(-2 * spread.level(x, j));
            }
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                double payers = 0, q = 0;
                for (int j = 0; j < segs; j++) {
                    payers += cells.m[j][k];
                    q += squares[j * arms + k] * levelPrecisions[j];
                }
                double mk = payers, qk = q;
                slice.update(x, spread.armMean[k], g -> SegmentedLayout.SPREAD.armMean().logDensity(g) - mk * g
                        - 0.5 * qk * Math.exp(-2 * g));
            }
        }
    }
}
