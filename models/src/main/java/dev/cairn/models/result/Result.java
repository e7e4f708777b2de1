package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import java.util.List;
import java.util.Map;

/**
 * The result of a spend fit (result v1; keys are part of the command-line contract).
 *
 * @param decision      what to do on the primary metric (ship, keep the control, keep collecting) and why
 * @param controlSource "spec" when the spec named the control, "default" when it is the first arm in sorted order
 * @param interval the credible interval mass of every {@link Interval} (lo and hi)
 * @param currency the ISO 4217 code of money figures, or null
 * @param segments segmented-spend only: per segment, its arms and comparisons (pooled, with raw lifts)
 * @param probBest metric -> arm -> P(arm is the best of all arms on that metric)
 * @param timeline spend with data.columns.time: the evidence and decision at the end of each period; else null
 * @param priors   the priors used (defaults included), for the record
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"model", "title", "converged", "decision", "control", "controlSource", "interval", "currency", "data", "arms", "comparisons", "segments",
    "probBest", "timeline", "checks",
    "diagnostics", "run", "priors", "warnings", "cautions"})
public record Result(String model, String title, boolean converged, Decision decision, String control,
                     String controlSource, double interval, String currency, DataInfo data,
                     Map<String, ArmSummary> arms, List<Comparison> comparisons, Map<String, SegmentSummary> segments,
                     Map<String, Map<String, Double>> probBest, List<TimelineDay> timeline, List<Check> checks,
                     DiagnosticsSummary diagnostics, Run run, PriorsUsed priors, List<String> warnings,
                     List<String> cautions) implements FitResult {

    /** Shown with every result (DESIGN: cautions the tool shows). */
    public static final List<String> CAUTIONS = List.of(
            "Results are statistical estimates under stated model assumptions (independent users, the chosen "
                    + "spend and retention families).",
            "Pricing and monetisation tests must follow local consumer-protection law, rules for minors and paid "
                    + "random items, and app-store policies; this output is not financial or legal advice.");
}
