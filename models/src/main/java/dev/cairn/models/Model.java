package dev.cairn.models;

import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.List;

/**
 * One model cairn fits: its name in the spec, the data layouts it reads, the top-level spec keys that are its
 * own options, the spec rules that only it knows, and the fit. {@link Cairn} keeps the registry from name to
 * model; a new model is one package with an implementation of this interface and one line there (the
 * README's "Adding a model" lists what else to write: schema entries, a result record, tests).
 */
public interface Model {
    /**
     * The spec's {@code "model"} value.
     *
     * @return the name, e.g. "retention"
     */
    String name();

    /**
     * The {@code data.layout} values it reads.
     *
     * @return one or more layout names; the first is named in messages when the model reads just one
     */
    List<String> layouts();

    /**
     * Top-level spec keys that are this model's own options (another model's spec may not give them).
     *
     * @return the keys, e.g. ["curve", "days", "ltv"]; empty by default
     */
    default List<String> ownKeys() {
        return List.of();
    }

    /**
     * Checks the rules on a schema-valid spec for this model that the schema does not express (which priors
     * it takes, options that must come together).
     *
     * @param spec   the spec, already bound and schema-checked
     * @param origin the spec's name, the first part of every message
     * @throws InputException one line naming the field and what is wrong
     */
    void check(Spec spec, String origin);

    /**
     * Fits a validated spec.
     *
     * @param spec    the spec (checked by {@link dev.cairn.models.spec.SpecReader})
     * @param baseDir the folder relative data paths resolve against
     * @param options threads, progress, cancellation
     * @return the typed result, the draws and the report's figures
     * @throws InputException for bad data (one line naming file, row or column)
     */
    FitOutcome fit(Spec spec, Path baseDir, FitOptions options);
}
