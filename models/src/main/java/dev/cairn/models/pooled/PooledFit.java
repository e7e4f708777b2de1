package dev.cairn.models.pooled;

import dev.cairn.models.Fitting;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.data.Estimates;
import dev.cairn.models.result.DataInfo;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.PooledResult;
import dev.cairn.models.result.Result;
import dev.cairn.models.spec.SamplerSpec;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.RunSettings;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** A pooled-effects fit from spec to result. */
public final class PooledFit {
    private PooledFit() {
    }

    /**
     * Fits a pooled-effects spec.
     *
     * @param spec    the validated spec
     * @param baseDir the folder relative data paths resolve against
     * @param options threads, progress, cancellation
     * @return the result and draws
     * @throws InputException for bad data or sampler.method 'exact'
     */
    public static FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        Fitting fitting = Fitting.start(spec, options);
        Estimates data = Estimates.read(spec.data(), baseDir);
        PooledPriors priors = PooledPriors.of(spec.priorsOrEmpty(), data);
        SamplerSpec s = spec.samplerOrDefault();
        if ("exact".equals(s.method())) {
            throw new InputException("/sampler/method: pooled-effects has no closed-form posterior; use 'auto' "
                    + "(slice sampling of tau with mu and the effects drawn exactly)");
        }
        RunSettings settings = fitting.settings(false);
        Draws draws = PooledEffectsPosterior.sample(data, priors, settings, options.progress(), options.cancellation());

        fitting.diagnose(draws);
        double level = fitting.level();
        Map<String, Interval> effects = new LinkedHashMap<>();
        Map<String, PooledResult.Raw> raw = new LinkedHashMap<>();
        Map<String, Double> positive = new LinkedHashMap<>();
        for (int j = 0; j < data.size(); j++) {
            String name = data.names().get(j);
            double[] theta = draws.pooled(PooledEffectsPosterior.effect(name));
            effects.put(name, Interval.of(theta, level));
            raw.put(name, new PooledResult.Raw(data.estimate()[j], data.se()[j]));
            long above = 0;
            for (double t : theta) {
                above += t > 0 ? 1 : 0;
            }
            positive.put(name, (double) above / theta.length);
        }
        Interval predictive = Interval.of(draws.pooled(PooledEffectsPosterior.PREDICTIVE), level);
        PooledResult.InformedPrior informed = new PooledResult.InformedPrior("normal", predictive.mean(), predictive.sd());
        PooledResult result = new PooledResult("pooled-effects", spec.title(), fitting.converged(), level,
                new DataInfo(data.source(), "estimates", data.size(), 0, data.query()), effects, raw, positive,
                Interval.of(draws.pooled(PooledEffectsPosterior.MU), level),
                Interval.of(draws.pooled(PooledEffectsPosterior.TAU), level), predictive, informed,
                fitting.summary(), fitting.run("collapsed-slice", null),
                priors, fitting.warnings(List.of()), Result.CAUTIONS);
        return new FitOutcome(result, draws);
    }
}
