package dev.cairn.models.retention;

import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * The Gaussian proposal of {@link LaplaceMetropolis} for one chain: q(theta | sigma) = N(mu, P^-1) with
 * P = H0 + Q(sigma) and P mu = H0 theta0 + g0 + b, from the likelihood's expansion at theta0 (gradient g0,
 * negative Hessian H0) and the prior's Gaussian part given the drift scales. Theta's positions interleave the
 * series (L_c at 2c, S_c at 2c + 1) with the offsets and log kappa last, so P is banded with an arrow head and
 * its sparse Cholesky factor (EJML, structure analysed once) fills in nothing else. Not thread-safe.
 */
final class GaussianProposal {
    /**
     * q at one pair of drift scales: the lower Cholesky factor of its precision (sparse), its mean, sum log L_ii,
     * and the approximate log marginal density of the drift scales there (up to a constant).
     */
    record Gaussian(org.ejml.data.DMatrixSparseCSC lower, double[] mean, double logRootDet, double logMarginal,
                    double logSigmaL, double logSigmaS) {
    }

    private final RetentionPosterior m;
    private final int[] position;
    private final int[] theta;
    private final int d;
    private final ZigguratSampler.NormalizedGaussian normal;
    /** -Hessian of the log likelihood at theta0 (dense d x d, as the expansion writes it) and H0 theta0 + g0. */
    private final double[] h0;
    private final double[] linear;
    /** The prior's constant part: Q without the walks (diagonal) and b. */
    private final double[] priorPrecision;
    private final double[] priorShift;
    /** The precision's pattern (CSC) and, per stored value, its row and column. */
    private final org.ejml.data.DMatrixSparseCSC pattern;
    private final int[] entryRow;
    private final int[] entryColumn;
    /** Where the walks' increments sit in the pattern's values: per cohort c >= 1, (c, c), (c-1, c-1), (c, c-1), (c-1, c). */
    private final int[][] levelWalk;
    private final int[][] slopeWalk;
    /** H0 plus the constant prior diagonal, in the pattern's value order. */
    private final double[] baseValues;
    private final org.ejml.sparse.csc.decomposition.chol.CholeskyUpLooking_DSCC cholesky;
    private final double[] z;

    /**
     * @param model    the posterior
     * @param position each coordinate's position in theta, -1 for the drift scales
     * @param d        theta's length
     * @param normal   the chain's standard normal draws
     */
    GaussianProposal(RetentionPosterior model, int[] position, int d, ZigguratSampler.NormalizedGaussian normal) {
        this.m = model;
        this.position = position;
        this.d = d;
        this.normal = normal;
        theta = new int[d];
        for (int i = 0; i < position.length; i++) {
            if (position[i] >= 0) {
                theta[position[i]] = i;
            }
        }
        h0 = new double[d * d];
        linear = new double[d];
        priorPrecision = new double[d];
        priorShift = new double[d];
        priorPrecision[position[m.level]] = 1 / (m.levelSd() * m.levelSd());
        priorShift[position[m.level]] = m.levelMean() / (m.levelSd() * m.levelSd());
        priorPrecision[position[m.slope]] = 1 / (m.slopeSd() * m.slopeSd());
        priorShift[position[m.slope]] = m.slopeMean() / (m.slopeSd() * m.slopeSd());
        for (int i = m.offLevel; i < m.logSigmaL; i++) {
            priorPrecision[position[i]] = 1 / (RetentionPosterior.OFFSET_SD * RetentionPosterior.OFFSET_SD);
        }
        if (!m.survival) {
            double v = RetentionPosterior.LOG_KAPPA_SD * RetentionPosterior.LOG_KAPPA_SD;
            priorPrecision[position[m.logKappa]] = 1 / v;
            priorShift[position[m.logKappa]] = RetentionPosterior.LOG_KAPPA_MEAN / v;
        }
        int series = 2 * m.cohorts;
        org.ejml.data.DMatrixSparseTriplet triplet = new org.ejml.data.DMatrixSparseTriplet(d, d, 8 * d + 2 * d * (d - series));
        for (int i = 0; i < d; i++) {
            for (int j = 0; j < d; j++) {
                boolean band = i < series && j < series && Math.abs(i - j) <= 2;
                if (band || i >= series || j >= series) {
                triplet.addItem(i, j, 1);
                }
            }
        }
        pattern = org.ejml.ops.DConvertMatrixStruct.convert(triplet, (org.ejml.data.DMatrixSparseCSC) null, null);
        entryRow = new int[pattern.nz_length];
        entryColumn = new int[pattern.nz_length];
        for (int col = 0; col < d; col++) {
            for (int k = pattern.col_idx[col]; k < pattern.col_idx[col + 1]; k++) {
                entryRow[k] = pattern.nz_rows[k];
                entryColumn[k] = col;
            }
        }
        levelWalk = walkEntries(0);
        slopeWalk = walkEntries(1);
        baseValues = new double[pattern.nz_length];
        cholesky = new org.ejml.sparse.csc.decomposition.chol.CholeskyUpLooking_DSCC();
        z = new double[d];
    }

