package dev.cairn.models.spend;

import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.Model;
import dev.cairn.models.spec.PriorsSpec;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.List;

/** {@code "model": "spend"}: conversion and zero-inflated lognormal spend per arm ({@link SpendFit}). */
public final class SpendModel implements Model {
    @Override
    public String name() {
        return "spend";
    }

    @Override
    public List<String> layouts() {
        return List.of("users", "summary");
    }

    @Override
    public void check(Spec spec, String origin) {
        PriorsSpec p = spec.priorsOrEmpty();
        p.refusePooledPriors(origin, name());
        if (p.logSpend() != null && p.nonConjugate()) {
            throw new InputException(origin + ": /priors: give either 'logSpend' (conjugate) or 'logSpendMean' and "
                    + "'logSpendSd' (non-conjugate), not both");
        }
        if (p.nonConjugate() && (p.logSpendMean() == null || p.logSpendSd() == null)) {
            throw new InputException(origin + ": /priors/" + (p.logSpendMean() == null ? "logSpendMean" : "logSpendSd")
                    + ": required with '" + (p.logSpendMean() == null ? "logSpendSd" : "logSpendMean") + "'");
        }
        if (p.fromHistory() != null && (p.logSpend() != null || p.nonConjugate() || p.payerRate() != null)) {
            throw new InputException(origin + ": /priors/fromHistory: fits the payer-rate and log-spend priors itself; "
                    + "remove 'payerRate', 'logSpend', 'logSpendMean' and 'logSpendSd'");
        }
        if ("exact".equals(spec.samplerOrDefault().method()) && p.nonConjugate()) {
            throw new InputException(origin + ": /sampler/method: 'exact' needs conjugate priors, but 'logSpendMean'/"
                    + "'logSpendSd' are not; use 'auto', 'slice' or 'metropolis-within-gibbs'");
        }
    }

    @Override
    public FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        return SpendFit.fit(spec, baseDir, options);
    }
}
