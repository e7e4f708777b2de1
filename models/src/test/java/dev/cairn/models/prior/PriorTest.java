package dev.cairn.models.prior;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.PriorsSpec;
import java.util.List;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.CauchyDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Each prior family against a general-purpose reference (commons-math3's distributions): the log density
 * differs from the full one by the constant the family says it drops, at every point; the derivative
 * matches central differences; bad parameters are refused naming the value.
 */
class PriorTest {
    private static final double[] POINTS = {0.05, 0.3, 0.9, 1.7, 4.2};

    /** logDensity(x) - referenceLogDensity(x) is the same constant at every x. */
    private static void constantOffset(Prior prior, java.util.function.DoubleUnaryOperator reference, double[] xs) {
        double offset = prior.logDensity(xs[0]) - reference.applyAsDouble(xs[0]);
        for (double x : xs) {
            assertEquals(offset, prior.logDensity(x) - reference.applyAsDouble(x), 1e-12, prior + " at " + x);
            double h = 1e-6 * Math.max(1, Math.abs(x));
            double numeric = (prior.logDensity(x + h) - prior.logDensity(x - h)) / (2 * h);
            assertEquals(numeric, prior.derivative(x), 1e-6 * Math.max(1, Math.abs(numeric)), prior + " derivative at " + x);
            double l = Math.log(x);
            double numericLog = (prior.logDensityOfLog(l + 1e-6) - prior.logDensityOfLog(l - 1e-6)) / 2e-6;
            assertEquals(numericLog, prior.derivativeOfLog(l), 1e-5 * Math.max(1, Math.abs(numericLog)), prior + " on log");
        }
    }

    @Test
    void familiesMatchTheReferenceDensitiesUpToTheStatedConstants() {
        NormalDistribution n = new NormalDistribution(1.5, 0.7);
        constantOffset(new Normal(1.5, 0.7), n::logDensity, POINTS);
        assertEquals(Math.log(0.7 * Math.sqrt(2 * Math.PI)), new Normal(1.5, 0.7).logDensity(1) - n.logDensity(1), 1e-12,
                "normal drops log(sd sqrt(2 pi))");
        NormalDistribution folded = new NormalDistribution(0, 2);
        constantOffset(new HalfNormal(2), x -> Math.log(2) + folded.logDensity(x), POINTS);
        CauchyDistribution c = new CauchyDistribution(0, 1.3);
        constantOffset(new HalfCauchy(1.3), x -> Math.log(2) + c.logDensity(x), POINTS);
        BetaDistribution b = new BetaDistribution(2.5, 7);
        constantOffset(new Beta(2.5, 7), b::logDensity, new double[] {0.02, 0.1, 0.4, 0.8, 0.97});
        constantOffset(new Uniform(0, 10), x -> -Math.log(10), POINTS);
        constantOffset(new Flat(), x -> 0, POINTS);
    }

    @Test
    void outsideTheSupportIsMinusInfinity() {
        assertEquals(Double.NEGATIVE_INFINITY, new HalfNormal(1).logDensity(-0.1));
        assertEquals(Double.NEGATIVE_INFINITY, new HalfCauchy(1).logDensity(0));
        assertEquals(Double.NEGATIVE_INFINITY, new Uniform(1, 2).logDensity(2.5));
        assertEquals(Double.NEGATIVE_INFINITY, new Beta(1, 1).logDensity(1));
        assertEquals(Double.NEGATIVE_INFINITY, new NormalInverseGamma(0, 1, 1, 1).logDensityOnSd(0, 0));
    }

    @Test
    void badParametersAreRefusedNamingTheValue() {
        assertEquals("half-normal prior: sd must be a finite number > 0, was -1.0",
                assertThrows(IllegalArgumentException.class, () -> new HalfNormal(-1)).getMessage());
        assertEquals("uniform prior: upper must be greater than lower, was lower 3.0, upper 2.0",
                assertThrows(IllegalArgumentException.class, () -> new Uniform(3, 2)).getMessage());
        assertEquals("normal-inverse-gamma prior: kappa0 must be a finite number > 0, was 0.0",
                assertThrows(IllegalArgumentException.class, () -> new NormalInverseGamma(0, 0, 1, 1)).getMessage());
        assertEquals("normal prior: mean must be a finite number, was NaN",
                assertThrows(IllegalArgumentException.class, () -> new Normal(Double.NaN, 1)).getMessage());
    }

    /** The factory maps each spec family to its object and names the spec field when a value is bad. */
    @Test
    void theFactoryMapsTheSpecAndNamesTheField() {
        assertEquals(new HalfCauchy(2), Priors.of(new PriorsSpec.TauPrior("half-cauchy", null, null, null, 2.0)));
        assertEquals(new Uniform(0, 5), Priors.of(new PriorsSpec.TauPrior("uniform", 0.0, 5.0, null, null)));
        assertEquals(new Flat(), Priors.of(new PriorsSpec.MuPrior("flat", null, null)));
        assertEquals(new Beta(2, 3), Priors.of(new PriorsSpec.BetaPrior("beta", 2, 3)));
        InputException e = assertThrows(InputException.class,
                () -> Priors.of(new PriorsSpec.HalfNormalPrior("half-normal", 0), "/priors/logSpendSd"));
        assertEquals("/priors/logSpendSd: half-normal prior: sd must be a finite number > 0, was 0.0", e.getMessage());
        for (Prior p : List.of(new Normal(0, 1), new HalfNormal(1), new HalfCauchy(1), new Uniform(0, 1), new Flat(),
                new Beta(1, 1))) {
            assertTrue(List.of("normal", "half-normal", "half-cauchy", "uniform", "flat", "beta").contains(p.family()));
        }
    }
}
