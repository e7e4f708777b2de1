package dev.cairn.models.segmented;

/**
 * A Gaussian over one segment's coordinates u = (level, effect_k for k not the control) whose precision is a
 * prior precision plus a likelihood precision in the cell values v_control = level, v_k = level + effect_k:
 * <pre>
 *   H = diag(lambda) + B' diag(w) B
 *   H[c][c] = lambda_c + sum_k w_k,   H[k][k] = lambda_k + w_k,   H[c][k] = H[k][c] = w_k   (k != c)
 * </pre>
 * (c the control position, which holds the level). H is an "arrow" matrix, so its Cholesky factor, solves,
 * determinant and Gaussian draws cost O(arms). Ordering the effects first and the level last, H = L L' with
 * L[k][k] = sqrt(H[k][k]), L[c][k] = w_k / sqrt(H[k][k]) and L[c][c] = sqrt(pivot), where the pivot is
 * computed without cancellation as
 * <pre>
 *   pivot = H[c][c] - sum_k w_k^2 / H[k][k] = lambda_c + w_c + sum_k w_k lambda_k / (lambda_k + w_k).
 * </pre>
 * Mutable and reused: {@link #set} replaces the matrix; the arrays passed in are not kept.
 */
final class SegmentGaussian {
    private final int arms;
    private final int control;
    private final double[] diagonal;
    private final double[] offDiagonal;
    private double hub;
    private double pivot;

    /**
     * @param arms    the number of arms (the dimension)
     * @param control the position of the level
     */
    SegmentGaussian(int arms, int control) {
        this.arms = arms;
        this.control = control;
        this.diagonal = new double[arms];
        this.offDiagonal = new double[arms];
    }

    /**
     * Sets H from the prior precisions and the cells' likelihood precisions.
     *
     * @param lambda per position, the prior precision of the level (at c) or of effect k; each > 0 (not modified)
     * @param w      per arm, the likelihood precision of cell value v_k; each >= 0 (not modified)
     */
    void set(double[] lambda, double[] w) {
        double sum = w[control];
        double p = lambda[control] + w[control];
        for (int k = 0; k < arms; k++) {
            if (k == control) {
                continue;
            }
            diagonal[k] = lambda[k] + w[k];
            offDiagonal[k] = w[k];
            sum += w[k];
            p += w[k] * (lambda[k] / diagonal[k]);
        }
        hub = lambda[control] + sum;
        pivot = p;
    }

    /**
     * Solves H x = b.
     *
     * @param b   the right-hand side (not modified)
     * @param out the solution (modified; may be b)
     */
    void solve(double[] b, double[] out) {
        double r = b[control];
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                r -= offDiagonal[k] * b[k] / diagonal[k];
            }
        }
        double level = r / pivot;
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                out[k] = (b[k] - offDiagonal[k] * level) / diagonal[k];
            }
        }
        out[control] = level;
    }

    /**
     * A draw of N(0, H^-1) from independent standard normals: z = L'^-1 eps.
     *
     * @param eps standard normals, one per position (not modified)
     * @param out the draw (modified; may be eps)
     */
    void whiten(double[] eps, double[] out) {
        double level = eps[control] / Math.sqrt(pivot);
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                double s = Math.sqrt(diagonal[k]);
                out[k] = (eps[k] - offDiagonal[k] / s * level) / s;
            }
        }
        out[control] = level;
    }

    /**
     * @param d a vector over the positions (not modified)
     * @return d' H d
     */
    double quadratic(double[] d) {
        double q = hub * d[control] * d[control];
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                q += diagonal[k] * d[k] * d[k] + 2 * offDiagonal[k] * d[k] * d[control];
            }
        }
        return q;
    }

    /** {@return log det H} */
    double logDeterminant() {
        double s = Math.log(pivot);
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                s += Math.log(diagonal[k]);
            }
        }
        return s;
    }
}
