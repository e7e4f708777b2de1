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
        String currency,
        @com.fasterxml.jackson.annotation.JsonIgnore com.fasterxml.jackson.databind.JsonNode tree) {

    /** Binds a model's own options, ignoring the other keys (the schema has checked them). */
    private static final com.fasterxml.jackson.databind.ObjectMapper OPTIONS = new com.fasterxml.jackson.databind.ObjectMapper()
            .disable(com.fasterxml.jackson.databind.DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
            .enable(com.fasterxml.jackson.databind.DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES);

    /**
     * A spec built in code and validated as a spec file is (see {@link SpecBuilder}).
     *
     * @param model the model name
     * @return a builder
     */
    public static SpecBuilder builder(String model) {
        return SpecBuilder.of(model);
    }

    /**
     * The same spec holding the JSON it was read from (its models read their own options from it).
     *
     * @param source the spec's JSON object
     * @return the spec
     */
    public Spec withTree(com.fasterxml.jackson.databind.JsonNode source) {
        return new Spec(schema, title, model, data, control, priors, sampler, decision, convergence, strict, currency, source);
    }

    /**
     * A model's own options (top-level keys such as retention's "curve"), bound to the model's record type;
     * keys the type does not name are ignored.
     *
     * @param type the model's options record
     * @param <T>  its type
     * @return the options, fields absent from the spec null
     * @throws dev.cairn.models.InputException when a value does not fit the type
     */
    public <T> T options(Class<T> type) {
        try {
            return OPTIONS.treeToValue(tree == null ? OPTIONS.createObjectNode() : tree, type);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new dev.cairn.models.InputException("spec: " + e.getOriginalMessage());
        }
    }

    /**
     * {@return the sampler block with its defaults filled in}
     */
    public SamplerSpec samplerOrDefault() {
        return sampler == null ? SamplerSpec.DEFAULT : sampler.withDefaults();
    }

    /** {@return the metric the decision block decides on, or null for the model's primary one} */
    public String decisionMetric() {
        return decision == null ? null : decision.metric();
    }

    /** {@return the decision's tolerance, or null for the default} */
    public Double decisionTolerance() {
        return decision == null ? null : decision.tolerance();
    }

    /**
     * {@return the interval probability, decision.interval or 0.95}
     */
    public double interval() {
        return decision == null || decision.interval() == null ? 0.95 : decision.interval();
    }

    /**
     * {@return whether strict is set (warnings about the data become errors)}
     */
    public boolean isStrict() {
        return strict != null && strict;
    }

    /**
     * {@return the priors block, or an empty one}
     */
    public PriorsSpec priorsOrEmpty() {
        return priors == null ? new PriorsSpec(null, null, null, null, null, null, null) : priors;
    }
}
