package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.DataInfo;
import dev.cairn.models.result.DiagnosticsSummary;
import dev.cairn.models.result.FitResult;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Run;
import java.util.List;
import org.junit.jupiter.api.Test;

/** A model the command line has no table for (a new one, say) still prints its run, verdict and comparisons. */
class ResultPrinterTest {
    /** A result type of a model the printer does not know. */
    record NewModelResult(String model, String title, boolean converged, DataInfo data, DiagnosticsSummary diagnostics,
                          Run run, List<String> warnings, List<String> cautions, List<Comparison> comparisons)
            implements FitResult {
    }

    @Test
    void anUnknownResultTypePrintsItsSharedParts() {
        Interval lift = new Interval(0.05, 0.01, 0.03, 0.05, 0.07);
        NewModelResult r = new NewModelResult("churn-hazard", "A new model", true,
                new DataInfo("events.csv", "events", 1200, 0, null),
                new DiagnosticsSummary(1.002, 900.0, 850.0, 1.01, 100, List.of(), List.of(), List.of(), null),
                new Run("nuts", 4, 1000, 1000, 1, 7, 1.5, "test"), List.of("a warning"), List.of("a caution"),
                List.of(new Comparison("B", "A", "hazard", lift, lift, 0.99, 0.001, null, null)));
        String text = ResultPrinter.print(r);
        assertTrue(text.contains("churn-hazard from events.csv; nuts sampler, 4 chains x 1,000 draws, seed 7"), text);
        assertTrue(text.contains("B            vs A            hazard"), text);
        assertTrue(text.contains("a warning") && text.contains("a caution"), text);
    }
}
