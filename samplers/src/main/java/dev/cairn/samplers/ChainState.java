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

    ChainState(Target target, double[] start) {
        this.target = target;
        this.point = start.clone();
        this.logDensity = evaluate(target, this.point);
    }

    /** A state for {@code target} at the unconstrained point {@code start} (copied), its density evaluated. */
    public static ChainState of(Target target, double[] start) {
        if (start.length != target.parameters().size()) {
            throw new IllegalArgumentException("start has " + start.length + " values, target has "
                    + target.parameters().size());
        }
        return new ChainState(target, start);
    }

    public Target target() {
        return target;
    }

    /** The current point, live: steps change it in place and then call {@link #accept} or {@link #refresh}. */
    public double[] point() {
        return point;
    }

    public double logDensity() {
        return logDensity;
    }

    /** Records the density of the point a step has just moved to. */
    public void accept(double newLogDensity) {
        this.logDensity = newLogDensity;
    }

    /** Recomputes the density after a step that changed the point without evaluating it. */
    public void refresh() {
        this.logDensity = evaluate(target, point);
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
