package dev.cairn.models;

import dev.cairn.diagnostics.DiagnosticsReport;
import dev.cairn.models.result.DiagnosticsSummary;
import dev.cairn.models.result.Run;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.RunSettings;
import java.util.ArrayList;
import java.util.List;

/**
 * The steps every model's fit shares, done one way: the timer, the run settings, the diagnostics and the
 * not-converged warning that goes first, the interval level, and the {@code run} block with the method, the
 * seconds and the version. One per fit call; a model's fit reads its data, samples, builds its own
 * summaries, and asks this for the rest.
 */
public final class Fitting {
    private final long start = System.nanoTime();
    private final Spec spec;
    private final FitOptions options;
    private RunSettings settings;
    private DiagnosticsReport report;

    private Fitting(Spec spec, FitOptions options) {
        this.spec = spec;
        this.options = options;
    }

    /**
     * Starts the timer of one fit.
     *
     * @param spec    the validated spec
     * @param options threads, progress, cancellation
     * @return the fit's shared steps
     */
    public static Fitting start(Spec spec, FitOptions options) {
        return new Fitting(spec, options);
    }

    /**
     * The run settings from the spec's sampler block and the options (computed once).
     *
     * @param exact whether the draws are exact (no warmup)
     * @return chains, warmup, draws, thin, seed, threads
     */
    public RunSettings settings(boolean exact) {
        if (settings == null) {
            settings = FitSupport.runSettings(spec, options, exact);
        }
        return settings;
    }

    /**
     * Diagnoses the draws against the spec's convergence thresholds (kept for {@link #warnings} and
     * {@link #summary}).
     *
     * @param draws every named quantity's draws
     * @return the report
     */
    public DiagnosticsReport diagnose(Draws draws) {
        report = FitSupport.diagnose(draws, spec);
        return report;
    }

    /**
     * The interval level of every reported interval.
     *
     * @return the spec's decision.interval, default 0.95
     */
    public double level() {
        return spec.interval();
    }

    /**
     * The result's warnings: the not-converged warning first when the fit did not converge, then the model's.
     *
     * @param others the model's own warnings, in order
     * @return a new mutable list
     * @throws IllegalStateException before {@link #diagnose}
     */
    public List<String> warnings(List<String> others) {
        List<String> out = new ArrayList<>();
        if (!report().converged()) {
            out.add(FitSupport.notConverged(report));
        }
        out.addAll(others);
        return out;
    }

    /**
     * The diagnostics block of the result.
     *
     * @return thresholds, worst values and reasons
     * @throws IllegalStateException before {@link #diagnose}
     */
    public DiagnosticsSummary summary() {
        return DiagnosticsSummary.of(report());
    }

    /**
     * Whether every quantity passed the thresholds.
     *
     * @return the report's verdict
     * @throws IllegalStateException before {@link #diagnose}
     */
    public boolean converged() {
        return report().converged();
    }

    /**
     * The run block: what ran, with the settings, the seconds since {@link #start} and the version.
     *
     * @param method           the sampler that ran
     * @param parameterisation what the sampler's coordinates were, or null
     * @return the record
     * @throws IllegalStateException before {@link #settings}
     */
    public Run run(String method, String parameterisation) {
        if (settings == null) {
            throw new IllegalStateException("run settings not computed yet");
        }
        double seconds = Math.round((System.nanoTime() - start) / 1e6) / 1e3;
        return new Run(method, settings.chains(), settings.warmup(), settings.draws(), settings.thin(), settings.seed(),
                seconds, Version.get(), parameterisation);
    }

    private DiagnosticsReport report() {
        if (report == null) {
            throw new IllegalStateException("the draws are not diagnosed yet");
        }
        return report;
    }
}
