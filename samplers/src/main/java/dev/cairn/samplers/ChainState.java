package dev.cairn.samplers;

import java.util.Arrays;

/**
 * The mutable state of one chain: its current unconstrained point and the target's log density there.
 * Made per chain and never shared between threads.
 */
public final class ChainState {
    private final Target target;
    private final double[] point;
    private double logDensity;
    private boolean stale;

    ChainState(Target target, double[] start) {
        this.target = target;
        this.point = start.clone();
        this.logDensity = evaluate(target, this.point);
    }

    /**
     * A state for {@code target} at the unconstrained point {@code start} (copied), its density evaluated.
     *
     * @param target the density
     * @param start  the point, one value per coordinate
     * @return the state
     * @throws IllegalArgumentException when start has the wrong length
     */
    public static ChainState of(Target target, double[] start) {
        if (start.length != target.parameters().size()) {
            throw new IllegalArgumentException("start has " + start.length + " values, target has "
                    + target.parameters().size());
        }
        return new ChainState(target, start);
    }

    /**
     * {@return the density this state follows}
     */
    public Target target() {
        return target;
    }

    /** {@return the current point, live: steps change it in place and then call {@link #accept} or {@link #refresh}} */
    public double[] point() {
        return point;
    }

    /**
     * The target's log density at the current point (recomputed first if a step {@link #invalidate() left it
     * stale}).
     *
     * @return the log density, -infinity outside the support
     */
    public double logDensity() {
        if (stale) {
            refresh();
        }
        return logDensity;
    }

    /**
     * Records the density of the point a step has just moved to.
     *
     * @param newLogDensity the target's log density at the current point
     */
    public void accept(double newLogDensity) {
        this.logDensity = newLogDensity;
        this.stale = false;
    }

    /** Recomputes the density after a step that changed the point without evaluating it. */
    public void refresh() {
        this.logDensity = evaluate(target, point);
        this.stale = false;
    }

    /**
     * Marks the recorded density as out of date after a step that moved the point without knowing the target's
     * density there; it is recomputed when next asked for, so steps that never ask cost nothing.
     */
    public void invalidate() {
        this.stale = true;
    }

    /** Evaluates the target, mapping NaN to -infinity so a bad region is simply rejected. */
    static double evaluate(Target target, double[] x) {
        double lp = target.logDensity(x);
        return Double.isNaN(lp) ? Double.NEGATIVE_INFINITY : lp;
    }

    @Override
    public String toString() {
        return "ChainState" + Arrays.toString(point) + " logDensity=" + logDensity;
    }
}
