package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import dev.cairn.diagnostics.DiagnosticsReport;
import java.util.List;

/** Convergence diagnostics in the result; undefined values (constant quantities) are null. */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record DiagnosticsSummary(Double maxRhat, Double minEssBulk, Double minEssTail, double thresholdRhat,
                                 double thresholdEssPerChain, List<Parameter> parameters, List<String> reasons,
                                 List<String> notes, String advice) {

    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Parameter(String name, Double rhat, Double essBulk, Double essTail, Double mcseMean) {
    }

    /**
     * The result's diagnostics block from a report: thresholds, worst values, reasons and every parameter's line.
     *
     * @param r the report
     * @return the block
     */
    public static DiagnosticsSummary of(DiagnosticsReport r) {
        List<Parameter> ps = r.parameters().stream()
                .map(p -> new Parameter(p.name(), finite(p.rhat()), finite(p.essBulk()), finite(p.essTail()),
                        finite(p.mcseMean())))
                .toList();
        return new DiagnosticsSummary(finite(r.maxRhat()), finite(r.minEssBulk()), finite(r.minEssTail()),
                r.thresholds().maxRhat(), r.thresholds().minEssPerChain(), ps, r.reasons(), r.notes(), r.advice());
    }

    static Double finite(double v) {
        return Double.isFinite(v) ? v : null;
    }
}
