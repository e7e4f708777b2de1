package dev.cairn.models.retention;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.data.CohortDays;
import dev.cairn.models.demo.RetentionScaleScenario;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.samplers.GradientCheck;
import dev.cairn.samplers.RandomStreams;
import java.nio.file.Path;
import org.apache.commons.rng.UniformRandomProvider;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The analytic gradient of the retention density agrees with central differences, both curve families. */
class RetentionGradientTest {
    @TempDir
    Path dir;

    @Test
    void gradientMatchesFiniteDifferences() {
        for (boolean survival : new boolean[] {false, true}) {
            Path file = RetentionScaleScenario.write(dir.resolve(survival + ".csv"), 5, 3, survival, 3);
            CohortDays data = CohortDays.read(new DataSpec(file.getFileName().toString(), "cohort-days", null, null), dir, survival);
            // walks as the data choose them (NUTS) and both centred (the default sampler)
            for (boolean centred : new boolean[] {false, true}) {
                RetentionPosterior m = new RetentionPosterior(data, "A", survival, centred);
                UniformRandomProvider rng = RandomStreams.forChain(9, 0);
                for (int trial = 0; trial < 5; trial++) {
                    double[] x = m.start(rng);
                    // activity: the log-Gamma terms (a few hundred of size 1e4) round to about 1e-10 in all,
                    // which a central difference over h = 5e-5 in log kappa turns into 1e-5; survival has none
                    double error = GradientCheck.maxError(m.density, x);
                    assertTrue(error < (survival ? 1e-5 : 1e-4), (survival ? "survival" : "activity") + ": " + error + " at "
                            + GradientCheck.worst(m.density, x));
                }
            }
        }
    }

    /**
     * The Laplace-Metropolis expansion's Hessian (per cell, then added at the cohorts' and arms' coordinates)
     * equals central differences of the whole likelihood's analytic gradient (without the positive-part
     * projection, which changes only cells whose block is not negative definite); with it, every cell's
     * block and so the whole matrix is positive semi-definite.
     */
    @Test
    void likelihoodHessianMatchesDifferencesOfTheGradient() {
        for (boolean survival : new boolean[] {false, true}) {
            Path file = RetentionScaleScenario.write(dir.resolve("h" + survival + ".csv"), 4, 3, survival, 5);
            CohortDays data = CohortDays.read(new DataSpec(file.getFileName().toString(), "cohort-days", null, null), dir, survival);
            RetentionPosterior m = new RetentionPosterior(data, "A", survival, true);
            double[] x = m.start(RandomStreams.forChain(4, 0));
            int[] position = new int[m.size];
            int d = 0;
            for (int i = 0; i < m.size; i++) {
                position[i] = i == m.logSigmaL || i == m.logSigmaS ? -1 : d++;
            }
            double[] h = new double[d * d];
            m.density.negativeHessian(x, position, d, h, false);
            double step = 1e-5;
            for (int j = 0; j < m.size; j++) {
                if (position[j] < 0) {
                    continue;
                }
                double[] up = x.clone(), down = x.clone(), gUp = new double[m.size], gDown = new double[m.size];
                up[j] += step;
                down[j] -= step;
                m.density.likelihood(up, gUp);
                m.density.likelihood(down, gDown);
                for (int i = 0; i < m.size; i++) {
                    if (position[i] < 0) {
                        continue;
                    }
                    double expected = -(gUp[i] - gDown[i]) / (2 * step);
                    double actual = h[position[i] * d + position[j]];
                    assertEquals(expected, actual, 1e-4 * Math.max(1, Math.abs(expected)),
                            (survival ? "survival" : "activity") + " H[" + m.parameters.name(i) + ", " + m.parameters.name(j) + "]");
                }
            }
            m.density.negativeHessian(x, position, d, h, true);
            org.ejml.data.DMatrixRMaj projected = new org.ejml.data.DMatrixRMaj(d, d, true, h);
            var eigen = org.ejml.dense.row.factory.DecompositionFactory_DDRM.eig(d, false, true);
            assertTrue(eigen.decompose(projected));
            double largest = 0;
            for (int e = 0; e < d; e++) {
                largest = Math.max(largest, Math.abs(eigen.getEigenvalue(e).getReal()));
            }
            for (int e = 0; e < d; e++) {
                assertTrue(eigen.getEigenvalue(e).getReal() > -1e-9 * largest, "projected Hessian's eigenvalue "
                        + eigen.getEigenvalue(e).getReal());
            }
        }
    }

    /**
     * The survival cell's log likelihood equals the shifted-beta-geometric model's definition (Fader &amp;
     * Hardie 2007; equation numbers from memory, not checked: S(t) = prod_{i<t} (beta + i) / (alpha + beta + i), P(churn in (u, v]) =
     * S(u) - S(v)) evaluated in 50-digit decimal arithmetic, and its derivatives equal central differences
     * of that reference, from alpha, beta = 1e-3 to 1e3 (where a log-Gamma difference would lose digits).
     */
    @Test
    void survivalCellEqualsTheDefinitionInExactArithmetic() {
        int[] days = {1, 2, 3, 7, 14, 30, 90};
        long[] retained = {700, 560, 480, 330, 240, 160, 90};
        for (double alpha : new double[] {1e-3, 0.05, 0.6, 3, 40, 1e3}) {
            for (double beta : new double[] {1e-3, 0.3, 3.3, 25, 1e3}) {
                double[] d = new double[2];
                double lp = RetentionDensity.survivalCell(alpha, beta, days, retained, 1000, d);
                String at = "alpha " + alpha + ", beta " + beta;
                double expected = survivalReference(alpha, beta, days, retained, 1000);
                assertEquals(expected, lp, 1e-12 * Math.max(1, Math.abs(expected)), at);
                double h = 1e-6;
                double dAlpha = (survivalReference(alpha * (1 + h), beta, days, retained, 1000)
                        - survivalReference(alpha * (1 - h), beta, days, retained, 1000)) / (2 * h * alpha);
                double dBeta = (survivalReference(alpha, beta * (1 + h), days, retained, 1000)
                        - survivalReference(alpha, beta * (1 - h), days, retained, 1000)) / (2 * h * beta);
                assertEquals(dAlpha, d[0], 1e-6 * Math.max(1 / alpha, Math.abs(dAlpha)), at);
                assertEquals(dBeta, d[1], 1e-6 * Math.max(1 / beta, Math.abs(dBeta)), at);
            }
        }
    }

    private static double survivalReference(double alpha, double beta, int[] days, long[] retained, long n) {
        java.math.MathContext mc = new java.math.MathContext(50);
        java.math.BigDecimal a = new java.math.BigDecimal(alpha), b = new java.math.BigDecimal(beta);
        java.math.BigDecimal s = java.math.BigDecimal.ONE, previousS = s;
        double lp = 0;
        long previous = n;
        int day = 0;
        for (int j = 0; j < days.length; j++) {
            for (; day < days[j]; day++) {
                java.math.BigDecimal i = java.math.BigDecimal.valueOf(day);
                s = s.multiply(b.add(i)).divide(a.add(b).add(i), mc);
            }
            lp += (previous - retained[j]) * Math.log(previousS.subtract(s).doubleValue());
            previous = retained[j];
            previousS = s;
        }
        return lp + previous * Math.log(s.doubleValue());
    }
}
