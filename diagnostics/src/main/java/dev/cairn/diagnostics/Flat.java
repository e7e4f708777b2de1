package dev.cairn.diagnostics;

/**
 * Draws of m chains of length n stored one chain after the other in one array: chain c occupies
 * values[c n .. (c + 1) n). The diagnostics work on this layout to avoid copying chain by chain.
 */
record Flat(double[] values, int chains, int length) {

    static Flat of(double[][] chains) {
        return new Flat(Chains.pool(chains), chains.length, chains[0].length);
    }

    /** Each chain cut into halves (the middle draw of an odd-length chain left out): 2m chains of n/2. */
    static Flat split(double[][] chains) {
        int n = chains[0].length;
        int half = n / 2;
        double[] out = new double[2 * chains.length * half];
        for (int c = 0; c < chains.length; c++) {
            System.arraycopy(chains[c], 0, out, 2 * c * half, half);
            System.arraycopy(chains[c], n - half, out, (2 * c + 1) * half, half);
        }
        return new Flat(out, 2 * chains.length, half);
    }

    double mean(int chain) {
        double s = 0;
        for (int i = chain * length, end = i + length; i < end; i++) {
            s += values[i];
        }
        return s / length;
    }

    /** Sample variance (divisor n - 1) of one chain. */
    double variance(int chain) {
        double mean = mean(chain);
        double s = 0;
        for (int i = chain * length, end = i + length; i < end; i++) {
            double d = values[i] - mean;
            s += d * d;
        }
        return s / (length - 1);
    }

    /** The same layout with every value replaced. */
    Flat with(double[] newValues) {
        return new Flat(newValues, chains, length);
    }
}
