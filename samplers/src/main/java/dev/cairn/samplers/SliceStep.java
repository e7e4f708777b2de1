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

    /** Slice updates of every coordinate with initial width {@code width}. */
    public static SliceStep of(double width) {
        return of(width, null);
    }

    /** Slice updates of the given coordinates (all when null or empty). */
    public static SliceStep of(double width, int[] coordinates) {
        return of(width, coordinates, 64);
    }

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
    public Updater start(Target target) {
        return new SliceUpdater(Coordinates.resolve(coordinates, target), initialWidth, maxStepsOut);
    }

    /** Per-chain slice state: the current widths and the warmup statistics behind them. */
    public static final class SliceUpdater implements Updater {
        private static final int MIN_UPDATES_BEFORE_ADAPTING = 10;
        private static final int MAX_SHRINKS = 10_000;
        private final int[] coordinates;
        private final double[] width;
        private final double[] jumpSum;
        private final long[] jumps;
        private final int maxStepsOut;

        SliceUpdater(int[] coordinates, double initialWidth, int maxStepsOut) {
            this.coordinates = coordinates;
            this.maxStepsOut = maxStepsOut;
            this.width = new double[coordinates.length];
            java.util.Arrays.fill(width, initialWidth);
            this.jumpSum = new double[coordinates.length];
            this.jumps = new long[coordinates.length];
        }

        /** The current width of the k-th coordinate this updater moves. */
        public double width(int k) {
            return width[k];
        }

        @Override
        public void update(ChainState state, UniformRandomProvider rng, boolean adapt) {
            double[] x = state.point();
            Target target = state.target();
            for (int k = 0; k < coordinates.length; k++) {
                int i = coordinates[k];
                double x0 = x[i];
                double w = width[k];
                double level = state.logDensity() + Math.log(rng.nextDouble()); // f(x0) - Exp(1)

                double left = x0 - w * rng.nextDouble();
                double right = left + w;
                int stepsLeft = (int) (maxStepsOut * rng.nextDouble());
                int stepsRight = maxStepsOut - 1 - stepsLeft;
                while (stepsLeft > 0 && densityAt(target, x, i, left) > level) {
                    left -= w;
                    stepsLeft--;
                }
                while (stepsRight > 0 && densityAt(target, x, i, right) > level) {
                    right += w;
                    stepsRight--;
                }

                double x1;
                double f1;
                int shrinks = 0;
                while (true) {
                    x1 = left + rng.nextDouble() * (right - left);
                    f1 = densityAt(target, x, i, x1);
                    if (f1 > level) {
                        break;
                    }
                    if (x1 < x0) {
                        left = x1;
                    } else {
                        right = x1;
                    }
                    if (++shrinks > MAX_SHRINKS || right - left <= Math.ulp(x0)) {
                        // The slice has collapsed onto x0: the density is degenerate here. Stay put.
                        x1 = x0;
                        f1 = state.logDensity();
                        break;
                    }
                }
                x[i] = x1;
                state.accept(f1);
                if (adapt) {
                    jumpSum[k] += Math.abs(x1 - x0);
                    jumps[k]++;
                    if (jumps[k] >= MIN_UPDATES_BEFORE_ADAPTING && jumpSum[k] > 0) {
                        width[k] = 2.0 * jumpSum[k] / jumps[k];
                    }
                }
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
