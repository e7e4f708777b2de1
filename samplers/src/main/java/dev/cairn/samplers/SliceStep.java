package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * Univariate slice sampling, one coordinate at a time, with stepping-out and shrinkage
 * (Neal 2003, "Slice sampling", Annals of Statistics 31(3):705-767, Figures 3 and 5).
 *
 * <p>For coordinate i at x0 with log density f: draw the slice level y = f(x0) - E, E ~ Exp(1); place an
 * interval of width w at random around x0; step out by w on each side while the end is inside the slice
 * (at most m steps in all, split at random); then draw uniformly from the interval, shrinking it towards
 * x0 after each rejection. The update leaves the target invariant for any fixed w.
 *
 * <p>Width adaptation (warmup only): each coordinate's width is set to twice the running mean of the
 * distance its updates moved, which tracks the typical size of the slice. It is frozen for kept draws,
 * so the kept chain is a fixed, valid slice sampler.
 */
public final class SliceStep implements Step {
    private final int[] coordinates;
    private final double initialWidth;
    private final int maxStepsOut;

    private SliceStep(int[] coordinates, double initialWidth, int maxStepsOut) {
        this.coordinates = coordinates;
        this.initialWidth = initialWidth;
        this.maxStepsOut = maxStepsOut;
    }

    /**
     * Slice updates of every coordinate with initial width {@code width}.
     *
     * @param width the initial width, a finite number > 0
     * @return the step
     * @throws IllegalArgumentException naming the bad width
     */
    public static SliceStep of(double width) {
        return of(width, null);
    }

    /**
     * Slice updates of the given coordinates (all when null or empty), at most 64 steps out.
     *
     * @param width       the initial width, a finite number > 0
     * @param coordinates the coordinates, or null for all
     * @return the step
     * @throws IllegalArgumentException naming the bad width or coordinate
     */
    public static SliceStep of(double width, int[] coordinates) {
        return of(width, coordinates, 64);
    }

    /**
     * Slice updates of the given coordinates with a limit on stepping out.
     *
     * @param width       the initial width, a finite number > 0
     * @param coordinates the coordinates, or null for all
     * @param maxStepsOut the most steps out per update, >= 1
     * @return the step
     * @throws IllegalArgumentException naming the bad value
     */
    public static SliceStep of(double width, int[] coordinates, int maxStepsOut) {
        if (!(width > 0) || Double.isInfinite(width)) {
            throw new IllegalArgumentException("slice width must be a finite number > 0, was " + width);
        }
        if (maxStepsOut < 1) {
            throw new IllegalArgumentException("maxStepsOut must be >= 1, was " + maxStepsOut);
        }
        return new SliceStep(Coordinates.checked(coordinates), width, maxStepsOut);
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new SliceUpdater(Coordinates.resolve(coordinates, target), initialWidth, maxStepsOut, stream);
    }

    /** Per-chain slice state: the current widths and the warmup statistics behind them. */
    public static final class SliceUpdater implements Updater {
        private final int[] coordinates;
        private final Slice.Widths widths;
        private final int maxStepsOut;
        private final double[] result = new double[2];

        private final UniformRandomProvider stream;

        SliceUpdater(int[] coordinates, double initialWidth, int maxStepsOut, UniformRandomProvider stream) {
            this.stream = stream;
            this.coordinates = coordinates;
            this.maxStepsOut = maxStepsOut;
            this.widths = new Slice.Widths(coordinates.length, initialWidth);
        }

        /**
         * The current width of the k-th coordinate this updater moves.
         *
         * @param k the coordinate's position in the step's block
         * @return the width
         */
        public double width(int k) {
            return widths.get(k);
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            Target target = state.target();
            for (int k = 0; k < coordinates.length; k++) {
                int i = coordinates[k];
                double x0 = x[i];
                Slice.sample(v -> densityAt(target, x, i, v), x0, state.logDensity(), widths.get(k), maxStepsOut, stream,
                        result);
                x[i] = result[0];
                state.accept(result[1]);
                widths.record(k, result[0] - x0, adapt);
            }
        }

        private static double densityAt(Target target, double[] x, int i, double value) {
            double saved = x[i];
            x[i] = value;
            double lp = ChainState.evaluate(target, x);
            x[i] = saved;
            return lp;
        }
    }
}
