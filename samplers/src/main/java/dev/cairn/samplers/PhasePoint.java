package dev.cairn.samplers;

/**
 * A point in phase space: position (full vector; only the block's coordinates ever differ between the
 * points of one updater), momentum and gradient (on the block), log density.
 */
final class PhasePoint {
    final double[] q;
    final double[] p;
    final double[] grad;
    double logp;

    PhasePoint(int full, int block) {
        q = new double[full];
        p = new double[block];
        grad = new double[block];
    }

    /** Copies o's block coordinates (all of q when block is null and first < 0), momentum and gradient. */
    void copyFrom(PhasePoint o, int[] block, int first) {
        if (first >= 0) {
            System.arraycopy(o.q, first, q, first, p.length);
        } else {
            for (int i : block) {
                q[i] = o.q[i];
            }
        }
        System.arraycopy(o.p, 0, p, 0, p.length);
        System.arraycopy(o.grad, 0, grad, 0, grad.length);
        logp = o.logp;
    }
}
