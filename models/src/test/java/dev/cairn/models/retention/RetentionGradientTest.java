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
            RetentionPosterior m = new RetentionPosterior(data, "A", survival);
            UniformRandomProvider rng = RandomStreams.forChain(9, 0);
            for (int trial = 0; trial < 5; trial++) {
                double[] x = m.start(rng);
                double error = GradientCheck.maxError(m.density, x);
                assertTrue(error < 1e-5, (survival ? "survival" : "activity") + ": " + error + " at "
                        + GradientCheck.worst(m.density, x));
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
