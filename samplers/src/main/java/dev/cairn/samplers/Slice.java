package dev.cairn.samplers;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * One univariate slice-sampling update with stepping-out and shrinkage (Neal 2003, Annals of Statistics
 * 31(3), Figures 3 and 5), for models that update coordinates through their own local conditional
 * densities. {@link SliceStep} uses it for whole targets.
 */
public final class Slice {
    private static final int MAX_SHRINKS = 10_000;

    private Slice() {
    }

    /**
     * A new value from the slice of {@code logDensity} through {@code x0}.
     *
     * @param logDensity the (unnormalised) log density of the coordinate; -infinity or NaN outside its support
     * @param x0         the current value
     * @param logDensityAtX0 logDensity(x0), already known
     * @param width      the stepping-out width, > 0
     * @param maxSteps   the most steps out, in both directions together
     * @param rng        the chain's random stream
     * @param out        receives {new value, its log density}
     */
    public static void sample(DoubleUnaryOperator logDensity, double x0, double logDensityAtX0, double width,
                              int maxSteps, UniformRandomProvider rng, double[] out) {
        double level = logDensityAtX0 + Math.log(rng.nextDouble());
        double left = x0 - width * rng.nextDouble();
        double right = left + width;
        int stepsLeft = (int) (maxSteps * rng.nextDouble());
        int stepsRight = maxSteps - 1 - stepsLeft;
        while (stepsLeft > 0 && density(logDensity, left) > level) {
            left -= width;
            stepsLeft--;
        }
        while (stepsRight > 0 && density(logDensity, right) > level) {
            right += width;
            stepsRight--;
        }
        int shrinks = 0;
        while (true) {
            double x1 = left + rng.nextDouble() * (right - left);
            double f1 = density(logDensity, x1);
            if (f1 > level) {
                out[0] = x1;
                out[1] = f1;
                return;
            }
            if (x1 < x0) {
                left = x1;
            } else {
                right = x1;
            }
            if (++shrinks > MAX_SHRINKS || right - left <= Math.ulp(x0)) {
                // The slice has collapsed onto x0: the density is degenerate here. Stay put.
                out[0] = x0;
                out[1] = logDensityAtX0;
                return;
            }
        }
    }

    private static double density(DoubleUnaryOperator f, double x) {
        double v = f.applyAsDouble(x);
        return Double.isNaN(v) ? Double.NEGATIVE_INFINITY : v;
    }

    /** Per-coordinate stepping-out widths adapted in warmup to twice the mean distance moved. */
    public static final class Widths {
        private static final int MIN_UPDATES_BEFORE_ADAPTING = 10;
        private final double[] width;
        private final double[] jumpSum;
        private final long[] jumps;

        public Widths(int n, double initial) {
            if (!(initial > 0) || Double.isInfinite(initial)) {
                throw new IllegalArgumentException("slice width must be a finite number > 0, was " + initial);
            }
            this.width = new double[n];
            java.util.Arrays.fill(width, initial);
            this.jumpSum = new double[n];
            this.jumps = new long[n];
        }

        /**
         * The current width of coordinate k.
         *
         * @param k the coordinate's position
         * @return the width
         */
        public double get(int k) {
            return width[k];
        }

        /**
         * Records a move of coordinate k during warmup (no effect when {@code adapt} is false).
         *
         * @param k        the coordinate's position
         * @param distance how far the update moved it
         * @param adapt    whether the chain is in warmup
         */
        public void record(int k, double distance, boolean adapt) {
            if (!adapt) {
                return;
            }
            jumpSum[k] += Math.abs(distance);
            jumps[k]++;
            if (jumps[k] >= MIN_UPDATES_BEFORE_ADAPTING && jumpSum[k] > 0) {
                width[k] = 2.0 * jumpSum[k] / jumps[k];
            }
        }
    }
}
