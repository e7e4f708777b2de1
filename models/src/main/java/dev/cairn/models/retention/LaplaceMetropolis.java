package dev.cairn.models.retention;

import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * The retention posterior's {@code laplace-metropolis} step: Metropolis-Hastings moves of every coordinate at
 * once, proposed from a Gaussian approximation of the posterior given the two drift scales (Tierney 1994,
 * "Markov chains for exploring posterior distributions", Annals of Statistics 22(4):1701-1728, the
 * independence chain; the Gaussian from a second-order expansion of the likelihood as in the Laplace
 * approximation).
 *
 * <p>Write theta for everything but the drift scales (the centred series L_c and S_c, the arm offsets, log kappa).
 * Given sigma = (sigmaL, sigmaS) the prior of theta is Gaussian: log p(theta | sigma) = -theta' Q(sigma) theta / 2
 * + b' theta + const, Q holding the random walks' 1/sigma^2 increments, the first values' and the offsets'
 * precisions. The log likelihood is replaced by its expansion at a point theta0, lik(theta0) + g0'(theta - theta0)
 * - (theta - theta0)' H0 (theta - theta0) / 2 (H0 the negative Hessian, each cell's block made positive
 * semi-definite), so that
 * <pre>
 *   q(theta | sigma) = N(mu, P^-1),   P = H0 + Q(sigma),   P mu = H0 theta0 + g0 + b
 * </pre>
 * is exact in sigma and close to p(theta | sigma, data) wherever the likelihood is nearly quadratic over the
 * posterior (thousands of installs per cell). Each iteration makes one joint move, one evaluation of the log
 * density: the drift scales take {@value #SURROGATE_STEPS} random-walk Metropolis steps under their approximate
 * marginal posterior m(sigma) = p(sigma) * integral of exp(expansion) p(theta | sigma) d theta (a Gaussian integral,
 * read off the same Cholesky factor), then theta' ~ q(. | sigma'), and the pair is accepted with probability
 * <pre>
 *   min(1, [p(sigma', theta') / (q(theta' | sigma') m(sigma'))] / [p(sigma, theta) / (q(theta | sigma) m(sigma))])
 * </pre>
 * (the surrogate steps are reversible for m, so m's ratio stands in for their proposal density: surrogate
 * transitions: Liu 2001, "Monte Carlo Strategies in Scientific Computing", the surrogate transition method;
 * the citation from memory, section not checked). The
 * ratio is the expansion's error alone, so the drift scales travel as if theta were integrated out: no funnel
 * however small they are, and no tuning of a step along thousands of cells.
 *
 * <p>Every {@value #LOCAL_EVERY} iterations a local step of theta follows (preconditioned Crank-Nicolson: an
 * autoregressive move that keeps q invariant, accepted with the ratio of p / q): it does not depend on q covering
 * the posterior's tails, so where the expansion is poor (few installs, a broad kappa) a chain that an
 * independence proposal would hold at one point walks on.
 *
 * <p>Warmup: at the first iteration, theta0 is the mode of p(theta | sigma, data) at the chain's start (Newton
 * steps with a backtracking line search); it is moved to the mean of the draws at the end of warmup windows of
 * 25, 50, 100, 200, ... iterations, and the random walk's covariance and scale are learnt from the log sigma
 * draws (scale aimed at acceptance 0.3). Everything is frozen for the kept draws, so the kept chain is a
 * fixed Metropolis-Hastings kernel and exact for the posterior, whatever the quality of the approximation
 * (a poor one shows as low acceptance and low ESS, never as bias). The first warmup iteration jumps to a draw
 * from q: a start far out in the tails would otherwise hold an independence proposal back for long.
 *
 * <p>Cost per iteration: one and a half log densities (no gradient) and {@value #SURROGATE_STEPS} + 1 sparse Cholesky
 * factorisations (EJML) of the (2C + 2(K - 1) + 1)-square precision, banded over the interleaved series with the
 * offsets and log kappa as an arrow head, so linear in the number of cohorts.
 */
final class LaplaceMetropolis implements Step {
    /** Acceptance the log sigma random walk aims for during warmup (common practice for a 2-d random walk). */
    static final double TARGET_ACCEPTANCE = 0.3;
    /** Random-walk steps of the drift scales under their approximate marginal before each joint proposal. */
    static final int SURROGATE_STEPS = 10;
    /** Acceptance the local step aims for during warmup (common practice for Metropolis steps in many dimensions). */
    static final double LOCAL_ACCEPTANCE = 0.3;
    /** The local step runs every this many iterations (a fixed cycle, so each kernel keeps the posterior). */
    static final int LOCAL_EVERY = 2;
    private final RetentionPosterior m;
    private final int warmup;

    LaplaceMetropolis(RetentionPosterior model, int warmup) {
        if (model.levelNc || model.slopeNc) {
            throw new IllegalArgumentException("the Laplace-Metropolis step needs the walks stored centred");
        }
        this.m = model;
        this.warmup = warmup;
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new Chain(target, stream);
    }

    /** Per chain: the expansion, the random walk's adaptation, scratch. */
    private final class Chain implements Updater {
        private final Target target;
        private final UniformRandomProvider rng;
        private final ZigguratSampler.NormalizedGaussian normal;
        /**
         * theta's coordinates in the chain's point, and each coordinate's position in theta (-1: a drift scale).
         * Positions interleave the series (L_c at 2c, S_c at 2c + 1) and put the offsets and log kappa last, so
         * that the precision is banded with an arrow head and its Cholesky factor fills in nothing else.
         */
        private final int[] theta;
        private final int[] position;
        private final int d;
        /** The proposal q(theta | sigma) and its expansion. */
        private final GaussianProposal q;
        private final double[] proposal;
        private final double[] z;
        private GaussianProposal.Gaussian current;
        private int iteration;
        private int windowEnd = 25;
        private int windowSize = 25;
        private final double[] windowSum;
        private int windowCount;
        /** Random walk on (log sigmaL, log sigmaS) under the approximate marginal: Cholesky factor, log scale. */
        private double rw00 = 0.3, rw10, rw11 = 0.3;
        private double logScale;
        private double sumL, sumS, sumLL, sumLS, sumSS;
        private int rwCount;
        private int adaptStep;
        private long moves;
        /** The local step's log b and its adaptation count. */
        private double localLogScale = Math.log(0.5);
        private int localStep;
        private long accepted;

        Chain(Target target, UniformRandomProvider stream) {
            this.target = target;
            this.rng = stream;
            this.normal = ZigguratSampler.NormalizedGaussian.of(stream);
            int size = m.size;
            position = new int[size];
            java.util.Arrays.fill(position, -1);
            int count = 0;
            for (int c = 0; c < m.cohorts; c++) {
                position[m.level + c] = count++;
                position[m.slope + c] = count++;
            }
            for (int i = 0; i < size; i++) {
                if (position[i] < 0 && i != m.logSigmaL && i != m.logSigmaS) {
                    position[i] = count++;
                }
            }
            d = count;
            theta = new int[d];
            for (int i = 0; i < size; i++) {
                if (position[i] >= 0) {
                    theta[position[i]] = i;
                }
            }
            windowSum = new double[d];
            proposal = new double[size];
            z = new double[d];
            q = new GaussianProposal(m, position, d, normal);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            if (iteration == 0) {
                if (adapt) {
                    expandAtMode(x);
                } else {
                    q.expandAt(x);
                }
            }
            double lp = state.logDensity();
            if (current == null || current.logSigmaL() != x[m.logSigmaL] || current.logSigmaS() != x[m.logSigmaS]) {
                current = q.at(x[m.logSigmaL], x[m.logSigmaS]);
            }
            if (iteration == 0 && adapt && current != null) {
                // a start far out in the tails would hold an independence chain for long (q is narrow beside the
                // distance): the first warmup iteration jumps to a draw from q instead
                System.arraycopy(x, 0, proposal, 0, x.length);
                q.draw(current, proposal);
                double lpJump = target.logDensity(proposal);
                if (Double.isFinite(lpJump)) {
                    System.arraycopy(proposal, 0, x, 0, x.length);
                    lp = lpJump;
                }
            }
            if (current != null) {
                lp = move(x, lp, adapt);
                if (iteration % LOCAL_EVERY == 0) {
                    lp = localMove(x, lp, adapt);
                }
            }
            state.accept(lp);
            if (adapt) {
                adapt(x);
            }
            iteration++;
        }

        /**
         * One move: the drift scales by {@value #SURROGATE_STEPS} random-walk Metropolis steps under their
         * approximate marginal (a chain reversible for it, so its end is a proposal whose density ratio is the
         * marginal's), theta from q there, accepted with the exact posterior. Returns the new log density.
         */
        private double move(double[] x, double lp, boolean adapt) {
            double logQ = q.logQ(current, x);
            GaussianProposal.Gaussian next = current;
            double scale = Math.exp(logScale);
            int surrogateAccepted = 0;
            for (int step = 0; step < SURROGATE_STEPS; step++) {
                double zl = normal.sample(), zs = normal.sample();
                GaussianProposal.Gaussian trial = q.at(next.logSigmaL() + scale * rw00 * zl,
                        next.logSigmaS() + scale * (rw10 * zl + rw11 * zs));
                if (trial != null && Math.log(rng.nextDouble()) < trial.logMarginal() - next.logMarginal()) {
                    next = trial;
                    surrogateAccepted++;
                }
            }
            if (adapt) {
                adaptScale(surrogateAccepted / (double) SURROGATE_STEPS);
            }
            System.arraycopy(x, 0, proposal, 0, x.length);
            proposal[m.logSigmaL] = next.logSigmaL();
            proposal[m.logSigmaS] = next.logSigmaS();
            double logQNew = q.draw(next, proposal);
            double lpNew = target.logDensity(proposal);
            // p(sigma', theta') / p(sigma, theta) * q(theta | sigma) / q(theta' | sigma') * marginal(sigma) / marginal(sigma')
            double logRatio = (lpNew - logQNew - next.logMarginal()) - (lp - logQ - current.logMarginal());
            moves++;
            if (Double.isFinite(lpNew) && Math.log(rng.nextDouble()) < logRatio) {
                System.arraycopy(proposal, 0, x, 0, x.length);
                current = next;
                accepted++;
                return lpNew;
            }
            return lp;
        }

        /**
         * A preconditioned Crank-Nicolson step of theta with the drift scales held (Cotter, Roberts, Stuart &amp;
         * White 2013, "MCMC methods for functions", Statistical Science 28(3):424-446; citation from memory):
         * theta' = mu + sqrt(1 - b^2)(theta - mu) + b e, e ~ N(0, P^-1), which leaves q itself invariant, accepted
         * with the ratio of p / q at the two points; b tuned in warmup towards acceptance
         * {@value #LOCAL_ACCEPTANCE}. Being local, it does not rely on q covering the posterior's tails: where the
         * expansion is poor (few installs, a broad kappa), an independence proposal alone can hold a chain at a
         * point q underweights; this step walks it on, at a rate that does not fall with the dimension.
         */
        private double localMove(double[] x, double lp, boolean adapt) {
            double b = Math.min(1, Math.exp(localLogScale)), keep = Math.sqrt(1 - b * b);
            for (int i = 0; i < d; i++) {
                z[i] = normal.sample();
            }
            q.whiten(current, z);
            System.arraycopy(x, 0, proposal, 0, x.length);
            double[] mean = current.mean();
            for (int i = 0; i < d; i++) {
                proposal[theta[i]] = mean[i] + keep * (x[theta[i]] - mean[i]) + b * z[i];
            }
            double lpNew = target.logDensity(proposal);
            double logRatio = (lpNew - q.logQ(current, proposal)) - (lp - q.logQ(current, x));
            double acceptance = Double.isFinite(lpNew) ? Math.exp(Math.min(0, logRatio)) : 0;
            if (adapt) {
                localStep++;
                localLogScale += (acceptance - LOCAL_ACCEPTANCE) / Math.pow(localStep, 0.6);
                localLogScale = Math.max(-10, Math.min(0, localLogScale));
            }
            if (Double.isFinite(lpNew) && rng.nextDouble() < acceptance) {
                System.arraycopy(proposal, 0, x, 0, x.length);
                return lpNew;
            }
            return lp;
        }

        /** Warmup: the surrogate random walk's scale, aimed at acceptance {@value #TARGET_ACCEPTANCE}. */
        private void adaptScale(double acceptance) {
            adaptStep++;
            logScale += (acceptance - TARGET_ACCEPTANCE) / Math.pow(adaptStep, 0.6);
            logScale = Math.max(-10, Math.min(3, logScale));
        }

        /** Warmup: the random walk's covariance, the expansion point at the end of each window. */
        private void adapt(double[] x) {
            double l = x[m.logSigmaL], s = x[m.logSigmaS];
            sumL += l;
            sumS += s;
            sumLL += l * l;
            sumLS += l * s;
            sumSS += s * s;
            rwCount++;
            for (int i = 0; i < d; i++) {
                windowSum[i] += x[theta[i]];
            }
            windowCount++;
            if (iteration + 1 < windowEnd || iteration + 1 > warmup - 50) {
                return;
            }
            double[] centre = x.clone();
            for (int i = 0; i < d; i++) {
                centre[theta[i]] = windowSum[i] / windowCount;
            }
            q.expandAt(centre);
            current = null;
            if (rwCount > 10) {
                double n = rwCount;
                double vl = (sumLL - sumL * sumL / n) / (n - 1) + 1e-4;
                double vs = (sumSS - sumS * sumS / n) / (n - 1) + 1e-4;
                double cls = (sumLS - sumL * sumS / n) / (n - 1);
                // the 2-d random walk's covariance: 2.38^2 / 2 times the draws' (common practice), as a Cholesky factor
                double f = 2.38 * 2.38 / 2;
                rw00 = Math.sqrt(f * vl);
                rw10 = f * cls / rw00;
                rw11 = Math.sqrt(Math.max(f * vs - rw10 * rw10, 1e-8));
                logScale = 0;
                adaptStep = 0;
            }
            sumL = sumS = sumLL = sumLS = sumSS = 0;
            rwCount = 0;
            java.util.Arrays.fill(windowSum, 0);
            windowCount = 0;
            windowSize *= 2;
            windowEnd += windowSize;
        }

        /**
         * Newton steps towards the mode of p(theta | sigma, data) from the chain's start, sigma held (each step
         * re-expands there and moves to the Gaussian's mean, halved until the density does not fall); the last
         * expansion is the first theta0. The chain's point is not moved.
         */
        private void expandAtMode(double[] start) {
            double[] x = start.clone();
            double lp = target.logDensity(x);
            for (int step = 0; step < 50; step++) {
                q.expandAt(x);
                GaussianProposal.Gaussian g = q.at(x[m.logSigmaL], x[m.logSigmaS]);
                if (g == null || !Double.isFinite(lp)) {
                    return;
                }
                double[] trial = x.clone();
                double t = 1, moved = 0;
                for (int tries = 0; tries < 30; tries++) {
                    moved = 0;
                    for (int i = 0; i < d; i++) {
                        double delta = t * (g.mean()[i] - x[theta[i]]);
                        trial[theta[i]] = x[theta[i]] + delta;
                        moved = Math.max(moved, Math.abs(delta));
                    }
                    double lpTrial = target.logDensity(trial);
                    if (lpTrial >= lp - 1e-9 * Math.abs(lp)) {
                        lp = lpTrial;
                        System.arraycopy(trial, 0, x, 0, x.length);
                        break;
                    }
                    t *= 0.5;
                }
                if (moved < 1e-6) {
                    break;
                }
            }
            q.expandAt(x);
        }
    }
}
