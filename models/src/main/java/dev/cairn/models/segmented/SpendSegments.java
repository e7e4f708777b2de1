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
 *       and each arm's shift G_k the same way from the sums over segments; each evaluation is O(1);</li>
 *   <li>then a move along the direction those two leave slow (the arms' shifts against the control's
 *       spread, {@code tilt}).</li>
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
        private final double[] direction, base, slopeCurvature = new double[2];

        Blocks(int size, UniformRandomProvider stream) {
            this.normal = ZigguratSampler.NormalizedGaussian.of(stream);
            this.slice = new LocalSlice(size, 0.5, stream);
            this.squares = new double[segs * arms];
            this.direction = new double[segs];
            this.base = new double[segs];
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
            for (int j = 0; j < segs; j++) {
                double payers = 0, q = 0;
                for (int k = 0; k < arms; k++) {
                    payers += cells.m[j][k];
                    q += squares[j * arms + k] * Math.exp(-2 * (k == control ? 0 : x[spread.armMean[k]]));
                }
                double mj = payers, qj = q;
                double width = 2.5 / Math.sqrt(2 * mj + levelPrecision);
                double l = slice.move(v -> -0.5 * levelPrecision * (v - s0) * (v - s0) - mj * v - 0.5 * qj * Math.exp(-2 * v),
                        spread.level(x, j), width);
                logSigma[control] = l;
                spread.storeSegment(x, j, logSigma);
            }
            for (int k = 0; k < arms; k++) {
                if (k == control) {
                    continue;
                }
                double payers = 0, q = 0;
                for (int j = 0; j < segs; j++) {
                    payers += cells.m[j][k];
                    q += squares[j * arms + k] * Math.exp(-2 * spread.level(x, j));
                }
                double mk = payers, qk = q;
                slice.update(x, spread.armMean[k], g -> SegmentedLayout.SPREAD.armMean().logDensity(g) - mk * g
                        - 0.5 * qk * Math.exp(-2 * g));
            }
            if (arms > 1) {
                tilt(x);
            }
        }

        /**
         * A move along the direction the two updates above leave slow: every arm shift G_k up by delta and every
         * segment's log spread down by (1 - c_j) delta, c_j the control's share of the segment's payers, so a
         * segment's payer-weighted log spread stays put while the arms move against the control together.
         * Proposed by {@link NewtonProposal} (the conditional is log-concave along any line).
         */
        private void tilt(double[] x) {
            for (int j = 0; j < segs; j++) {
                double payers = 0;
                for (int k = 0; k < arms; k++) {
                    payers += cells.m[j][k];
                }
                direction[j] = -(1 - (payers > 0 ? cells.m[j][control] / payers : 1.0 / arms));
                base[j] = spread.level(x, j);
            }
            double f0 = along(x, 0);
            double g0 = slopeCurvature[0], h0 = slopeCurvature[1];
            if (!(h0 > 0) || !Double.isFinite(f0)) {
                return;
            }
            double delta = NewtonProposal.draw(g0, h0, normal.sample());
            double f1 = along(x, delta);
            if (Math.log(slice.rng().nextDouble())
                    < NewtonProposal.logRatio(f0, g0, h0, f1, slopeCurvature[0], slopeCurvature[1], delta)) {
                for (int k = 0; k < arms; k++) {
                    if (k != control) {
                        x[spread.armMean[k]] += delta;
                    }
                }
                for (int j = 0; j < segs; j++) {
                    logSigma[control] = base[j] + direction[j] * delta;
                    spread.storeSegment(x, j, logSigma);
                }
            }
        }

        /** The log conditional at a step delta along the tilt, its slope and minus its curvature in slopeCurvature. */
        private double along(double[] x, double delta) {
            double s0 = x[spread.levelMean], tau = Math.exp(x[spread.logTauLevel]);
            double levelPrecision = 1 / (tau * tau);
            double sd = SegmentedLayout.SPREAD.armMean().sd(), armPrecision = 1 / (sd * sd);
            double lp = 0, slope = 0, curvature = 0;
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    double g = x[spread.armMean[k]] + delta;
                    lp -= 0.5 * armPrecision * g * g;
                    slope -= armPrecision * g;
                    curvature += armPrecision;
                }
            }
            for (int j = 0; j < segs; j++) {
                double v = direction[j], l = base[j] + v * delta, r = l - s0;
                lp -= 0.5 * levelPrecision * r * r;
                slope -= levelPrecision * r * v;
                curvature += levelPrecision * v * v;
                for (int k = 0; k < arms; k++) {
                    double m = cells.m[j][k];
                    if (m == 0) {
                        continue;
                    }
                    double u = k == control ? v : v + 1;
                    double cellLog = l + (k == control ? 0 : x[spread.armMean[k]] + delta);
                    double q = squares[j * arms + k] * Math.exp(-2 * cellLog);
                    lp += -m * cellLog - 0.5 * q;
                    slope += (-m + q) * u;
                    curvature += 2 * q * u * u;
                }
            }
            slopeCurvature[0] = slope;
            slopeCurvature[1] = curvature;
            return lp;
        }
    }
}
