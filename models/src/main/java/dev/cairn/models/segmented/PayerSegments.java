package dev.cairn.models.segmented;

import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.AhrensDieterMarsagliaTsangGammaSampler;
import org.apache.commons.rng.sampling.distribution.SharedStateContinuousSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Block updates of the payer-rate coordinates, one segment at a time. Given the hyperparameters the segments
 * are independent, and segment j's centred coordinates u = (alpha_j, d_jk) have the full conditional
 * <pre>
 *   log p(u | rest) = sum_k [ m_jk eta_jk - n_jk log(1 + e^eta_jk) ] - 1/2 sum_i lambda_i (u_i - u0_i)^2 + const
 *   eta_j,control = alpha_j,  eta_jk = alpha_j + d_jk,  lambda, u0 the prior precisions and means
 * </pre>
 * which is log-concave. Its mode is found by Newton's method with step halving, started from the Gaussian
 * that replaces each cell's binomial by the empirical logit log((m + 1/2) / (n - m + 1/2)) with precision
 * (m + 1/2)(n - m + 1/2) / (n + 1); the start, and so the mode and the curvature H there, depend only on the
 * data and the hyperparameters, never on the segment's current value. The proposal is a multivariate t with
 * {@value #DEGREES_OF_FREEDOM} degrees of freedom centred at the mode with scale H^-1 (heavier tails than the
 * conditional, whose left tail in a cell without payers is the prior's), accepted with the independence
 * Metropolis-Hastings ratio (Tierney 1994, Annals of Statistics 22(4), section 2.3.3) on the exact
 * conditional. Where the data pin the cells the conditional is near Gaussian and nearly every proposal is
 * accepted; where they are weak the prior dominates and the t covers it. H is an arrow matrix
 * ({@link SegmentGaussian}), so one segment costs O(arms) per Newton step. Cost O(cells) per sweep.
 */
final class PayerSegments implements Step {
    static final int DEGREES_OF_FREEDOM = 8;
    private static final int MAX_NEWTON = Integer.getInteger("newton", 60);
    private final SegmentedCells cells;
    private final HierarchicalCells payer;

    PayerSegments(SegmentedCells cells, HierarchicalCells payer) {
        this.cells = cells;
        this.payer = payer;
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Blocks(stream);
    }

    private final class Blocks implements Updater {
        private final ZigguratSampler.NormalizedGaussian normal;
        private final SharedStateContinuousSampler chiSquares;
        private final UniformRandomProvider rng;
        private final int arms = cells.armCount(), control = cells.control;
        private final SegmentGaussian gauss = new SegmentGaussian(arms, control);
        private final double[] lambda = new double[arms], prior = new double[arms];
        private final double[] n = new double[arms], m = new double[arms];
        private final double[] u = new double[arms], mode = new double[arms], step = new double[arms];
        private final double[] trial = new double[arms], proposal = new double[arms], eta = new double[arms];
        private final double[] w = new double[arms], b = new double[arms], eps = new double[arms];

        Blocks(UniformRandomProvider stream) {
            this.rng = stream;
            this.normal = ZigguratSampler.NormalizedGaussian.of(stream);
            // chi-square with nu degrees of freedom = Gamma(shape nu/2, scale 2)
            this.chiSquares = AhrensDieterMarsagliaTsangGammaSampler.of(stream, DEGREES_OF_FREEDOM / 2.0, 2);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            payer.segmentPrior(x, lambda, prior);
            for (int j = 0; j < cells.segmentCount(); j++) {
                for (int k = 0; k < arms; k++) {
                    n[k] = cells.n[j][k];
                    m[k] = cells.m[j][k];
                }
                payer.segmentValues(x, j, eta);
                centred(eta, u);
                findMode();
                double chiSquare = chiSquares.sample();
                for (int k = 0; k < arms; k++) {
                    eps[k] = normal.sample();
                }
                gauss.whiten(eps, step);
                double scale = Math.sqrt(DEGREES_OF_FREEDOM / chiSquare);
                for (int k = 0; k < arms; k++) {
                    proposal[k] = mode[k] + scale * step[k];
                }
                double logRatio = conditional(proposal) - conditional(u) + proposalLog(u) - proposalLog(proposal);
                if (Double.isFinite(logRatio) && Math.log(rng.nextDouble()) < logRatio) {
                    payer.storeSegment(x, j, values(proposal, eta));
                }
            }
            state.invalidate();
        }

        /**
         * Newton's method with step halving on the conditional, from the empirical-logit Gaussian; stops when
         * the Newton decrement g' H^-1 g falls below 1e-6 (the mode is then within 1e-3 of its sd, and the
         * proposal is as good as at the exact mode) or a step no longer raises it.
         */
        private void findMode() {
            for (int k = 0; k < arms; k++) {
                double logit = Math.log((m[k] + 0.5) / (n[k] - m[k] + 0.5));
                w[k] = n[k] > 0 ? (m[k] + 0.5) * (n[k] - m[k] + 0.5) / (n[k] + 1) : 0;
                eta[k] = w[k] * logit;
            }
            for (int k = 0; k < arms; k++) {
                b[k] = lambda[k] * prior[k] + (k == control ? sum(eta) : eta[k]);
            }
            gauss.set(lambda, w);
            gauss.solve(b, mode);
            double current = evaluate(mode, b, w);
            for (int iteration = 0; iteration < MAX_NEWTON; iteration++) {
                gauss.set(lambda, w);
                gauss.solve(b, step);
                double decrement = 0;
                for (int k = 0; k < arms; k++) {
                    decrement += b[k] * step[k];
                }
                if (!(decrement > 1e-6)) {
                    break;
                }
                double t = 1, next;
                while (true) {
                    for (int k = 0; k < arms; k++) {
                        trial[k] = mode[k] + t * step[k];
                    }
                    next = evaluate(trial, eps, proposal);
                    if (next >= current || t < 1e-10) {
                        break;
                    }
                    t /= 2;
                }
                if (!(next >= current)) {
                    break;
                }
                System.arraycopy(trial, 0, mode, 0, arms);
                System.arraycopy(eps, 0, b, 0, arms);
                System.arraycopy(proposal, 0, w, 0, arms);
                current = next;
            }
            gauss.set(lambda, w);
        }

        private double sum(double[] a) {
            double s = 0;
            for (double v : a) {
                s += v;
            }
            return s;
        }

        /**
         * The log conditional at centred coordinates c (constants dropped), its gradient and the cells'
         * likelihood precisions n p (1 - p), from one exponential and one logarithm per cell.
         *
         * @param c         centred coordinates (not modified)
         * @param gradient  the gradient (modified)
         * @param precision per arm, the likelihood precision (modified)
         * @return the log conditional
         */
        private double evaluate(double[] c, double[] gradient, double[] precision) {
            double lp = 0, total = 0;
            for (int k = 0; k < arms; k++) {
                double v = k == control ? c[k] : c[control] + c[k];
                double g = 0;
                precision[k] = 0;
                if (n[k] > 0) {
                    double e = Math.exp(-Math.abs(v));
                    double p = v >= 0 ? 1 / (1 + e) : e / (1 + e);
                    lp += m[k] * v - n[k] * (Math.max(v, 0) + Math.log(1 + e));
                    g = m[k] - n[k] * p;
                    precision[k] = n[k] * p * (1 - p);
                }
                double r = c[k] - prior[k];
                lp -= 0.5 * lambda[k] * r * r;
                total += g;
                gradient[k] = g - lambda[k] * r;
            }
            gradient[control] = total - lambda[control] * (c[control] - prior[control]);
            return lp;
        }

        /** The log conditional of the segment at centred coordinates c, constants dropped. */
        private double conditional(double[] c) {
            double lp = 0;
            for (int k = 0; k < arms; k++) {
                double v = k == control ? c[k] : c[control] + c[k];
                if (n[k] > 0) {
                    lp += m[k] * v - n[k] * (Math.max(v, 0) + Math.log(1 + Math.exp(-Math.abs(v))));
                }
                double r = c[k] - prior[k];
                lp -= 0.5 * lambda[k] * r * r;
            }
            return lp;
        }

        /** The log density of the t proposal at c, constants dropped (the same H both ways). */
        private double proposalLog(double[] c) {
            for (int k = 0; k < arms; k++) {
                step[k] = c[k] - mode[k];
            }
            return -0.5 * (DEGREES_OF_FREEDOM + arms) * Math.log1p(gauss.quadratic(step) / DEGREES_OF_FREEDOM);
        }

        private double[] values(double[] c, double[] out) {
            for (int k = 0; k < arms; k++) {
                out[k] = k == control ? c[k] : c[control] + c[k];
            }
            return out;
        }

        private void centred(double[] values, double[] out) {
            for (int k = 0; k < arms; k++) {
                out[k] = k == control ? values[k] : values[k] - values[control];
            }
        }
    }
}
