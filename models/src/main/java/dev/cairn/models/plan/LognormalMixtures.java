package dev.cairn.models.plan;

/** Per arm, a mixture of lognormals: weights w, log means m, log sds s; and each arm's mean E[X]. */
final class LognormalMixtures {
    final double[][] w, m, s;
    final double[] mean;

    LognormalMixtures(int arms, int components) {
        w = new double[arms][components];
        m = new double[arms][components];
        s = new double[arms][components];
        mean = new double[arms];
    }

    void set(int arm, int c, double weight, double logMean, double logVariance) {
        w[arm][c] = weight;
        m[arm][c] = logMean;
        s[arm][c] = Math.sqrt(logVariance);
    }

    void finish() {
        for (int a = 0; a < w.length; a++) {
            double e = 0;
            for (int c = 0; c < w[a].length; c++) {
                e += w[a][c] * Math.exp(m[a][c] + 0.5 * s[a][c] * s[a][c]);
            }
            mean[a] = e;
        }
    }

    /** P(X_j <= e^u) for arm j. */
    double cdf(int j, double u) {
        double p = 0;
        for (int c = 0; c < w[j].length; c++) {
            double z = (u - m[j][c]) / s[j][c];
            // Phi is 1 to double precision above 8.3 and below 1e-16 under -8.3: no need to evaluate it there
            p += z > LookRule.TAIL ? w[j][c] : z < -LookRule.TAIL ? 0 : w[j][c] * LookRule.phi(z);
        }
        return p;
    }

    /** P(X_a > X_b), arms independent. */
    double above(int a, int b) {
        double p = 0;
        for (int c = 0; c < w[a].length; c++) {
            for (int d = 0; d < w[b].length; d++) {
                p += w[a][c] * w[b][d] * LookRule.phi((m[a][c] - m[b][d]) / Math.hypot(s[a][c], s[b][d]));
            }
        }
        return p;
    }
}