    private int[][] walkEntries(int offset) {
        int[][] out = new int[Math.max(0, m.cohorts - 1)][];
        for (int c = 1; c < m.cohorts; c++) {
            int i = 2 * c + offset, j = 2 * (c - 1) + offset;
            out[c - 1] = new int[] {pattern.nz_index(i, i), pattern.nz_index(j, j), pattern.nz_index(i, j),
                pattern.nz_index(j, i)};
        }
        return out;
    }

    /**
     * The Gaussian q(theta | sigma) at log sigmaL = l, log sigmaS = s; null when its precision is not
     * positive definite or not finite (a move there is rejected).
     */
    Gaussian at(double l, double s) {
        if (!Double.isFinite(l) || !Double.isFinite(s)) {
            return null;
        }
        org.ejml.data.DMatrixSparseCSC p = pattern.copy();
        System.arraycopy(baseValues, 0, p.nz_values, 0, baseValues.length);
        addWalk(p.nz_values, levelWalk, Math.exp(-2 * l));
        addWalk(p.nz_values, slopeWalk, Math.exp(-2 * s));
        if (!cholesky.isStructureLocked()) {
            cholesky.performSymbolic(p);
            cholesky.setStructureLocked(true);
        }
        if (!cholesky.decompose(p)) {
            return null;
        }
        org.ejml.data.DMatrixSparseCSC lower = cholesky.getL().copy();
        double logRootDet = 0;
        for (int i = 0; i < d; i++) {
            double v = lower.get(i, i);
            if (!(v > 0) || !Double.isFinite(v)) {
                return null;
            }
            logRootDet += Math.log(v);
        }
        double[] rhs = new double[d];
        for (int i = 0; i < d; i++) {
            rhs[i] = linear[i] + priorShift[i];
        }
        double[] mean = rhs.clone();
        org.ejml.sparse.csc.misc.TriangularSolver_DSCC.solveL(lower, mean);
        org.ejml.sparse.csc.misc.TriangularSolver_DSCC.solveTranL(lower, mean);
        double quadratic = 0;
        for (int i = 0; i < d; i++) {
            quadratic += mean[i] * rhs[i];
            if (!Double.isFinite(mean[i])) {
                return null;
            }
        }
        // log of p(sigma) times the integral over theta of exp(expansion) p(theta | sigma), up to a constant
        int increments = m.cohorts - 1;
        double logMarginal = RetentionPosterior.DRIFT.logDensityOfLog(l) + RetentionPosterior.DRIFT.logDensityOfLog(s)
                - increments * (l + s) - logRootDet + 0.5 * quadratic;
        return new Gaussian(lower, mean, logRootDet, logMarginal, l, s);
    }

    /** Adds the random walk's precision (1/sigma^2 per increment) at the given entries. */
    private void addWalk(double[] values, int[][] entries, double precision) {
        for (int[] e : entries) {
            values[e[0]] += precision;
            values[e[1]] += precision;
            values[e[2]] -= precision;
            values[e[3]] -= precision;
        }
    }

    /** log q(theta | sigma) at the point's theta, up to the constant -d/2 log(2 pi). */
    double logQ(Gaussian g, double[] x) {
        org.ejml.data.DMatrixSparseCSC lower = g.lower();
        double[] mean = g.mean();
        double sum = 0;
        // w = L' (theta - mu): w_j = sum over column j of L of L_ij (theta_i - mu_i)
        for (int j = 0; j < d; j++) {
            double w = 0;
            for (int k = lower.col_idx[j]; k < lower.col_idx[j + 1]; k++) {
                int i = lower.nz_rows[k];
                w += lower.nz_values[k] * (x[theta[i]] - mean[i]);
            }
            sum += w * w;
        }
        return -0.5 * sum + g.logRootDet();
    }

    /** Writes a draw of theta from q into the point; returns its log q (same constant as {@link #logQ}). */
    double draw(Gaussian g, double[] x) {
        double sum = 0;
        for (int i = 0; i < d; i++) {
            z[i] = normal.sample();
            sum += z[i] * z[i];
        }
        double logQ = -0.5 * sum + g.logRootDet();
        org.ejml.sparse.csc.misc.TriangularSolver_DSCC.solveTranL(g.lower(), z);
        for (int i = 0; i < d; i++) {
            x[theta[i]] = g.mean()[i] + z[i];
        }
        return logQ;
    }

    /** Expands the likelihood at the point's theta: H0 and H0 theta0 + g0, and the precision's constant part. */
    void expandAt(double[] x) {
        double[] g = new double[m.size];
        m.density.likelihood(x, g);
        m.density.negativeHessian(x, position, d, h0, true);
        for (int i = 0; i < d; i++) {
            double sum = g[theta[i]];
            for (int j = 0; j < d; j++) {
                sum += h0[i * d + j] * x[theta[j]];
            }
            linear[i] = sum;
        }
        for (int k = 0; k < baseValues.length; k++) {
            int i = entryRow[k], j = entryColumn[k];
            baseValues[k] = h0[i * d + j] + (i == j ? priorPrecision[i] : 0);
        }
    }

    /** Turns standard normal draws z into a draw from N(0, P^-1) in place: solves L' v = z. */
    void whiten(Gaussian g, double[] values) {
        org.ejml.sparse.csc.misc.TriangularSolver_DSCC.solveTranL(g.lower(), values);
    }
}
