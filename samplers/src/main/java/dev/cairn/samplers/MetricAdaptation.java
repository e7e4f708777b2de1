package dev.cairn.samplers;

/**
 * The warmup schedule of a diagonal mass matrix in windows (common practice for NUTS): an initial fast phase
 * (step size only), then slow windows of doubling length in which the variance of each coordinate is
 * estimated (Welford), and a final fast phase in which only the step size moves. After each slow window
 * the inverse metric becomes the regularised variance (n/(n + 5)) var + 1e-3 (5/(n + 5)), which keeps it
 * positive and pulls small windows towards the unit metric. Default buffers: 75 initial, 25 first window,
 * 50 final; a shorter warmup scales them to 15% / 75% / 10%. Per chain, mutable.
 */
final class MetricAdaptation {
    private final int warmup;
    private final int initialBuffer;
    private final int finalBuffer;
    private final double[] mean;
    private final double[] m2;
    private int count;
    private int windowEnd;
    private int windowSize;
    private int iteration;

    MetricAdaptation(int dimension, int warmup) {
        this.warmup = warmup;
        int init = 75, first = 25, term = 50;
        if (warmup < 20) {
            init = warmup;
            first = 0;
            term = 0;
        } else if (init + first + term > warmup) {
            init = (int) (0.15 * warmup);
            term = (int) (0.1 * warmup);
            first = warmup - init - term;
        }
        this.initialBuffer = init;
        this.finalBuffer = term;
        this.windowSize = first;
        this.windowEnd = init + first;
        this.mean = new double[dimension];
        this.m2 = new double[dimension];
    }

    /**
     * Records the point after a warmup iteration; when a slow window closes, writes the new inverse metric
     * into {@code inverseMetric} (modified) and returns true.
     */
    boolean record(double[] point, int[] block, double[] inverseMetric) {
        int it = iteration++;
        if (windowSize == 0 || it < initialBuffer || it >= warmup - finalBuffer) {
            return false;
        }
        count++;
        for (int b = 0; b < block.length; b++) {
            double v = point[block[b]];
            double delta = v - mean[b];
            mean[b] += delta / count;
            m2[b] += delta * (v - mean[b]);
        }
        if (it + 1 < windowEnd) {
            return false;
        }
        double n = count;
        for (int b = 0; b < block.length; b++) {
            double variance = count > 1 ? m2[b] / (n - 1) : 1;
            inverseMetric[b] = (n / (n + 5)) * variance + 1e-3 * (5 / (n + 5));
        }
        java.util.Arrays.fill(mean, 0);
        java.util.Arrays.fill(m2, 0);
        count = 0;
        windowSize *= 2;
        int nextEnd = windowEnd + windowSize;
        // a window that would run into the final buffer (or leave less than a doubled window before it) is
        // merged into this one
        if (nextEnd + 2 * windowSize > warmup - finalBuffer) {
            nextEnd = warmup - finalBuffer;
            windowSize = nextEnd - windowEnd;
        }
        windowEnd = nextEnd;
        return true;
    }
}
