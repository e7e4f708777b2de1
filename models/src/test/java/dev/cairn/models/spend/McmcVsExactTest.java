package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.diagnostics.Diagnostics;
import dev.cairn.diagnostics.Mcse;
import dev.cairn.diagnostics.ParameterDiagnostics;
import dev.cairn.diagnostics.Quantiles;
import dev.cairn.models.result.Comparison;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RunSettings;
import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The MCMC sweeps (slice and Metropolis-within-Gibbs) against the exact conjugate posterior on the same
 * data and priors: every reported quantity (parameters, ARPPU, ARPU; means and 2.5/50/97.5% quantiles;
 * P(above)) agrees within 4 combined Monte Carlo standard errors.
 */
class McmcVsExactTest {

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"slice", "metropolis-within-gibbs"})
    void mcmcAgreesWithExact(String method) {
        Draws exact = SpendAnalysis.withDerived(SpendPosterior.exact(SpendExactTest.DATA, SpendExactTest.PRIORS,
                RunSettings.of(4, 0, 10_000, 3), Progress.NONE, new Cancellation()), SpendExactTest.DATA);
        Draws mcmc = SpendAnalysis.withDerived(SpendPosterior.mcmc(SpendExactTest.DATA, SpendExactTest.PRIORS,
                method.equals("slice"), RunSettings.of(4, 1000, 5000, 4), Progress.NONE, new Cancellation()),
                SpendExactTest.DATA);
        for (String name : exact.names()) {
            ParameterDiagnostics e = Diagnostics.of(name, exact.column(name));
            ParameterDiagnostics m = Diagnostics.of(name, mcmc.column(name));
            double tolerance = 4 * Math.hypot(e.mcseMean(), m.mcseMean());
            assertTrue(Math.abs(e.mean() - m.mean()) <= tolerance,
                    method + " " + name + " mean " + m.mean() + " vs exact " + e.mean() + " (tolerance " + tolerance + ")");
            for (double p : new double[] {0.025, 0.5, 0.975}) {
                double qe = Quantiles.of(exact.pooled(name), p);
                double qm = Quantiles.of(mcmc.pooled(name), p);
                double tq = 4 * Math.hypot(Mcse.quantile(exact.column(name), p), Mcse.quantile(mcmc.column(name), p));
                assertTrue(Math.abs(qe - qm) <= tq, method + " " + name + " q" + p + " " + qm + " vs exact " + qe
                        + " (tolerance " + tq + ")");
            }
        }
        List<Comparison> ce = SpendAnalysis.comparisons(exact, SpendExactTest.DATA, "A", 0.95);
        List<Comparison> cm = SpendAnalysis.comparisons(mcmc, SpendExactTest.DATA, "A", 0.95);
        for (int i = 0; i < ce.size(); i++) {
            double p = ce.get(i).probAbove();
            // P(above) is the mean of an indicator; its MCSE follows from the ESS of the MCMC run (>= 400 here).
            double tolerance = 4 * Math.sqrt(Math.max(p * (1 - p), 0.01) / 400);
            assertTrue(Math.abs(p - cm.get(i).probAbove()) <= tolerance,
                    method + " " + ce.get(i).metric() + " P(above) " + cm.get(i).probAbove() + " vs exact " + p);
        }
    }
}
