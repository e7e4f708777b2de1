package dev.cairn.models;

import dev.cairn.models.spec.Spec;
import dev.cairn.models.spec.SpecReader;
import dev.cairn.models.pooled.PooledModel;
import dev.cairn.models.retention.RetentionModel;
import dev.cairn.models.segmented.SegmentedModel;
import dev.cairn.models.spend.SpendModel;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The Java API: everything the command line does, for other JVM tools to call.
 *
 * <pre>
 *   FitOutcome out = Cairn.fit(Path.of("spec.json"), FitOptions.DEFAULT);
 *   out.result().converged();  out.result().comparisons();  out.draws();
 *   ResultWriter.write(out, Path.of("out"));
 * </pre>
 * Bad input throws {@link InputException} (one line naming file, field, row or column) before anything is
 * computed or written.
 */
public final class Cairn {
    private Cairn() {
    }

    /**
     * Reads, validates and fits a spec file; data paths are relative to the spec's folder.
     *
     * @param specFile the spec
     * @param options  threads, progress, cancellation
     * @return the result, draws and figures
     * @throws InputException one line naming the file, field, row or column of bad input
     */
    public static FitOutcome fit(Path specFile, FitOptions options) {
        Spec spec = SpecReader.read(specFile);
        Path base = specFile.toAbsolutePath().getParent();
        return fit(spec, base, options);
    }

    /** Every model, by the spec's "model" name: adding a model is one line here. */
    private static final Map<String, Model> MODELS = registry(new SpendModel(), new PooledModel(),
            new SegmentedModel(), new RetentionModel());

    private static Map<String, Model> registry(Model... models) {
        Map<String, Model> out = new LinkedHashMap<>();
        for (Model m : models) {
            if (out.put(m.name(), m) != null) {
                throw new IllegalStateException("two models named " + m.name());
            }
        }
        return java.util.Collections.unmodifiableMap(out);
    }

    /**
     * The registered models, in registration order.
     *
     * @return every model cairn fits
     */
    public static java.util.Collection<Model> models() {
        return MODELS.values();
    }

    /**
     * The model of a name.
     *
     * @param name the spec's "model" value
     * @return the model
     * @throws InputException naming the known models when there is none of that name
     */
    public static Model model(String name) {
        Model m = MODELS.get(name);
        if (m == null) {
            throw new InputException("/model: unknown model '" + name + "'; known: " + String.join(", ", MODELS.keySet()));
        }
        return m;
    }

    /**
     * Fits a validated spec; relative data paths resolve against {@code baseDir}.
     *
     * @param spec    a spec from {@link SpecReader}
     * @param baseDir the folder relative data paths resolve against
     * @param options threads, progress, cancellation
     * @return the result, draws and figures
     * @throws InputException for bad data, data the model gives zero probability everywhere, or a run that
     *                        would keep more values than {@code options}' cancellation allows
     */
    public static FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        Model model = model(spec.model());
        try {
            return model.fit(spec, baseDir, options);
        } catch (dev.cairn.samplers.NoStartException e) {
            // the posterior is zero wherever the sampler looked: data the model cannot produce, not a cairn bug
            throw new InputException("/data: the model gives these data zero probability at every starting point ("
                    + e.getMessage() + "); look for counts or sums it cannot produce");
        } catch (dev.cairn.samplers.RunTooLargeException e) {
            // a limit the caller set (a service's memory bound), not the spec's own error
            throw new InputException("/sampler: the fit would keep " + e.getMessage()
                    + " here; ask for fewer chains or draws, or fit fewer cells");
        }
    }
}
