package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * The No-U-Turn Sampler over a block of coordinates of a {@link GradientTarget} (Hoffman & Gelman 2014,
 * "The No-U-Turn Sampler", JMLR 15:1593-1623), in the form of Betancourt 2017 ("A conceptual introduction to
 * Hamiltonian Monte Carlo", arXiv:1701.02434): the trajectory doubles in a random direction until the
 * generalised no-U-turn criterion fails (checked across the merged trajectory and across each pair of
 * sub-trajectories), and the next point is drawn multinomially in proportion to exp(-H) along it (biased
 * progressive sampling between the old and the new half, uniform progressive sampling inside a subtree).
 *
 * <p>Kinetic energy p' M^-1 p / 2 with a diagonal inverse metric M^-1 that is estimated in warmup windows
 * ({@link MetricAdaptation}); leapfrog step size tuned by dual averaging towards a mean acceptance
 * statistic of 0.8 ({@link StepSizeAdaptation}) and restarted (from a doubling/halving search) whenever the
 * metric changes. Adaptation happens only while the chain is in warmup; kept draws use the averaged step size
 * and the last metric, so the kept chain is a fixed, valid NUTS kernel.
 *
 * <p>A point whose log density or gradient is not finite counts as an energy error: the subtree that reaches
 * it is discarded (a divergence) and the chain stays in the valid part of the trajectory.
 *
 * <p>Coordinates outside the block are held fixed, so the step combines with exact Gibbs draws of others.
 */
public final class NutsStep implements Step {
    /** Energy error beyond which a trajectory is called divergent (as in Stan). */
    static final double MAX_ENERGY_ERROR = 1000;
    /** Hessian-vector products behind the first metric. */
    static final int CURVATURE_PROBES = 8;
    private final int[] coordinates;
    private final int warmup;
    private final int maxDepth;
    private final double targetAcceptance;
    private final GradientTarget conditional;

    private NutsStep(int[] coordinates, int warmup, int maxDepth, double targetAcceptance, GradientTarget conditional) {
        this.coordinates = coordinates;
        this.warmup = warmup;
        this.maxDepth = maxDepth;
        this.targetAcceptance = targetAcceptance;
        this.conditional = conditional;
    }

    /**
     * NUTS over every coordinate, with adaptation windows laid out for {@code warmup} iterations, maximum tree
     * depth 10 and target acceptance 0.8.
     *
     * @param warmup the chain's warmup iterations (the schedule of metric windows depends on it), >= 0
     * @return the step
     * @throws IllegalArgumentException when warmup is negative
     */
    public static NutsStep of(int warmup) {
        return of(warmup, null, 10, 0.8);
    }

    /**
     * NUTS over the given coordinates.
     *
     * @param warmup           the chain's warmup iterations, >= 0
     * @param coordinates      the block (all coordinates when null or empty)
     * @param maxDepth         largest tree depth (at most 2^maxDepth leapfrog steps an iteration), 1..20
     * @param targetAcceptance mean acceptance statistic that step-size adaptation aims for, in (0, 1)
     * @return the step
     * @throws IllegalArgumentException naming the bad value
     */
    public static NutsStep of(int warmup, int[] coordinates, int maxDepth, double targetAcceptance) {
        if (warmup < 0) {
            throw new IllegalArgumentException("warmup must be >= 0, was " + warmup);
        }
        if (maxDepth < 1 || maxDepth > 20) {
            throw new IllegalArgumentException("maxDepth must be in 1..20, was " + maxDepth);
        }
        if (!(targetAcceptance > 0 && targetAcceptance < 1)) {
            throw new IllegalArgumentException("targetAcceptance must be in (0, 1), was " + targetAcceptance);
        }
        return new NutsStep(Coordinates.checked(coordinates), warmup, maxDepth, targetAcceptance, null);
    }

    /**
     * The same step, with trajectories run on {@code density}: the target's log density up to terms that do
     * not involve the block's coordinates (its full conditional, unnormalised). When the joint is a sum of
     * independent parts, each block's NUTS step then evaluates only its own part. The chain's recorded log
     * density is refreshed from the target after each transition.
     *
     * @param density a density over the same coordinates whose gradient in the block equals the target's
     * @return the step
     * @throws IllegalArgumentException when density is null
     */
    public NutsStep on(GradientTarget density) {
        if (density == null) {
            throw new IllegalArgumentException("the conditional density must not be null");
        }
        return new NutsStep(coordinates, warmup, maxDepth, targetAcceptance, density);
    }

    @Override
    public Updater start(Target target) {
        GradientTarget g;
        if (conditional != null) {
            if (conditional.parameters().size() != target.parameters().size()) {
                throw new IllegalArgumentException("the conditional density has " + conditional.parameters().size()
                        + " coordinates, the target " + target.parameters().size());
            }
            g = conditional;
        } else if (target instanceof GradientTarget t) {
            g = t;
        } else {
            throw new IllegalArgumentException("NUTS needs a target with a gradient (a GradientTarget)");
        }
        return new NutsUpdater(g, Coordinates.resolve(coordinates, target), warmup, maxDepth, targetAcceptance,
                conditional != null);
    }

    /**
     * A point in phase space: position (full vector; only the block's coordinates ever differ between the
     * points of one updater), momentum and gradient (on the block), log density.
     */
    private static final class PhasePoint {
        final double[] q;
        final double[] p;
        final double[] grad;
        double logp;

        PhasePoint(int full, int block) {
            q = new double[full];
            p = new double[block];
            grad = new double[block];
        }

        /** Copies o's block coordinates (all of q when block is null and first < 0), momentum and gradient. */
        void copyFrom(PhasePoint o, int[] block, int first) {
            if (first >= 0) {
                System.arraycopy(o.q, first, q, first, p.length);
            } else {
                for (int i : block) {
                    q[i] = o.q[i];
                }
            }
            System.arraycopy(o.p, 0, p, 0, p.length);
            System.arraycopy(o.grad, 0, grad, 0, grad.length);
            logp = o.logp;
        }
    }

    /** The per-chain half: adapted step size and metric, scratch vectors for the trajectory. */
    public static final class NutsUpdater implements Updater {
        private final GradientTarget target;
        private final int[] block;
        private final int maxDepth;
        private final int d;
        private final double[] inverseMetric;
        private final double[] fullGradient;
        private final StepSizeAdaptation stepSizes;
        private final MetricAdaptation metric;
        private final ChainGaussian normal = new ChainGaussian();
        private final PhasePoint z, forward, backward, sample, propose, start;
        /** Per recursion level: proposal of the final subtree and the vectors the criterion needs. */
        private final PhasePoint[] proposeFinal;
        /** Every phase point, to load the chain's full position into each at the start of a transition. */
        private final PhasePoint[] allPoints;
        private final double[][] pInitEnd, pSharpInitEnd, rhoInit, pFinalBeg, pSharpFinalBeg, rhoFinal;
        private final double[] pFwdFwd, pSharpFwdFwd, pFwdBck, pSharpFwdBck, pBckFwd, pSharpBckFwd, pBckBck, pSharpBckBck;
        private final double[] rho, rhoFwd, rhoBck, rhoExtended;
        private double stepSize = 1;
        private boolean initialised;
        private boolean adapting;
        private UniformRandomProvider rng;
        // per-transition bookkeeping
        private int leapfrogs;
        private double sumAcceptance;
        private boolean divergent;
        private long divergences;
        private long transitions;
        private long totalLeapfrogs;
        private int lastDepth;
        private final boolean partial;
        /** The block as one range [first, first + d) when its coordinates are consecutive, else first = -1. */
        private final int first;

        NutsUpdater(GradientTarget target, int[] block, int warmup, int maxDepth, double targetAcceptance,
                    boolean partial) {
            this.target = target;
            this.partial = partial;
            boolean consecutive = true;
            for (int i = 1; i < block.length; i++) {
                consecutive &= block[i] == block[0] + i;
            }
            this.first = consecutive && block.length > 0 ? block[0] : -1;
            this.block = block;
            this.maxDepth = maxDepth;
            this.d = block.length;
            int full = target.parameters().size();
            inverseMetric = new double[d];
            java.util.Arrays.fill(inverseMetric, 1);
            fullGradient = new double[full];
            stepSizes = new StepSizeAdaptation(targetAcceptance);
            metric = new MetricAdaptation(d, warmup);
            z = new PhasePoint(full, d);
            forward = new PhasePoint(full, d);
            backward = new PhasePoint(full, d);
            sample = new PhasePoint(full, d);
            propose = new PhasePoint(full, d);
            start = new PhasePoint(full, d);
            proposeFinal = new PhasePoint[maxDepth + 1];
            pInitEnd = new double[maxDepth + 1][d];
            pSharpInitEnd = new double[maxDepth + 1][d];
            rhoInit = new double[maxDepth + 1][d];
            pFinalBeg = new double[maxDepth + 1][d];
            pSharpFinalBeg = new double[maxDepth + 1][d];
            rhoFinal = new double[maxDepth + 1][d];
            for (int i = 0; i <= maxDepth; i++) {
                proposeFinal[i] = new PhasePoint(full, d);
            }
            allPoints = new PhasePoint[maxDepth + 7];
            System.arraycopy(proposeFinal, 0, allPoints, 0, maxDepth + 1);
            allPoints[maxDepth + 1] = z;
            allPoints[maxDepth + 2] = forward;
            allPoints[maxDepth + 3] = backward;
            allPoints[maxDepth + 4] = sample;
            allPoints[maxDepth + 5] = propose;
            allPoints[maxDepth + 6] = start;
            pFwdFwd = new double[d];
            pSharpFwdFwd = new double[d];
            pFwdBck = new double[d];
            pSharpFwdBck = new double[d];
            pBckFwd = new double[d];
            pSharpBckFwd = new double[d];
            pBckBck = new double[d];
            pSharpBckBck = new double[d];
            rho = new double[d];
            rhoFwd = new double[d];
            rhoBck = new double[d];
            rhoExtended = new double[d];
        }

        /** The current leapfrog step size. */
        public double stepSize() {
            return stepSize;
        }

        /** The current diagonal inverse metric (the estimated posterior variances), a copy. */
        public double[] inverseMetric() {
            return inverseMetric.clone();
        }

        /** Transitions so far whose trajectory ended in a divergence. */
        public long divergences() {
            return divergences;
        }

        /** Mean number of leapfrog steps per transition so far. */
        public double meanLeapfrogs() {
            return transitions == 0 ? 0 : (double) totalLeapfrogs / transitions;
        }

        /** Tree depth of the last transition. */
        public int lastDepth() {
            return lastDepth;
        }

        @Override
        public void update(ChainState state, UniformRandomProvider r, boolean adapt) {
            this.rng = r;
            double[] x = state.point();
            for (PhasePoint point : allPoints) {
                System.arraycopy(x, 0, point.q, 0, x.length);
            }
            evaluate(z);
            if (!Double.isFinite(z.logp)) {
                return; // the chain's point is outside the support: nothing to move from (the chain start forbids it)
            }
            if (!initialised) {
                initialised = true;
                if (adapt) {
                    curvatureMetric(x);
                }
                findStepSize();
                stepSizes.restart(stepSize);
            }
            if (adapting && !adapt) {
                stepSize = stepSizes.averaged();
            }
            adapting = adapt;
            double acceptance = transition();
            System.arraycopy(sample.q, 0, x, 0, x.length);
            if (partial) {
                state.invalidate();
            } else {
                state.accept(sample.logp);
            }
            if (adapt) {
                stepSize = stepSizes.learn(acceptance);
                if (metric.record(x, block, inverseMetric)) {
                    System.arraycopy(x, 0, z.q, 0, x.length);
                    evaluate(z);
                    findStepSize();
                    stepSizes.restart(stepSize);
                }
            }
        }

        /** One NUTS transition from z; leaves the chosen point in {@code sample}; returns the acceptance statistic. */
        private double transition() {
            drawMomentum(z);
            double h0 = hamiltonian(z);
            forward.copyFrom(z, block, first);
            backward.copyFrom(z, block, first);
            sample.copyFrom(z, block, first);
            propose.copyFrom(z, block, first);
            sharp(z, pSharpFwdFwd);
            System.arraycopy(z.p, 0, pFwdFwd, 0, d);
            System.arraycopy(z.p, 0, pFwdBck, 0, d);
            System.arraycopy(pSharpFwdFwd, 0, pSharpFwdBck, 0, d);
            System.arraycopy(z.p, 0, pBckFwd, 0, d);
            System.arraycopy(pSharpFwdFwd, 0, pSharpBckFwd, 0, d);
            System.arraycopy(z.p, 0, pBckBck, 0, d);
            System.arraycopy(pSharpFwdFwd, 0, pSharpBckBck, 0, d);
            System.arraycopy(z.p, 0, rho, 0, d);
            double logSumWeight = 0;
            leapfrogs = 0;
            sumAcceptance = 0;
            divergent = false;
            int depth = 0;
            while (depth < maxDepth) {
                java.util.Arrays.fill(rhoFwd, 0);
                java.util.Arrays.fill(rhoBck, 0);
                double[] subtreeWeight = {Double.NEGATIVE_INFINITY};
                boolean valid;
                if (rng.nextDouble() > 0.5) {
                    z.copyFrom(forward, block, first);
                    System.arraycopy(rho, 0, rhoBck, 0, d);
                    System.arraycopy(pFwdBck, 0, pBckFwd, 0, d);
                    System.arraycopy(pSharpFwdBck, 0, pSharpBckFwd, 0, d);
                    valid = buildTree(depth, propose, pSharpFwdBck, pSharpFwdFwd, rhoFwd, pFwdBck, pFwdFwd, h0, 1,
                            subtreeWeight);
                    forward.copyFrom(z, block, first);
                } else {
                    z.copyFrom(backward, block, first);
                    System.arraycopy(rho, 0, rhoFwd, 0, d);
                    System.arraycopy(pBckFwd, 0, pFwdBck, 0, d);
                    System.arraycopy(pSharpBckFwd, 0, pSharpFwdBck, 0, d);
                    valid = buildTree(depth, propose, pSharpBckFwd, pSharpBckBck, rhoBck, pBckFwd, pBckBck, h0, -1,
                            subtreeWeight);
                    backward.copyFrom(z, block, first);
                }
                if (!valid) {
                    break;
                }
                depth++;
                if (subtreeWeight[0] > logSumWeight) {
                    sample.copyFrom(propose, block, first);
                } else if (rng.nextDouble() < Math.exp(subtreeWeight[0] - logSumWeight)) {
                    sample.copyFrom(propose, block, first);
                }
                logSumWeight = logSumExp(logSumWeight, subtreeWeight[0]);
                for (int i = 0; i < d; i++) {
                    rho[i] = rhoBck[i] + rhoFwd[i];
                }
                boolean persist = noUTurn(pSharpBckBck, pSharpFwdFwd, rho);
                for (int i = 0; i < d; i++) {
                    rhoExtended[i] = rhoBck[i] + pFwdBck[i];
                }
                persist &= noUTurn(pSharpBckBck, pSharpFwdBck, rhoExtended);
                for (int i = 0; i < d; i++) {
                    rhoExtended[i] = rhoFwd[i] + pBckFwd[i];
                }
                persist &= noUTurn(pSharpBckFwd, pSharpFwdFwd, rhoExtended);
                if (!persist) {
                    break;
                }
            }
            lastDepth = depth;
            transitions++;
            totalLeapfrogs += leapfrogs;
            if (divergent) {
                divergences++;
            }
            return leapfrogs == 0 ? 0 : sumAcceptance / leapfrogs;
        }

        /**
         * Extends the trajectory from z by 2^depth leapfrog steps in direction {@code sign}; z ends at the far
         * edge. Writes the subtree's proposal, edge momenta (plain and sharp), summed momenta (added to
         * {@code rhoOut}) and log weight (added to {@code logWeight[0]}). Returns false when the subtree
         * diverged or turned back on itself.
         */
        private boolean buildTree(int depth, PhasePoint proposal, double[] pSharpBeg, double[] pSharpEnd,
                                  double[] rhoOut, double[] pBeg, double[] pEnd, double h0, int sign,
                                  double[] logWeight) {
            if (depth == 0) {
                leapfrog(z, sign * stepSize);
                leapfrogs++;
                double h = hamiltonian(z);
                if (Double.isNaN(h)) {
                    h = Double.POSITIVE_INFINITY;
                }
                if (h - h0 > MAX_ENERGY_ERROR) {
                    divergent = true;
                }
                logWeight[0] = logSumExp(logWeight[0], h0 - h);
                sumAcceptance += h0 - h > 0 ? 1 : Math.exp(h0 - h);
                proposal.copyFrom(z, block, first);
                sharp(z, pSharpBeg);
                System.arraycopy(pSharpBeg, 0, pSharpEnd, 0, d);
                for (int i = 0; i < d; i++) {
                    rhoOut[i] += z.p[i];
                }
                System.arraycopy(z.p, 0, pBeg, 0, d);
                System.arraycopy(z.p, 0, pEnd, 0, d);
                return !divergent;
            }
            double[] initWeight = {Double.NEGATIVE_INFINITY};
            double[] rInit = rhoInit[depth];
            java.util.Arrays.fill(rInit, 0);
            if (!buildTree(depth - 1, proposal, pSharpBeg, pSharpInitEnd[depth], rInit, pBeg, pInitEnd[depth], h0, sign,
                    initWeight)) {
                return false;
            }
            PhasePoint finalProposal = proposeFinal[depth];
            finalProposal.copyFrom(z, block, first);
            double[] finalWeight = {Double.NEGATIVE_INFINITY};
            double[] rFinal = rhoFinal[depth];
            java.util.Arrays.fill(rFinal, 0);
            if (!buildTree(depth - 1, finalProposal, pSharpFinalBeg[depth], pSharpEnd, rFinal, pFinalBeg[depth], pEnd, h0,
                    sign, finalWeight)) {
                return false;
            }
            double subtree = logSumExp(initWeight[0], finalWeight[0]);
            logWeight[0] = logSumExp(logWeight[0], subtree);
            if (finalWeight[0] > subtree || rng.nextDouble() < Math.exp(finalWeight[0] - subtree)) {
                proposal.copyFrom(finalProposal, block, first);
            }
            double[] ext = rhoExtended;
            for (int i = 0; i < d; i++) {
                rhoOut[i] += rInit[i] + rFinal[i];
            }
            // the criterion over the merged subtree uses its own summed momenta
            for (int i = 0; i < d; i++) {
                ext[i] = rInit[i] + rFinal[i];
            }
            boolean persist = noUTurn(pSharpBeg, pSharpEnd, ext);
            for (int i = 0; i < d; i++) {
                ext[i] = rInit[i] + pFinalBeg[depth][i];
            }
            persist &= noUTurn(pSharpBeg, pSharpFinalBeg[depth], ext);
            for (int i = 0; i < d; i++) {
                ext[i] = rFinal[i] + pInitEnd[depth][i];
            }
            persist &= noUTurn(pSharpInitEnd[depth], pSharpEnd, ext);
            return persist;
        }

        /**
         * A first inverse metric before any draws exist: the inverse of the diagonal of the negative Hessian at
         * the starting point, estimated from eight Hessian-vector products with random
         * sign vectors v, diag(H) ~ mean of v * (H v) (Bekas, Kokiopoulou & Saad 2007, Applied Numerical
         * Mathematics 57(11-12):1214-1229), each H v a central difference of gradients. Coordinates whose
         * estimate is not a positive finite curvature keep the unit metric. Saves the long unit-metric
         * trajectories of the first warmup phase when coordinates differ in scale by orders of magnitude.
         */
        private void curvatureMetric(double[] x) {
            double[] q = x.clone();
            double[] up = new double[fullGradient.length], down = new double[fullGradient.length];
            double[] sum = new double[d];
            int[] sign = new int[d];
            double h = 1e-4;
            for (int probe = 0; probe < CURVATURE_PROBES; probe++) {
                for (int i = 0; i < d; i++) {
                    sign[i] = rng.nextBoolean() ? 1 : -1;
                    q[block[i]] = x[block[i]] + h * sign[i];
                }
                double a = target.logDensityAndGradient(q, up);
                for (int i = 0; i < d; i++) {
                    q[block[i]] = x[block[i]] - h * sign[i];
                }
                double b = target.logDensityAndGradient(q, down);
                if (!Double.isFinite(a) || !Double.isFinite(b)) {
                    return;
                }
                for (int i = 0; i < d; i++) {
                    int c = block[i];
                    sum[i] -= sign[i] * (up[c] - down[c]) / (2 * h);
                }
            }
            for (int i = 0; i < d; i++) {
                double curvature = sum[i] / CURVATURE_PROBES;
                inverseMetric[i] = Double.isFinite(curvature) && curvature > 0
                        ? Math.min(1e6, Math.max(1e-10, 1 / curvature)) : 1;
            }
        }

        /** Doubles or halves the step size until one leapfrog step's acceptance crosses 0.8 (as Stan does). */
        private void findStepSize() {
            start.copyFrom(z, block, first);
            double logTarget = Math.log(0.8);
            int direction = 0;
            for (int attempt = 0; attempt < 100; attempt++) {
                z.copyFrom(start, block, first);
                drawMomentum(z);
                double h0 = hamiltonian(z);
                leapfrog(z, stepSize);
                double h = hamiltonian(z);
                double delta = Double.isNaN(h) ? Double.NEGATIVE_INFINITY : h0 - h;
                if (direction == 0) {
                    direction = delta > logTarget ? 1 : -1;
                } else if (direction == 1 ? !(delta > logTarget) : !(delta < logTarget)) {
                    break;
                }
                stepSize = direction == 1 ? 2 * stepSize : 0.5 * stepSize;
                if (stepSize > 1e7 || stepSize < 1e-12) {
                    stepSize = Math.min(Math.max(stepSize, 1e-12), 1e7);
                    break;
                }
            }
            z.copyFrom(start, block, first);
        }

        private void drawMomentum(PhasePoint point) {
            for (int i = 0; i < d; i++) {
                point.p[i] = normal.sample(rng) / Math.sqrt(inverseMetric[i]);
            }
        }

        /** H = -log p(q) + p' M^-1 p / 2; +infinity where the density is not finite. */
        private double hamiltonian(PhasePoint point) {
            if (!Double.isFinite(point.logp)) {
                return Double.POSITIVE_INFINITY;
            }
            double k = 0;
            for (int i = 0; i < d; i++) {
                k += point.p[i] * point.p[i] * inverseMetric[i];
            }
            return -point.logp + 0.5 * k;
        }

        private void sharp(PhasePoint point, double[] out) {
            for (int i = 0; i < d; i++) {
                out[i] = inverseMetric[i] * point.p[i];
            }
        }

        /** One leapfrog step of size eps (negative: backwards in time). Modifies the point. */
        private void leapfrog(PhasePoint point, double eps) {
            double half = 0.5 * eps;
            for (int i = 0; i < d; i++) {
                point.p[i] += half * point.grad[i];
            }
            for (int i = 0; i < d; i++) {
                point.q[block[i]] += eps * inverseMetric[i] * point.p[i];
            }
            evaluate(point);
            for (int i = 0; i < d; i++) {
                point.p[i] += half * point.grad[i];
            }
        }

        /** Log density and the block's gradient at point.q; a non-finite value or gradient gives -infinity. */
        private void evaluate(PhasePoint point) {
            double lp = target.logDensityAndGradient(point.q, fullGradient);
            boolean finite = Double.isFinite(lp);
            for (int i = 0; i < d; i++) {
                double g = fullGradient[block[i]];
                finite &= Double.isFinite(g);
                point.grad[i] = g;
            }
            if (!finite) {
                point.logp = Double.NEGATIVE_INFINITY;
                java.util.Arrays.fill(point.grad, 0);
            } else {
                point.logp = lp;
            }
        }

        private static boolean noUTurn(double[] pSharpMinus, double[] pSharpPlus, double[] rhoSum) {
            double a = 0, b = 0;
            for (int i = 0; i < rhoSum.length; i++) {
                a += pSharpPlus[i] * rhoSum[i];
                b += pSharpMinus[i] * rhoSum[i];
            }
            return a > 0 && b > 0;
        }

        private static double logSumExp(double a, double b) {
            if (a == Double.NEGATIVE_INFINITY) {
                return b;
            }
            if (b == Double.NEGATIVE_INFINITY) {
                return a;
            }
            double max = Math.max(a, b);
            return max + Math.log1p(Math.exp(-Math.abs(a - b)));
        }
    }
}
