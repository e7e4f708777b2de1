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
 * update of the posterior, so the step leaves it invariant whatever parameterisation the chain stores.
 * Given a cell likelihood, the non-centred half follows: levelMean and every armMean_k move together with
 * the standardised levels and effects held ({@code locations}, a Newton-proposal Metropolis-Hastings move).
 * The centred moves mix well where the data pin the values, the non-centred one where they do not.
 * Cost O(cells).
 */
final class HyperStep implements Step {
    private final HierarchicalCells s;
    private final HierarchicalCells.Prior prior;
    private final CellLikelihood likelihood;

    /**
     * @param structure   the structure whose hyperparameters move
     * @param prior       its hyperpriors
     * @param likelihood  the log likelihood of one cell as a function of its value (for the non-centred
     *                    location moves; null: none)
     */
    HyperStep(HierarchicalCells structure, HierarchicalCells.Prior prior, CellLikelihood likelihood) {
        this.s = structure;
        this.prior = prior;
        this.likelihood = likelihood;
    }

    /**
     * The log likelihood of cell (j * arms + k) as a function of the structure's cell value, the rest of the
     * point held. {@link #prepare} reads what the cells need from the point once (say each cell's sigma);
     * the evaluations then read only the prepared values.
     */
    interface CellLikelihood {
        /**
         * @param x        the current point (not modified)
         * @param prepared per cell, whatever the evaluations need from x (modified)
         */
        void prepare(double[] x, double[] prepared);

        /**
         * @param prepared from {@link #prepare} (not modified)
         * @param cell     segment-major cell index
         * @param value    the cell's value (payer-rate logit, or mean log spend)
         * @return the cell's log likelihood, constants dropped
         */
        double at(double[] prepared, int cell, double value);

        /**
         * The same with its first and second derivatives in the value.
         *
         * @param prepared    from {@link #prepare} (not modified)
         * @param cell        segment-major cell index
         * @param value       the cell's value
         * @param derivatives the first derivative at [0] and the second at [1] (modified)
         * @return the cell's log likelihood, constants dropped
         */
        double withDerivatives(double[] prepared, int cell, double value, double[] derivatives);
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
        private final double[] cell = new double[2], prepared = new double[s.segments * s.arms];
        private final double[] zero = new double[s.arms], delta = new double[s.arms], centre = new double[s.arms];
        private final double[] eps = new double[s.arms], gradient0 = new double[s.arms], gradient1 = new double[s.arms];
        private final double[] precision = new double[s.arms], information = new double[s.arms];
        private final SegmentGaussian gauss0 = new SegmentGaussian(s.arms, s.control);
        private final SegmentGaussian gauss1 = new SegmentGaussian(s.arms, s.control);

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
            }
            if (likelihood != null) {
                locations(x);
            }
            state.invalidate();
        }

        /**
         * The non-centred half of the interweaving for the locations: levelMean and every armMean_k move
         * together with every standardised level and effect held, so a change (dL, dA_k) shifts the control
         * cells by dL and arm k's cells by dL + dA_k in every segment. Where the levels or effects barely differ
         * between segments the centred moves above crawl (the values pin their mean), and so does any move of
         * one location alone when the arms' shifts trade off against the level's; this move goes along all of
         * them at once. It is a Metropolis-Hastings move proposed from the Gaussian that matches the log
         * conditional's gradient g and Hessian -H at the current point, N(H^-1 g, H^-1) (a Newton step with
         * its own uncertainty; the conditional is log-concave in the shifts, and H is an arrow matrix, see
         * {@link SegmentGaussian}), the reverse proposal taken at the proposed point. Centred coordinates are
         * written back shifted. Two passes over the cells.
         */
        private void locations(double[] x) {
            int arms = s.arms;
            s.values(x, values);
            likelihood.prepare(x, prepared);
            java.util.Arrays.fill(zero, 0);
            double f0 = shifted(x, zero, gradient0, gauss0);
            if (!Double.isFinite(f0)) {
                return;
            }
            gauss0.solve(gradient0, centre);
            for (int k = 0; k < arms; k++) {
                eps[k] = normal.sample();
            }
            gauss0.whiten(eps, delta);
            for (int k = 0; k < arms; k++) {
                delta[k] += centre[k];
                eps[k] = delta[k] - centre[k];
            }
            double forth = -0.5 * gauss0.quadratic(eps) + 0.5 * gauss0.logDeterminant();
            double f1 = shifted(x, delta, gradient1, gauss1);
            if (!Double.isFinite(f1)) {
                return;
            }
            gauss1.solve(gradient1, centre);
            for (int k = 0; k < arms; k++) {
                eps[k] = -delta[k] - centre[k];
            }
            double back = -0.5 * gauss1.quadratic(eps) + 0.5 * gauss1.logDeterminant();
            if (!(Math.log(slice.rng().nextDouble()) < f1 - f0 + back - forth)) {
                return;
            }
            double level = delta[s.control];
            x[s.levelMean] += level;
            for (int k = 0; k < arms; k++) {
                if (k != s.control) {
                    x[s.armMean[k]] += delta[k];
                }
            }
            for (int j = 0; j < s.segments; j++) {
                if (!s.levelNc[j]) {
                    x[s.level[j]] += level;
                }
                for (int k = 0; k < arms && !s.sharedEffects; k++) {
                    if (k != s.control && !s.effectNc[j]) {
                        x[s.effect[j][k]] += level + delta[k];
                    }
                }
            }
        }

        /**
         * The log conditional of the shifts d (dL at the control position, dA_k elsewhere), with its gradient
         * (modified) and its Hessian's negative (set into {@code h}).
         */
        private double shifted(double[] x, double[] d, double[] gradient, SegmentGaussian h) {
            int arms = s.arms;
            double lp = 0;
            for (int k = 0; k < arms; k++) {
                dev.cairn.models.prior.Normal p = k == s.control ? prior.mean() : prior.armMean();
                double location = (k == s.control ? x[s.levelMean] : x[s.armMean[k]]) + d[k];
                lp += p.logDensity(location);
                gradient[k] = p.derivative(location);
                precision[k] = 1 / (p.sd() * p.sd());
                information[k] = 0;
            }
            for (int j = 0; j < s.segments; j++) {
                for (int k = 0; k < arms; k++) {
                    int c = j * arms + k;
                    double shift = k == s.control ? d[k] : d[s.control] + d[k];
                    lp += likelihood.withDerivatives(prepared, c, values[c] + shift, cell);
                    information[k] -= cell[1];
                    if (k != s.control) {
                        gradient[k] += cell[0];
                    }
                    gradient[s.control] += cell[0];
                }
            }
            h.set(precision, information);
            return lp;
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

        /** Slice update of log tau given n centred values with squared deviations ss around their mean. */
        private void scale(double[] x, int at, HalfNormal scalePrior, int n, double ss) {
            slice.update(x, at, l -> scalePrior.logDensityOfLog(l) - n * l
                    - ss / (2 * Math.exp(2 * l)));
        }
    }
}
