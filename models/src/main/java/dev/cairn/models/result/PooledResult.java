package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import java.util.List;
import java.util.Map;

/**
 * The result of a pooled-effects fit: each effect after partial pooling, the population mean {@code mu},
 * the between-effect sd {@code tau}, the predictive distribution of a new effect, P(effect > 0), and a
 * prior for the next test built from the predictive distribution.
 *
 * @param raw          each effect as given (estimate and se), beside the pooled one so shrinkage shows
 * @param informedPrior a normal prior (mean, sd) of a new effect, to paste into the next spec
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"model", "title", "converged", "interval", "data", "effects", "raw", "probPositive", "mu", "tau",
    "predictive", "informedPrior", "diagnostics", "run", "priors", "warnings", "cautions"})
public record PooledResult(String model, String title, boolean converged, double interval, DataInfo data,
                           Map<String, Interval> effects, Map<String, Raw> raw, Map<String, Double> probPositive,
                           Interval mu, Interval tau, Interval predictive, InformedPrior informedPrior,
                           DiagnosticsSummary diagnostics, Run run, PriorsUsed priors, List<String> warnings,
                           List<String> cautions) implements FitResult {

    /** A prior for a new effect, as a spec writes it: {@code {"family": "normal", "mean", "sd"}}. */
    public record InformedPrior(String family, double mean, double sd) {
    }

    /** An effect as estimated elsewhere. */
    public record Raw(double estimate, double se) {
    }
}
