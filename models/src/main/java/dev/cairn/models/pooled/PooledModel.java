package dev.cairn.models.pooled;

import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.Model;
import dev.cairn.models.spec.PriorsSpec;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.List;

/** {@code "model": "pooled-effects"}: estimates with standard errors pooled hierarchically ({@link PooledFit}). */
public final class PooledModel implements Model {
    @Override
    public String name() {
        return "pooled-effects";
    }

    @Override
    public List<String> layouts() {
        return List.of("estimates");
    }

    @Override
    public void check(Spec spec, String origin) {
        PriorsSpec p = spec.priorsOrEmpty();
        if (p.anySpend()) {
            throw new InputException(origin + ": /priors: pooled-effects takes 'mu' and 'tau' priors only");
        }
        if (p.tau() != null && "uniform".equals(p.tau().family()) && !(p.tau().upper() > p.tau().lower())) {
            throw new InputException(origin + ": /priors/tau: upper must be greater than lower, was lower "
                    + p.tau().lower() + ", upper " + p.tau().upper());
        }
    }

    @Override
    public FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        return PooledFit.fit(spec, baseDir, options);
    }
}
