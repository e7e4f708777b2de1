package dev.cairn.models.retention;

import dev.cairn.samplers.GradientTarget;
import dev.cairn.samplers.Parameters;
import org.apache.commons.math3.special.Gamma;

/**
 * The retention posterior's log density and its gradient, from the cohort-day counts (the model is written
 * out in {@link RetentionPosterior}). Per observed cell (cohort c, arm k, day t) with n installs and y active:
 * <pre>
 * activity:  z = l + s x_t (x_t = log(1 + t) - log 8),  r = logistic(z),  a = r kappa,  b = (1 - r) kappa
 *            log p = lgamma(y + a) + lgamma(n - y + b) - lgamma(a) - lgamma(b) + lgamma(kappa) - lgamma(n + kappa)
 *            d/dz = kappa r (1 - r) [(psi(y + a) - psi(a)) - (psi(n - y + b) - psi(b))]
 *            d/d log kappa = kappa [r (psi(y + a) - psi(a)) + (1 - r)(psi(n - y + b) - psi(b)) + psi(kappa) - psi(n + kappa)]
 * survival:  log S(t) = sum_{i<t} log((beta + i) / (alpha + beta + i))
 *                     (= lgamma(beta + t) - lgamma(beta) - lgamma(alpha + beta + t) + lgamma(alpha + beta))
 *            d log S / d alpha = -sum_{i<t} 1 / (alpha + beta + i)
 *            d log S / d beta  = sum_{i<t} alpha / ((beta + i)(alpha + beta + i))
 *            log(S(u) - S(v)) = log S(u) + log(1 - w), w = S(v)/S(u): derivative (dlogS(u) - w dlogS(v)) / (1 - w)
 * </pre>
 * (psi the digamma function, commons-math3); the binomial coefficients are constant and dropped. Priors:
 * the random walks' normal terms with log sigma's Jacobian, half-normal drift scales on the log scale,
 * normal offsets and log kappa. The likelihood is evaluated on the centred series and its gradient carried
 * to the walks' non-centred coordinates by the chain rule.
 */
final class RetentionDensity implements GradientTarget {
    private final RetentionPosterior m;
    private final double[] covariate;
    /** Per thread: the point with centred series (targets are shared by chains running in parallel). */
    private final ThreadLocal<double[]> scratch;
    /** Per thread: a gradient the value-only path lets the walks' terms write to (and ignores). */
    private final ThreadLocal<double[]> gradientScratch;

    RetentionDensity(RetentionPosterior model) {
        this.m = model;
        this.scratch = ThreadLocal.withInitial(() -> new double[model.size]);
        this.gradientScratch = ThreadLocal.withInitial(() -> new double[model.size]);
        int maxDay = 0;
        for (int[] d : model.days) {
            for (int t : d) {
                maxDay = Math.max(maxDay, t);
            }
        }
        covariate = new double[maxDay + 1];
        for (int t = 0; t <= maxDay; t++) {
            covariate[t] = Math.log1p(t) - RetentionPosterior.CENTRE;
        }
    }

    @Override
    public Parameters parameters() {
        return m.parameters;
    }

    /** The log density alone: the likelihood without its digamma terms, the priors as below. */
    @Override
    public double logDensity(double[] x) {
        double[] centred = scratch.get();
        m.centred(x, centred);
        double lp = likelihood(centred, null);
        double[] g = gradientScratch.get();
        java.util.Arrays.fill(g, 0);
        lp += walk(x, g, m.level, m.levelMean(), m.levelSd(), m.logSigmaL, m.levelNc)
                + walk(x, g, m.slope, m.slopeMean(), m.slopeSd(), m.logSigmaS, m.slopeNc);
        for (int i = m.offLevel; i < m.logSigmaL; i++) {
            lp -= 0.5 * x[i] * x[i] / (RetentionPosterior.OFFSET_SD * RetentionPosterior.OFFSET_SD);
        }
        if (!m.survival) {
            double r = (x[m.logKappa] - RetentionPosterior.LOG_KAPPA_MEAN) / RetentionPosterior.LOG_KAPPA_SD;
            lp -= 0.5 * r * r;
        }
        return lp;
    }

