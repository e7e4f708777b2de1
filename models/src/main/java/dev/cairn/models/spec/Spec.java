package dev.cairn.models.spec;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;

/**
 * A fit request (spec v1). Validated against {@code spec.schema.json} before it is bound; see
 * {@link SpecReader}. Absent optional parts are null and take the documented defaults.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Spec(
        @JsonProperty("$schema") String schema,
        String title,
        String model,
        DataSpec data,
        String control,
        PriorsSpec priors,
        SamplerSpec sampler,
        DecisionSpec decision,
        ConvergenceSpec convergence,
        Boolean strict,
        String parameterisation,
        String curve,
        java.util.List<Integer> days,
        LtvSpec ltv) {

    /** retention: LTV horizon and revenue per active day (a number or a table's path). */
    public record LtvSpec(int horizon, com.fasterxml.jackson.databind.JsonNode revenuePerActiveDay) {
    }

    public java.util.List<Integer> daysOrDefault() {
        return days == null ? java.util.List.of(1, 7, 30) : days;
    }

    public SamplerSpec samplerOrDefault() {
        return sampler == null ? SamplerSpec.DEFAULT : sampler.withDefaults();
    }

    public double interval() {
        return decision == null || decision.interval() == null ? 0.95 : decision.interval();
    }

    public boolean isStrict() {
        return strict != null && strict;
    }

    public PriorsSpec priorsOrEmpty() {
        return priors == null ? new PriorsSpec(null, null, null, null, null, null, null) : priors;
    }
}
