package dev.cairn.models.segmented;

import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.Model;
import dev.cairn.models.spec.PriorsSpec;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.List;

/** {@code "model": "segmented-spend"}: spend per arm pooled over segments ({@link SegmentedFit}). */
public final class SegmentedModel implements Model {
    /**
     * The model's own spec option.
     *
     * @param parameterisation "centred" or "non-centred" for every segment; null: chosen per segment
     */
    public record Options(String parameterisation) {
    }

    @Override
    public String name() {
        return "segmented-spend";
    }

    @Override
    public List<String> layouts() {
        return List.of("users", "summary");
    }

    @Override
    public List<String> ownKeys() {
        return List.of("parameterisation");
    }

    @Override
    public void check(Spec spec, String origin) {
        PriorsSpec p = spec.priorsOrEmpty();
        if (p.anySpend()) {
            throw new InputException(origin + ": /priors: segmented-spend uses its own documented hierarchical "
                    + "priors; remove the spend priors");
        }
        p.refusePooledPriors(origin, name());
    }

    @Override
    public FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        return SegmentedFit.fit(spec, spec.options(Options.class), baseDir, options);
    }
}
