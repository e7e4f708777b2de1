package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/**
 * The known-variance hierarchy (BDA3 sections 5.4-5.5, eq. 5.21) against the integral it stands for: the log
 * marginal likelihood of tau, mu integrated out numerically on a fine grid, must differ between two values of
 * tau by exactly what {@link KnownVarianceHierarchy#logMarginal} says (it drops constants that do not depend
 * on tau). The y and v here are arbitrary numbers, one group without information (v infinite).
 */
class KnownVarianceHierarchyTest {
    private static final double[] Y = {0.31, -0.12, 0.55, 0.08, 0.9, -0.4, 0.2};
    private static final double[] V = {0.04, 0.09, 0.25, 0.01, 1.5, 0.3, Double.POSITIVE_INFINITY};

    /** log of the integral over mu of prod_j N(y_j | mu, v_j + tau^2) N(mu | m0, V0), by Simpson's rule. */
    private static double integrated(double tau, double m0, double v0) {
        double lo = -12, hi = 12;
        int n = 200_000;
        double h = (hi - lo) / n, sum = 0;
        for (int i = 0; i <= n; i++) {
            double mu = lo + i * h, log = 0;
            for (int j = 0; j < Y.length; j++) {
                if (Double.isFinite(V[j])) {
                    double s2 = V[j] + tau * tau;
                    log += -0.5 * Math.log(2 * Math.PI * s2) - 0.5 * (Y[j] - mu) * (Y[j] - mu) / s2;
                }
            }
            if (Double.isFinite(v0)) {
                log += -0.5 * Math.log(2 * Math.PI * v0) - 0.5 * (mu - m0) * (mu - m0) / v0;
            }
            double weight = i == 0 || i == n ? 1 : i % 2 == 1 ? 4 : 2;
            sum += weight * Math.exp(log);
        }
        return Math.log(sum * h / 3);
    }

    @Test
    void logMarginalDiffersBetweenScalesAsTheIntegralDoes() {
        for (double[] prior : new double[][] {{0.2, 1.5}, {-1, 0.3}}) {
            KnownVarianceHierarchy h = KnownVarianceHierarchy.of(Y, V, prior[0], prior[1]);
            double[] taus = {0.0, 0.05, 0.3, 1.0, 4.0};
            for (double tau : taus) {
                double expected = integrated(tau, prior[0], prior[1]) - integrated(0.3, prior[0], prior[1]);
                double got = h.logMarginal(tau) - h.logMarginal(0.3);
                assertEquals(expected, got, 1e-8, "tau " + tau + ", prior " + prior[0] + ", " + prior[1]);
            }
        }
    }

    @Test
    void meanGivenTauIsThePrecisionWeightedMean() {
        KnownVarianceHierarchy h = KnownVarianceHierarchy.of(Y, V, 0.2, 1.5);
        double tau = 0.4, precision = 1 / 1.5, weighted = 0.2 / 1.5;
        for (int j = 0; j < Y.length; j++) {
            if (Double.isFinite(V[j])) {
                precision += 1 / (V[j] + tau * tau);
                weighted += Y[j] / (V[j] + tau * tau);
            }
        }
        NormalMean m = h.meanGivenTau(tau);
        assertEquals(weighted / precision, m.mean(), 1e-14);
        assertEquals(1 / precision, m.variance(), 1e-14);
    }

    @Test
    void manyGroupsWithTinyAndHugeVariancesStayFinite() {
        int n = 1000;
        double[] y = new double[n], v = new double[n];
        for (int j = 0; j < n; j++) {
            y[j] = Math.sin(j);
            v[j] = j % 2 == 0 ? 1e-12 : 1e12;
        }
        KnownVarianceHierarchy h = KnownVarianceHierarchy.of(y, v, 0, Double.POSITIVE_INFINITY);
        double direct = 0;
        double lp = h.logMarginal(0.5);
        NormalMean m = h.meanGivenTau(0.5);
        direct += 0.5 * Math.log(m.variance());
        for (int j = 0; j < n; j++) {
            double s2 = v[j] + 0.25;
            direct -= 0.5 * (Math.log(s2) + (y[j] - m.mean()) * (y[j] - m.mean()) / s2);
        }
        assertEquals(direct, lp, 1e-9 * Math.abs(direct));
    }
}
