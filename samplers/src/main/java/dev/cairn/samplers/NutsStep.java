package dev.cairn.samplers;

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
    /** Energy error beyond which a trajectory is called divergent (common practice). */
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
    public Updater start(Target target, org.apache.commons.rng.UniformRandomProvider stream) {
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
                conditional != null, stream);
    }
}
