package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Properties are checked over 1,000 seeded random points per transform (plain loops). */
class TransformTest {
    private static final int POINTS = 1000;

    /** log|dx/du| against a central finite difference of constrain(u). */
    @Test
    void logJacobianMatchesFiniteDifferences() {
        SplittableRandom random = new SplittableRandom(1);
        for (int k = 0; k < POINTS; k++) {
            double u = random.nextDouble(-8, 8);
            for (Transform t : Transform.values()) {
                double h = 1e-5;
                double derivative = (t.constrain(u + h) - t.constrain(u - h)) / (2 * h);
                assertEquals(Math.log(derivative), t.logJacobian(u), 1e-6, t + " at u=" + u);
            }
        }
    }

    /** Round trip; beyond |u| = 15 the logistic's 1 - x has too few bits left in a double to come back. */
    @Test
    void constrainThenUnconstrainIsIdentity() {
        SplittableRandom random = new SplittableRandom(2);
        for (int k = 0; k < POINTS; k++) {
            double u = random.nextDouble(-15, 15);
            for (Transform t : Transform.values()) {
                assertEquals(u, t.unconstrain(t.constrain(u)), 1e-8, t + " at u=" + u);
            }
        }
    }

    @Test
    void unitIntervalLogJacobianIsFiniteFarInTheTails() {
        // log(x(1-x)) ~ -|u| for large |u|; the direct formula would give log(0) = -inf.
        assertEquals(-800.0, Transform.UNIT_INTERVAL.logJacobian(800.0), 1e-9);
        assertEquals(-800.0, Transform.UNIT_INTERVAL.logJacobian(-800.0), 1e-9);
    }

    @Test
    void constrainedScaleTargetAddsJacobians() {
        Parameters p = Parameters.builder().positive("sigma").unitInterval("rate").build();
        Target t = Target.onConstrainedScale(p, x -> -x[0] + Math.log(x[1]));
        double[] u = {0.3, -1.2};
        double sigma = Math.exp(0.3);
        double rate = 1 / (1 + Math.exp(1.2));
        double expected = -sigma + Math.log(rate) + 0.3 + Math.log(rate * (1 - rate));
        assertEquals(expected, t.logDensity(u), 1e-12);
    }

    @Test
    void unconstrainNamesTheParameterOutOfRange() {
        Parameters p = Parameters.builder().real("mu").positive("sigma").build();
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> p.unconstrain(new double[] {0.0, -1.0}));
        assertTrue(e.getMessage().contains("'sigma'") && e.getMessage().contains("-1.0"), e.getMessage());
    }

    @Test
    void parameterNamesMustBeUnique() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Parameters.builder().real("mu").real("mu"));
        assertTrue(e.getMessage().contains("'mu'"), e.getMessage());
        assertEquals("theta[3]", Parameters.builder().vector("theta", 3, Transform.REAL).build().name(2));
    }
}
