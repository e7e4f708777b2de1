package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * The per-chain half of a {@link NutsStep}: the adapted step size and metric ({@link Hamiltonian}), the
 * trajectory (tree building with the generalised no-U-turn criterion, multinomial sampling) and its scratch
 * vectors, allocated once per chain. Not thread-safe.
 */
public final class NutsUpdater implements Step.Updater {
    private final Hamiltonian ham;
    private final int[] block;
    private final int maxDepth;
    private final int d;
    private final StepSizeAdaptation stepSizes;
    private final MetricAdaptation metric;
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
    private final UniformRandomProvider rng;
    // per-transition bookkeeping
    private int leapfrogs;
    private double sumAcceptance;
    private boolean divergent;
    private long divergences;
    private long transitions;
    private long totalLeapfrogs;
    private int lastDepth;
    /** Metric windows closed so far: trajectories are capped before the first and until the third. */
    private int windowsClosed;
    /**
     * Tree depth at most while warmup still runs on the first metric guess: chains far out in the tails with
     * an unadapted metric otherwise spend the first iterations on 1,023-step trajectories. Any depth keeps
     * the target invariant; kept draws use the full depth.
     */
    static final int FIRST_PHASE_DEPTH = 6;
    /**
     * Tree depth at most until the third metric window closes (iteration 250 of the windowed schedule for 1,000
     * warmup iterations): while the metric is still a rough estimate, a trajectory that needs more than 255
     * steps says the metric is wrong, not that the posterior needs them. The later, longer windows and the
     * final step-size phase run at full depth, so adaptation ends on the trajectories the kept draws use.
     */
    static final int WARMUP_DEPTH = 8;
    private final boolean partial;
    private final int first;

    NutsUpdater(GradientTarget target, int[] block, int warmup, int maxDepth, double targetAcceptance,
                boolean partial, UniformRandomProvider stream) {
        this.rng = stream;
        this.ham = new Hamiltonian(target, block, stream);
        this.partial = partial;
        this.first = ham.first;
        this.block = block;
        this.maxDepth = maxDepth;
        this.d = block.length;
        int full = target.parameters().size();
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

    /** {@return the current leapfrog step size} */
    public double stepSize() {
        return stepSize;
    }

    /** {@return the current diagonal inverse metric (the estimated posterior variances), a copy} */
    public double[] inverseMetric() {
        return ham.inverseMetric.clone();
    }

    /** {@return transitions so far whose trajectory ended in a divergence} */
    public long divergences() {
        return divergences;
    }

    /** {@return mean number of leapfrog steps per transition so far} */
    public double meanLeapfrogs() {
        return transitions == 0 ? 0 : (double) totalLeapfrogs / transitions;
    }

    /** {@return tree depth of the last transition} */
    public int lastDepth() {
        return lastDepth;
    }

    @Override
    public void update(ChainState state, boolean adapt) {
        double[] x = state.point();
        for (PhasePoint point : allPoints) {
            System.arraycopy(x, 0, point.q, 0, x.length);
        }
        ham.evaluate(z);
        if (!Double.isFinite(z.logp)) {
            return; // the chain's point is outside the support: nothing to move from (the chain start forbids it)
        }
        if (!initialised) {
            initialised = true;
            if (adapt) {
                ham.curvatureMetric(x);
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
            if (metric.record(x, block, ham.inverseMetric)) {
                windowsClosed++;
                System.arraycopy(x, 0, z.q, 0, x.length);
                ham.evaluate(z);
                findStepSize();
                stepSizes.restart(stepSize);
            }
        }
    }

    /** One NUTS transition from z; leaves the chosen point in {@code sample}; returns the acceptance statistic. */
    private double transition() {
        ham.drawMomentum(z);
        double h0 = ham.energy(z);
        forward.copyFrom(z, block, first);
        backward.copyFrom(z, block, first);
        sample.copyFrom(z, block, first);
        propose.copyFrom(z, block, first);
        ham.sharp(z, pSharpFwdFwd);
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
        int depthLimit = !adapting || windowsClosed >= 3 ? maxDepth
                : Math.min(maxDepth, windowsClosed == 0 ? FIRST_PHASE_DEPTH : WARMUP_DEPTH);
        while (depth < depthLimit) {
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
            logSumWeight = Hamiltonian.logSumExp(logSumWeight, subtreeWeight[0]);
            for (int i = 0; i < d; i++) {
                rho[i] = rhoBck[i] + rhoFwd[i];
            }
            boolean persist = Hamiltonian.noUTurn(pSharpBckBck, pSharpFwdFwd, rho);
            for (int i = 0; i < d; i++) {
                rhoExtended[i] = rhoBck[i] + pFwdBck[i];
            }
            persist &= Hamiltonian.noUTurn(pSharpBckBck, pSharpFwdBck, rhoExtended);
            for (int i = 0; i < d; i++) {
                rhoExtended[i] = rhoFwd[i] + pBckFwd[i];
            }
            persist &= Hamiltonian.noUTurn(pSharpBckFwd, pSharpFwdFwd, rhoExtended);
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
            ham.leapfrog(z, sign * stepSize);
            leapfrogs++;
            double h = ham.energy(z);
            if (Double.isNaN(h)) {
                h = Double.POSITIVE_INFINITY;
            }
            if (h - h0 > NutsStep.MAX_ENERGY_ERROR) {
                divergent = true;
            }
            logWeight[0] = Hamiltonian.logSumExp(logWeight[0], h0 - h);
            sumAcceptance += h0 - h > 0 ? 1 : Math.exp(h0 - h);
            proposal.copyFrom(z, block, first);
            ham.sharp(z, pSharpBeg);
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
        double subtree = Hamiltonian.logSumExp(initWeight[0], finalWeight[0]);
        logWeight[0] = Hamiltonian.logSumExp(logWeight[0], subtree);
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
        boolean persist = Hamiltonian.noUTurn(pSharpBeg, pSharpEnd, ext);
        for (int i = 0; i < d; i++) {
            ext[i] = rInit[i] + pFinalBeg[depth][i];
        }
        persist &= Hamiltonian.noUTurn(pSharpBeg, pSharpFinalBeg[depth], ext);
        for (int i = 0; i < d; i++) {
            ext[i] = rFinal[i] + pInitEnd[depth][i];
        }
        persist &= Hamiltonian.noUTurn(pSharpInitEnd[depth], pSharpEnd, ext);
        return persist;
    }



    /** Doubles or halves the step size until one leapfrog step's acceptance crosses 0.8 (common practice). */
    private void findStepSize() {
        start.copyFrom(z, block, first);
        double logTarget = Math.log(0.8);
        int direction = 0;
        for (int attempt = 0; attempt < 100; attempt++) {
            z.copyFrom(start, block, first);
            ham.drawMomentum(z);
            double h0 = ham.energy(z);
            ham.leapfrog(z, stepSize);
            double h = ham.energy(z);
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














}
