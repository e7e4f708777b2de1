package dev.cairn.models;

import dev.cairn.models.spec.Spec;
import dev.cairn.models.spec.SpecReader;
import dev.cairn.models.pooled.PooledFit;
import dev.cairn.models.retention.RetentionFit;
import dev.cairn.models.segmented.SegmentedFit;
import dev.cairn.models.spend.SpendFit;
import java.nio.file.Path;

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

    /** Reads, validates and fits a spec file; data paths are relative to the spec's folder. */
    public static FitOutcome fit(Path specFile, FitOptions options) {
        Spec spec = SpecReader.read(specFile);
        Path base = specFile.toAbsolutePath().getParent();
        return fit(spec, base, options);
    }

    /** Fits a validated spec; relative data paths resolve against {@code baseDir}. */
    public static FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        try {
            return switch (spec.model()) {
                case "spend" -> SpendFit.fit(spec, baseDir, options);
                case "pooled-effects" -> PooledFit.fit(spec, baseDir, options);
                case "segmented-spend" -> SegmentedFit.fit(spec, baseDir, options);
                case "retention" -> RetentionFit.fit(spec, baseDir, options);
                default -> throw new InputException("/model: unknown model '" + spec.model() + "'");
            };
        } catch (dev.cairn.samplers.NoStartException e) {
            // the posterior is zero wherever the sampler looked: data the model cannot produce, not a cairn bug
            throw new InputException("/data: the model gives these data zero probability at every starting point ("
                    + e.getMessage() + "); look for counts or sums it cannot produce");
        }
    }
}
