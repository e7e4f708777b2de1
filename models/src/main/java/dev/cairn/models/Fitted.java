package dev.cairn.models;

import dev.cairn.models.result.FitResult;
import dev.cairn.models.result.PooledResult;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.RetentionResult;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import java.nio.file.Path;
import java.util.Set;

/**
 * A finished fit with its result typed by the kind of model, for library callers: {@link #revenue},
 * {@link #retention} and {@link #pooled} fit a spec of that kind and hand back its own result type, so the
 * caller never casts. A spec of another kind is refused in one line naming the entry point to use.
 *
 * @param result  the result, as result.json holds it
 * @param draws   every draw (derived quantities included)
 * @param outcome the untyped outcome (figures for plots, what the report reads)
 * @param <R>     the result type
 */
public record Fitted<R extends FitResult>(R result, Draws draws, FitOutcome outcome) {
    private static final Set<String> REVENUE = Set.of("spend", "segmented-spend");

    /**
     * Fits a {@code spend} or {@code segmented-spend} spec.
     *
     * @param spec    a validated spec
     * @param baseDir where relative data paths resolve
     * @param options threads, progress, cancellation
     * @return the fit with its {@link Result}
     * @throws InputException for bad input, or a spec of another model
     */
    public static Fitted<Result> revenue(Spec spec, Path baseDir, FitOptions options) {
        return fit(spec, baseDir, options, Result.class, REVENUE, "revenue");
    }

    /**
     * Fits a {@code retention} spec.
     *
     * @param spec    a validated spec
     * @param baseDir where relative data paths resolve
     * @param options threads, progress, cancellation
     * @return the fit with its {@link RetentionResult}
     * @throws InputException for bad input, or a spec of another model
     */
    public static Fitted<RetentionResult> retention(Spec spec, Path baseDir, FitOptions options) {
        return fit(spec, baseDir, options, RetentionResult.class, Set.of("retention"), "retention");
    }

    /**
     * Fits a {@code pooled-effects} spec.
     *
     * @param spec    a validated spec
     * @param baseDir where relative data paths resolve
     * @param options threads, progress, cancellation
     * @return the fit with its {@link PooledResult}
     * @throws InputException for bad input, or a spec of another model
     */
    public static Fitted<PooledResult> pooled(Spec spec, Path baseDir, FitOptions options) {
        return fit(spec, baseDir, options, PooledResult.class, Set.of("pooled-effects"), "pooled");
    }

    private static <R extends FitResult> Fitted<R> fit(Spec spec, Path baseDir, FitOptions options, Class<R> type,
                                                       Set<String> models, String entry) {
        if (!models.contains(spec.model())) {
            String use = REVENUE.contains(spec.model()) ? "revenue" : "pooled-effects".equals(spec.model()) ? "pooled"
                    : "retention";
            throw new InputException("/model: '" + spec.model() + "' is not fitted by Fitted." + entry + "; use Fitted."
                    + use);
        }
        FitOutcome outcome = Cairn.fit(spec, baseDir, options);
        return new Fitted<>(type.cast(outcome.result()), outcome.draws(), outcome);
    }
}