    @Override
    public double logDensityAndGradient(double[] x, double[] g) {
        java.util.Arrays.fill(g, 0);
        double[] centred = scratch.get();
        m.centred(x, centred);
        // likelihood in the centred series (its gradient lands on L_c and S_c), then the chain rule to the steps
        double lp = likelihood(centred, g);
        lp += walk(x, g, m.level, m.levelMean(), m.levelSd(), m.logSigmaL, m.levelNc)
                + walk(x, g, m.slope, m.slopeMean(), m.slopeSd(), m.logSigmaS, m.slopeNc);
        for (int i = m.offLevel; i < m.logSigmaL; i++) {
            lp -= 0.5 * x[i] * x[i] / (RetentionPosterior.OFFSET_SD * RetentionPosterior.OFFSET_SD);
            g[i] -= x[i] / (RetentionPosterior.OFFSET_SD * RetentionPosterior.OFFSET_SD);
        }
        if (!m.survival) {
            double r = (x[m.logKappa] - RetentionPosterior.LOG_KAPPA_MEAN) / RetentionPosterior.LOG_KAPPA_SD;
            lp -= 0.5 * r * r;
            g[m.logKappa] -= r / RetentionPosterior.LOG_KAPPA_SD;
        }
        return lp;
    }

    /**
     * The log likelihood at a point whose series blocks hold L_c and S_c; when {@code g} is not null, its
     * derivatives with respect to those coordinates (series, offsets, log kappa) are added to g.
     *
     * @param centred the point, centred series
     * @param g       gradient to add to (modified), or null for the value alone (no digamma terms)
     * @return the log likelihood
     */
    double likelihood(double[] centred, double[] g) {
        double[] local = g == null ? null : new double[3];
        double logKappa = m.survival ? 0 : centred[m.logKappa];
        double lp = 0;
        for (int c = 0; c < m.cohorts; c++) {
            for (int k = 0; k < m.arms; k++) {
                if (m.n[c][k] == 0 || m.days(c, k).length == 0) {
                    continue;
                }
                lp += cell(c, k, centred[m.level + c] + m.offL(centred, k), centred[m.slope + c] + m.offS(centred, k),
                        logKappa, local);
                if (g != null) {
                    addCurve(g, c, k, local[0], local[1]);
                    if (!m.survival) {
                        g[m.logKappa] += local[2];
                    }
                }
            }
        }
        return lp;
    }

    /**
     * The negative Hessian of the log likelihood at a centred point, over the coordinates that
     * {@code position} maps to 0..d-1 (the others, -1, left out): per cell, central differences of the cell's
     * analytic gradient in its own level, slope and log kappa, optionally made positive semi-definite (negative
     * eigenvalues set to 0, EJML; one cell's likelihood need not be concave in log kappa), then added at the cohort's and the arm's coordinates. The likelihood is a
     * sum over cells, each a function of those two or three numbers, so the whole matrix costs about six
     * gradients.
     *
     * @param centred  the point, centred series
     * @param position each coordinate's row in the output, or -1
     * @param d        the output's order
     * @param out      d x d row-major (overwritten)
     * @param project  whether to make each cell's block positive semi-definite (as a proposal needs)
     */
    void negativeHessian(double[] centred, int[] position, int d, double[] out, boolean project) {
        java.util.Arrays.fill(out, 0);
        int dims = m.survival ? 2 : 3;
        double h = 1e-4;
        double[] plus = new double[3], minus = new double[3];
        org.ejml.data.DMatrixRMaj local = new org.ejml.data.DMatrixRMaj(dims, dims);
        var eigen = org.ejml.dense.row.factory.DecompositionFactory_DDRM.eig(dims, true, true);
        int[][] rows = new int[dims][2];
        double logKappa = m.survival ? 0 : centred[m.logKappa];
        for (int c = 0; c < m.cohorts; c++) {
            for (int k = 0; k < m.arms; k++) {
                if (m.n[c][k] == 0 || m.days(c, k).length == 0) {
                    continue;
                }
                double[] u = {centred[m.level + c] + m.offL(centred, k), centred[m.slope + c] + m.offS(centred, k), logKappa};
                for (int j = 0; j < dims; j++) {
                    double keep = u[j];
                    u[j] = keep + h;
                    cell(c, k, u[0], u[1], u[2], plus);
                    u[j] = keep - h;
                    cell(c, k, u[0], u[1], u[2], minus);
                    u[j] = keep;
                    for (int i = 0; i < dims; i++) {
                        local.set(i, j, -(plus[i] - minus[i]) / (2 * h));
                    }
                }
                for (int i = 0; i < dims; i++) {
                    for (int j = 0; j < i; j++) {
                        double v = 0.5 * (local.get(i, j) + local.get(j, i));
                        local.set(i, j, v);
                        local.set(j, i, v);
                    }
                }
                if (project) {
                    positivePart(local, eigen);
                }
                rows[0][0] = position[m.level + c];
                rows[0][1] = k == m.control ? -1 : position[m.offset(m.offLevel, k)];
                rows[1][0] = position[m.slope + c];
                rows[1][1] = k == m.control ? -1 : position[m.offset(m.offSlope, k)];
                if (dims == 3) {
                    rows[2][0] = position[m.logKappa];
                    rows[2][1] = -1;
                }
                for (int i = 0; i < dims; i++) {
                    for (int j = 0; j < dims; j++) {
                        double v = local.get(i, j);
                        for (int a : rows[i]) {
                            for (int b : rows[j]) {
                                if (a >= 0 && b >= 0) {
                                    out[a * d + b] += v;
                                }
                            }
                        }
                    }
                }
            }
        }
    }

