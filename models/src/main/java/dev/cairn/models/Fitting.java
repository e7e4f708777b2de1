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
     * The run settings of a sampler that needs a different warmup by default than the spec's default
     * (computed once; a warmup the spec gives wins).
     *
     * @param defaultWarmup the sampler's own default warmup, >= 0
     * @return chains, warmup, draws, thin, seed, threads
     */
    public RunSettings settingsWithWarmup(int defaultWarmup) {
        if (settings == null) {
            settings = FitSupport.runSettings(spec, options, false, defaultWarmup);
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

    /**
     * The metric the decision block decides on: the spec's {@code decision.metric} when it names one of
     * {@code available}, else {@code primary}.
     *
     * @param available the metrics this fit compares arms on
     * @param primary   the model's primary metric
     * @return the metric
     * @throws InputException when the spec names a metric this fit does not have
     */
    public dev.cairn.models.result.Metric decisionMetric(List<dev.cairn.models.result.Metric> available,
                                                        dev.cairn.models.result.Metric primary) {
        String key = spec.decisionMetric();
        if (key == null) {
            return primary;
        }
        for (dev.cairn.models.result.Metric m : available) {
            if (m.key().equals(key)) {
                return m;
            }
        }
        throw new InputException("/decision/metric: '" + key + "' is not a metric of this fit; use "
                + available.stream().map(m -> "'" + m.key() + "'").collect(java.util.stream.Collectors.joining(", ")));
    }

    /**
     * The decision block (see {@link dev.cairn.models.decision.Decisions#decide}) with the spec's tolerance,
     * interval and currency. A fit that did not converge gets no decision: outcome "no-decision", no figures.
     *
     * @param arms    the arms
     * @param control the control arm
     * @param metric  the metric decided on
     * @param drawsOf an arm's draws of the metric
     * @return the decision
     */
    public dev.cairn.models.result.Decision decide(List<String> arms, String control, dev.cairn.models.result.Metric metric,
                                                   java.util.function.Function<String, double[]> drawsOf) {
        dev.cairn.models.result.Decision d = dev.cairn.models.decision.Decisions.decide(arms, control, metric, drawsOf,
                spec.decisionTolerance(), level(), spec.currency());
        if (converged()) {
            return d;
        }
        return new dev.cairn.models.result.Decision(d.metric(), d.unit(), "no-decision", null,
                "No decision: the fit did not converge, so its numbers cannot be trusted; rerun it as the diagnostics "
                        + "advise.", d.tolerance(), d.toleranceSource(), List.of());
    }

    /** {@return "spec" when the spec names the control, "default" when it is the first arm in sorted order} */
    public String controlSource() {
        return spec.control() != null ? "spec" : "default";
    }

    /** {@return the spec's currency code, or null} */
    public String currency() {
        return spec.currency();
    }
}
