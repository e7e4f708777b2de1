package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import java.util.List;
import java.util.Map;

/**
 * The result of a retention fit.
 *
 * @param decision      what to do on the primary metric (LTV when given, else the first day) and why
 * @param controlSource "spec" or "default" (the first arm in sorted order)
 * @param currency      the ISO 4217 code of LTV, or null
 * @param arms     arm -> installs and day intervals (install-weighted over the cohorts)
 * @param cohorts  one entry per (cohort, arm) with installs
 * @param drift    the random walk's innovation scales: level and slope (per cohort step)
 * @param ltv      LTV(horizon) per arm, when the spec asks for it
 * @param priors   the documented priors
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"model", "title", "converged", "decision", "curve", "control", "controlSource", "interval",
    "currency", "days", "data", "arms", "comparisons",
    "cohorts", "drift", "ltv", "diagnostics", "run", "priors", "warnings", "cautions"})
public record RetentionResult(String model, String title, boolean converged, Decision decision, String curve,
                              String control, String controlSource, double interval, String currency, List<Integer> days, DataInfo data, Map<String, RetentionArm> arms,
                              List<Comparison> comparisons, List<CohortRow> cohorts,
                              Map<String, Interval> drift, Ltv ltv, DiagnosticsSummary diagnostics,
                              Run run, Priors priors, List<String> warnings, List<String> cautions)
        implements FitResult {

    /** The retention priors are fixed and documented; the result names where. */
    public record Priors(String documented) implements PriorsUsed {
    }
}
