package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SpendData;
import dev.cairn.models.result.Comparison;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import java.util.List;
import org.apache.commons.math3.analysis.integration.SimpsonIntegrator;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.special.Beta;
import org.junit.jupiter.api.Test;

/**
 * P(p_B > p_A) for independent Beta posteriors against the exact finite sum for an integer first
 * parameter of B (Cook 2005, "Exact calculation of beta inequalities", M. D. Anderson Cancer Center
 * technical report; the form of the sum below is as recalled from memory, so it is itself checked against
 * numerical integration of f_B(x) F_A(x) with commons-math3 before use).
 */
class BetaInequalityTest {

    /** sum_{i=0}^{aB-1} B(aA + i, bA + bB) / ((bB + i) B(1 + i, bB) B(aA, bA)). */
    static double exactProbability(int aA, double bA, int aB, double bB) {
        double sum = 0;
        for (int i = 0; i < aB; i++) {
            sum += Math.exp(Beta.logBeta(aA + i, bA + bB) - Math.log(bB + i) - Beta.logBeta(1 + i, bB)
                    - Beta.logBeta(aA, bA));
        }
        return sum;
    }

    static double integrated(double aA, double bA, double aB, double bB) {
        BetaDistribution a = new BetaDistribution(aA, bA);
        BetaDistribution b = new BetaDistribution(aB, bB);
        // Integrate where B has its mass (beyond its 1e-12 quantiles the integrand is negligible).
        double lo = b.inverseCumulativeProbability(1e-12);
        double hi = b.inverseCumulativeProbability(1 - 1e-12);
        return new SimpsonIntegrator(1e-12, 1e-12, 8, 30).integrate(10_000_000,
                x -> b.density(x) * a.cumulativeProbability(x), lo, hi);
    }

    @Test
    void theSumAgreesWithNumericalIntegration() {
        assertEquals(integrated(13, 290, 21, 282), exactProbability(13, 290, 21, 282), 1e-7);
        assertEquals(integrated(5, 7, 4, 9), exactProbability(5, 7, 4, 9), 1e-7);
    }

    @Test
    void probAboveMatchesTheExactSum() {
        // Conversion-only data, uniform Beta(1, 1) priors: posteriors Beta(1 + m, 1 + n - m).
        ArmStats a = ArmStats.conversions("A", 1500, 45);
        ArmStats b = ArmStats.conversions("B", 1500, 60);
        SpendData data = new SpendData(List.of(a, b), false, "test", 3000, List.of(), "");
        SpendPriors priors = SpendPriors.fromSpec(new dev.cairn.models.spec.PriorsSpec(null, null, null, null, null));
        Draws d = SpendPosterior.exact(data, priors, RunSettings.of(4, 0, 25_000, 5), Progress.NONE, new Cancellation());
        Comparison c = SpendAnalysis.comparisons(d, data, "A", 0.95).get(0);
        double exact = exactProbability(1 + 45, 1 + 1500 - 45, 1 + 60, 1 + 1500 - 60);
        double se = Math.sqrt(exact * (1 - exact) / 100_000);
        assertEquals(exact, c.probAbove(), 4 * se, "P(B > A)");
    }
}
