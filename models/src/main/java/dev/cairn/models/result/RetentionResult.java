package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import java.util.List;
import java.util.Map;

/**
 * The result of a retention fit.
 *
 * @param arms     arm -> {installs, retention: {d<N>: interval}} (install-weighted over the cohorts)
 * @param cohorts  one entry per (cohort, arm): cohort, arm, installs, lastObservedDay, d<N> intervals,
 *                 projected (the d<N> beyond the last observed day), and alpha, beta for survival curves
 * @param drift    the random walk's innovation scales: level and slope (per cohort step)
 * @param ltv      arm -> interval of LTV(horizon), when the spec asks for it
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"model", "title", "converged", "curve", "control", "interval", "days", "data", "arms", "comparisons",
    "cohorts", "drift", "ltv", "diagnostics", "run", "priors", "warnings", "cautions"})
public record RetentionResult(String model, String title, boolean converged, String curve, String control,
                              double interval, List<Integer> days, DataInfo data, Map<String, Map<String, Object>> arms,
                              List<Comparison> comparisons, List<Map<String, Object>> cohorts,
                              Map<String, Interval> drift, Map<String, Object> ltv, DiagnosticsSummary diagnostics,
                              Run run, Object priors, List<String> warnings, List<String> cautions)
        implements FitResult {
}
