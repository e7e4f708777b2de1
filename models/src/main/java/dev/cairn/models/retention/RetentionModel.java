package dev.cairn.models.retention;

import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.Model;
import dev.cairn.models.spec.PriorsSpec;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.List;

/** {@code "model": "retention"}: drifting retention curves per install cohort, with LTV ({@link RetentionFit}). */
public final class RetentionModel implements Model {
    /**
     * The model's own spec options.
     *
     * @param curve "activity" or "survival" (required)
     * @param days  the days reported, default [1, 7, 30]
     * @param ltv   LTV horizon and revenue per active day, or null
     */
    public record Options(String curve, List<Integer> days, Ltv ltv) {
        /**
         * The days reported.
         *
         * @return {@link #days}, or [1, 7, 30] when the spec gives none
         */
        public List<Integer> daysOrDefault() {
            return days == null ? List.of(1, 7, 30) : days;
        }
    }

    /**
     * LTV options.
     *
     * @param horizon             days
     * @param revenuePerActiveDay a number, or {"path": "file"} with a per-user table
     */
    public record Ltv(int horizon, com.fasterxml.jackson.databind.JsonNode revenuePerActiveDay) {
    }

    @Override
    public String name() {
        return "retention";
    }

    @Override
    public List<String> layouts() {
        return List.of("cohort-days", "activity");
    }

    @Override
    public List<String> ownKeys() {
        return List.of("curve", "days", "ltv");
    }

    @Override
    public void check(Spec spec, String origin) {
        if (spec.options(Options.class).curve() == null) {
            throw new InputException(origin + ": /curve: required for model 'retention' ('activity' or 'survival')");
        }
        PriorsSpec p = spec.priorsOrEmpty();
        if (p.anySpend() || p.mu() != null || p.tau() != null) {
            throw new InputException(origin + ": /priors: retention uses its own documented priors; remove them");
        }
    }

    @Override
    public FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        return RetentionFit.fit(spec, spec.options(Options.class), baseDir, options);
    }
}