    /** Replaces a small symmetric matrix by its positive semi-definite part (negative eigenvalues to 0). */
    private static void positivePart(org.ejml.data.DMatrixRMaj a,
                                     org.ejml.interfaces.decomposition.EigenDecomposition_F64<org.ejml.data.DMatrixRMaj> eigen) {
        int n = a.numRows;
        boolean definite = true;
        // quick exit for the usual case: Sylvester's criterion on the leading minors
        double m1 = a.get(0, 0), m2 = a.get(0, 0) * a.get(1, 1) - a.get(0, 1) * a.get(1, 0);
        double m3 = n == 3 ? org.ejml.dense.row.CommonOps_DDRM.det(a) : 1;
        definite = m1 > 0 && m2 > 0 && m3 > 0;
        if (definite) {
            return;
        }
        if (!eigen.decompose(a.copy())) {
            a.zero();
            return;
        }
        org.ejml.data.DMatrixRMaj out = new org.ejml.data.DMatrixRMaj(n, n);
        for (int e = 0; e < n; e++) {
            double value = eigen.getEigenvalue(e).getReal();
            org.ejml.data.DMatrixRMaj v = eigen.getEigenVector(e);
            if (value <= 0 || v == null) {
                continue;
            }
            double norm = 0;
            for (int i = 0; i < n; i++) {
                norm += v.get(i) * v.get(i);
            }
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    out.add(i, j, value * v.get(i) * v.get(j) / norm);
                }
            }
        }
        a.setTo(out);
    }

    /**
     * One cell's log likelihood at its level l and slope s (activity: the logit curve's; survival: log alpha
     * and log beta) and log kappa (activity only); when {@code local} is not null it receives the derivatives
     * with respect to l, s and log kappa.
     */
    double cell(int c, int k, double l, double s, double logKappa, double[] local) {
        if (m.survival) {
            double alpha = Math.exp(l), beta = Math.exp(s);
            double[] d = local == null ? new double[2] : local;
            double lp = survivalCell(alpha, beta, m.days(c, k), m.active[c][k], m.n[c][k], d);
            if (local != null) {
                local[0] = alpha * d[0];
                local[1] = beta * d[1];
                local[2] = 0;
            }
            return lp;
        }
        return activity(c, k, l, s, Math.exp(logKappa), local);
    }

    /**
     * The non-centred walk: coordinates first (L_1) and steps eps_c, L_c = L_{c-1} + sigma eps_c. On entry
     * g[first + c] holds d(log likelihood)/dL_c; on exit the gradient with respect to the coordinates (L_1:
     * the sum of all; eps_c: sigma times the sum from c on; log sigma: sum_c sigma eps_c times that sum), plus
     * the priors L_1 ~ N(firstMean, firstSd^2), eps_c ~ N(0, 1) and sigma ~ half-N(0, 0.25^2) with the Jacobian.
     */
    private double walk(double[] x, double[] g, int first, double firstMean, double firstSd, int logSigma,
                        boolean nonCentred) {
        if (!nonCentred) {
            return centredWalk(x, g, first, firstMean, firstSd, logSigma);
        }
        double sigma = Math.exp(x[logSigma]);
        double suffix = 0;
        for (int c = m.cohorts - 1; c >= 1; c--) {
            suffix += g[first + c];
            double eps = x[first + c];
            g[first + c] = sigma * suffix - eps;
            g[logSigma] += sigma * eps * suffix;
        }
        suffix += g[first];
        double r0 = (x[first] - firstMean) / firstSd;
        g[first] = suffix - r0 / firstSd;
        double lp = -0.5 * r0 * r0;
        for (int c = 1; c < m.cohorts; c++) {
            lp -= 0.5 * x[first + c] * x[first + c];
        }
        lp += RetentionPosterior.DRIFT.logDensityOfLog(x[logSigma]);
        g[logSigma] += RetentionPosterior.DRIFT.derivativeOfLog(x[logSigma]);
        return lp;
    }

    /** The centred walk: N(L_1; firstMean, firstSd^2) prod N(L_c; L_{c-1}, sigma^2), half-normal sigma. */
    private double centredWalk(double[] x, double[] g, int first, double firstMean, double firstSd, int logSigma) {
        double r0 = (x[first] - firstMean) / firstSd;
        double lp = -0.5 * r0 * r0;
        g[first] -= r0 / firstSd;
        double l = x[logSigma], sigma = Math.exp(l);
        for (int c = 1; c < m.cohorts; c++) {
            double r = (x[first + c] - x[first + c - 1]) / sigma;
            lp -= 0.5 * r * r + l;
            g[first + c] -= r / sigma;
            g[first + c - 1] += r / sigma;
            g[logSigma] += r * r - 1;
        }
        lp += RetentionPosterior.DRIFT.logDensityOfLog(l);
        g[logSigma] += RetentionPosterior.DRIFT.derivativeOfLog(l);
        return lp;
    }

    private double activity(int c, int k, double l, double s, double kappa, double[] local) {
        double n = m.n[c][k];
        double kappaTerms = Gamma.logGamma(kappa) - Gamma.logGamma(n + kappa);
        double kappaSlope = local == null ? 0 : Gamma.digamma(kappa) - Gamma.digamma(n + kappa);
        int[] ds = m.days(c, k);
        long[] ys = m.active[c][k];
        double lp = 0, gz = 0, gzs = 0, gKappa = 0;
        for (int i = 0; i < ds.length; i++) {
            double xt = covariate[ds[i]];
            double z = l + s * xt;
            double e = Math.exp(-Math.abs(z));
            double r = z >= 0 ? 1 / (1 + e) : e / (1 + e);
            double q = z >= 0 ? e / (1 + e) : 1 / (1 + e);
            double a = r * kappa, b = q * kappa;
            double y = ys[i];
            lp += Gamma.logGamma(y + a) + Gamma.logGamma(n - y + b) - Gamma.logGamma(a) - Gamma.logGamma(b) + kappaTerms;
            if (local != null) {
                double da = Gamma.digamma(y + a) - Gamma.digamma(a);
                double db = Gamma.digamma(n - y + b) - Gamma.digamma(b);
                double dz = kappa * r * q * (da - db);
                gz += dz;
                gzs += dz * xt;
                gKappa += kappa * (r * da + q * db + kappaSlope);
            }
        }
        if (local != null) {
            local[0] = gz;
            local[1] = gzs;
            local[2] = gKappa;
        }
        return lp;
    }

    /**
     * One survival cell's log likelihood, with its derivatives with respect to alpha and beta put in d[0] and
     * d[1]: n users, ys[j] still retained on days ds[j] (ascending), right-censored at the last. By the
     * shifted-beta-geometric recursion S(t) = S(t - 1) (beta + t - 1) / (alpha + beta + t - 1) (Fader &amp;
     * Hardie 2007; equation number from memory, not checked): the log of each factor, log1p(-alpha / (alpha + beta + i)), and its derivatives
     * -1 / (alpha + beta + i) and alpha / ((beta + i)(alpha + beta + i)) are summed between observed days,
     * so log(S(u) - S(v)) = log S(u) + log(-expm1(seg)) keeps its precision when the interval's factor
     * w = e^seg is near 1 (tiny alpha), and a day costs a few arithmetic operations instead of special
     * functions.
     */
    static double survivalCell(double alpha, double beta, int[] ds, long[] ys, double n, double[] d) {
        double lp = 0, gAlpha = 0, gBeta = 0;
        double logS = 0, dA = 0, dB = 0;
        double previous = n;
        int day = 0;
        for (int j = 0; j < ds.length; j++) {
            double seg = 0, segA = 0, segB = 0;
            for (; day < ds[j]; day++) {
                double sum = alpha + beta + day;
                seg += Math.log1p(-alpha / sum);
                segA -= 1 / sum;
                segB += alpha / ((beta + day) * sum);
            }
            double lost = previous - ys[j];
            if (lost > 0) {
                // log(S(u) - S(v)) = log S(u) + log(1 - e^seg); derivative dlogS(u) - dseg e^seg / (1 - e^seg)
                double ratio = 1 / Math.expm1(-seg);
                lp += lost * (logS + Math.log(-Math.expm1(seg)));
                gAlpha += lost * (dA - ratio * segA);
                gBeta += lost * (dB - ratio * segB);
            }
            logS += seg;
            dA += segA;
            dB += segB;
            previous = ys[j];
        }
        d[0] = gAlpha + previous * dA;
        d[1] = gBeta + previous * dB;
        return lp + previous * logS;
    }

    /** Adds the derivatives with respect to the cell's level and slope to the cohort's and the arm's. */
    private void addCurve(double[] g, int c, int k, double dLevel, double dSlope) {
        g[m.level + c] += dLevel;
        g[m.slope + c] += dSlope;
        if (k != m.control) {
            g[m.offset(m.offLevel, k)] += dLevel;
            g[m.offset(m.offSlope, k)] += dSlope;
        }
    }
}
