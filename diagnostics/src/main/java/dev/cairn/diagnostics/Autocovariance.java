package dev.cairn.diagnostics;

import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Autocovariances of chains by zero-padded FFT (Wiener-Khinchin): the centred chain is padded with zeros
 * to a power of two of at least 2N, so the circular correlation equals the linear one at every lag. Two
 * real chains travel in one complex transform (real and imaginary parts) and are separated by the
 * conjugate symmetry of real signals; their power spectra travel back together the same way.
 *
 * <p>gamma_t = (1/N) sum_{i=1}^{N-t} (x_i - xbar)(x_{i+t} - xbar), the biased estimate used by Geyer (1992)
 * and Vehtari et al. (2021).
 */
final class Autocovariance {
    private Autocovariance() {
    }

    /** Autocovariances at every lag 0..N-1 of each chain (all of the same length). */
    static double[][] of(double[][] chains) {
        return of(Flat.of(chains), 0);
    }

    /**
     * Autocovariances from transforms of length {@code size} (a power of two; raised to at least 2N - 1
     * when smaller than N + 1). With zero padding to L, lags 0..L-N are exact; only those are returned.
     */
    static double[][] of(Flat chains, int size) {
        int m = chains.chains();
        int n = chains.length();
        int length = size < n + 1 ? Integer.highestOneBit(Math.max(1, 2 * n - 1)) << 1 : size;
        int lags = Math.min(n, length - n + 1);
        double[][] out = new double[m][];
        for (int c = 0; c + 1 < m; c += 2) {
            double[][] pair = pair(chains, c, c + 1, length, lags);
            out[c] = pair[0];
            out[c + 1] = pair[1];
        }
        if (m % 2 == 1) {
            out[m - 1] = pair(chains, m - 1, -1, length, lags)[0];
        }
        return out;
    }

    /**
     * Autocovariances at lags 0..lags-1 of each chain, summed directly (cheaper than a transform for a few
     * lags). Eight lags are summed in one pass, each into its own accumulator in the same order as a
     * lag-by-lag loop (so the sums are bit for bit the same), which keeps the processor's adders busy
     * instead of waiting on one running sum.
     */
    static double[][] direct(Flat chains, int lags) {
        int m = chains.chains();
        int n = chains.length();
        double[] v = chains.values();
        double[] centred = new double[n];
        double[][] out = new double[m][lags];
        for (int c = 0; c < m; c++) {
            double mean = chains.mean(c);
            for (int i = 0, k = c * n; i < n; i++, k++) {
                centred[i] = v[k] - mean;
            }
            for (int first = 0; first < lags; first += 8) {
                int group = Math.min(8, lags - first);
                if (group == 8) {
                    eight(centred, n, first, out[c]);
                } else {
                    for (int t = first; t < first + group; t++) {
                        double s = 0;
                        for (int i = 0; i + t < n; i++) {
                            s += centred[i] * centred[i + t];
                        }
                        out[c][t] = s / n;
                    }
                }
            }
        }
        return out;
    }

    /** Lags first..first+7 in one pass (out modified at those lags). */
    private static void eight(double[] x, int n, int first, double[] out) {
        double s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0, s6 = 0, s7 = 0;
        int common = n - first - 7; // i below it has every lag's partner
        int i = 0;
        for (; i < common; i++) {
            double a = x[i];
            int j = i + first;
            s0 += a * x[j];
            s1 += a * x[j + 1];
            s2 += a * x[j + 2];
            s3 += a * x[j + 3];
            s4 += a * x[j + 4];
            s5 += a * x[j + 5];
            s6 += a * x[j + 6];
            s7 += a * x[j + 7];
        }
        double[] s = {s0, s1, s2, s3, s4, s5, s6, s7};
        for (int t = 0; t < 8; t++) {
            double sum = s[t];
            for (int k = Math.max(i, 0); k + first + t < n; k++) {
                sum += x[k] * x[k + first + t];
            }
            out[first + t] = sum / n;
        }
    }

    private static double[][] pair(Flat chains, int a, int b, int size, int lags) {
        int n = chains.length();
        double[] v = chains.values();
        double[][] data = buffer(size);
        double meanA = chains.mean(a);
        for (int i = 0, k = a * n; i < n; i++, k++) {
            data[0][i] = v[k] - meanA;
        }
        java.util.Arrays.fill(data[0], n, size, 0.0);
        if (b >= 0) {
            double meanB = chains.mean(b);
            for (int i = 0, k = b * n; i < n; i++, k++) {
                data[1][i] = v[k] - meanB;
            }
            java.util.Arrays.fill(data[1], n, size, 0.0);
        } else {
            java.util.Arrays.fill(data[1], 0.0);
        }
        FastFourierTransformer.transformInPlace(data, DftNormalization.STANDARD, TransformType.FORWARD);
        // Z = A + iB for the spectra A, B of the two real signals: A_k = (Z_k + conj Z_{-k}) / 2,
        // B_k = (Z_k - conj Z_{-k}) / 2i, hence |A_k|^2 and |B_k|^2 below. Indices k and -k are handled
        // together so the power spectra can overwrite the data in place.
        double[] re = data[0];
        double[] im = data[1];
        for (int k = 0; k <= size / 2; k++) {
            int j = (size - k) & (size - 1);
            double zr = re[k], zi = im[k];
            double wr = re[j], wi = -im[j]; // conj Z_{-k}
            double ar = (zr + wr) / 2, ai = (zi + wi) / 2;
            double br = (zi - wi) / 2, bi = -(zr - wr) / 2;
            double powerA = ar * ar + ai * ai;
            double powerB = br * br + bi * bi;
            // Power spectra of real signals are symmetric: P_k = P_{-k}.
            re[k] = powerA;
            im[k] = powerB;
            re[j] = powerA;
            im[j] = powerB;
        }
        double[][] power = data;
        FastFourierTransformer.transformInPlace(power, DftNormalization.STANDARD, TransformType.INVERSE);
        double[] ga = new double[lags];
        double[] gb = b < 0 ? null : new double[lags];
        for (int t = 0; t < lags; t++) {
            ga[t] = power[0][t] / n;
            if (gb != null) {
                gb[t] = power[1][t] / n;
            }
        }
        return new double[][] {ga, gb};
    }

    /** Per-thread transform buffers, reused: diagnostics of many parameters run in parallel. */
    private static final ThreadLocal<double[][]> BUFFER = new ThreadLocal<>();

    private static double[][] buffer(int size) {
        double[][] b = BUFFER.get();
        if (b == null || b[0].length != size) {
            b = new double[2][size];
            BUFFER.set(b);
        }
        return b;
    }

    static double mean(double[] x) {
        double s = 0;
        for (double v : x) {
            s += v;
        }
        return s / x.length;
    }
}
