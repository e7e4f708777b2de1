package dev.cairn.models.spend;

import dev.cairn.models.Fitting;
import dev.cairn.models.result.Metric;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitSupport;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SpendData;
import dev.cairn.models.data.SpendDataReader;
import dev.cairn.models.result.Check;
import dev.cairn.models.result.DataInfo;
import dev.cairn.models.result.Result;
import dev.cairn.models.spec.SamplerSpec;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.RunSettings;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/** A spend fit from spec to result: data, priors, sampler, derived quantities, diagnostics, decisions. */
public final class SpendFit {
    private SpendFit() {
    }

    /**
     * Fits a spend spec.
     *
     * @param spec    the validated spec
     * @param baseDir the folder relative data paths resolve against
     * @param options threads, progress, cancellation
     * @return the result, draws and the predictive checks' draws
     * @throws InputException for bad data, or an arm without payers under the default spend prior
     */
    public static FitOutcome fit(Spec spec, Path baseDir, FitOptions options) {
        Fitting fitting = Fitting.start(spec, options);
        SpendData data = SpendDataReader.read(spec.data(), baseDir, spec.isStrict());
        List<String> arms = data.armNames();
        String control = FitSupport.control(spec, arms, data.source());
        List<Metric> metrics = Metric.spend(data.hasSpend());
        Metric decided = fitting.decisionMetric(metrics, metrics.get(0));
        SpendPriors priors = spec.priorsOrEmpty().fromHistory() != null
                ? HistoryPriors.fit(spec.priorsOrEmpty().fromHistory().path(), baseDir)
                : SpendPriors.fromSpec(spec.priorsOrEmpty());

        if (data.hasSpend() && "default".equals(priors.source())) {
            for (ArmStats a : data.arms()) {
                if (a.payers() == 0) {
                    throw new InputException("arm " + a.arm() + " has no payers: under the default spend prior, which "
                            + "is deliberately vague, what its payers would spend (and so its ARPU) is unbounded; "
                            + "give priors.logSpendMean and priors.logSpendSd, priors.logSpend or priors.fromHistory");
                }
            }
        }
        SamplerSpec s = spec.samplerOrDefault();
        String method = method(s.method(), priors, data);
        RunSettings settings = fitting.settings(method.equals("exact"));

        Draws draws = method.equals("exact")
                ? SpendPosterior.exact(data, priors, settings, options.progress(), options.cancellation())
                : SpendPosterior.mcmc(data, priors, method.equals("slice"), settings, options.progress(),
                        options.cancellation());
        draws = SpendAnalysis.withDerived(draws, data);
        FitSupport.requireFinite(draws, "the spend prior is too wide for the data (spend per payer overflows); give "
                + "tighter priors.logSpendMean and priors.logSpendSd, or check the spend values");

        fitting.diagnose(draws);

        double level = fitting.level();
        SpendAnalysis.Checked checked = SpendAnalysis.checks(draws, data, s.seed(), s.chains());
        List<Check> checks = checked.checks();
        List<String> own = new ArrayList<>(data.warnings());
        own.addAll(SpendAnalysis.warnings(checks));
        List<String> warnings = fitting.warnings(own);
        for (ArmStats a : data.arms()) {
            if (data.hasSpend() && a.payers() == 0) {
                warnings.add("arm " + a.arm() + ": no payers, so its ARPPU comes from the prior alone.");
            }
        }
        long users = data.arms().stream().mapToLong(ArmStats::users).sum();
        Draws withDerived = draws;
        Result result = new Result("spend", spec.title(), fitting.converged(),
                fitting.decide(arms, control, decided, arm -> withDerived.pooled(decided.column(arm))), control,
                fitting.controlSource(), level, fitting.currency(),
                new DataInfo(data.source(), spec.data().layout(), data.rows(), users, data.query()),
                SpendAnalysis.arms(draws, data, level),
                SpendAnalysis.comparisons(draws, data, control, level), null,
                SpendAnalysis.probBest(draws, data),
                timeline(spec, baseDir, data, arms, control, decided, priors, fitting, warnings),
                checks, fitting.summary(), fitting.run(method, null),
                priors, warnings, Result.CAUTIONS);
        return new FitOutcome(result, draws, new dev.cairn.models.Figures(checked.replicated(), java.util.Map.of()));
    }

    /** The timeline when the spec maps data.columns.time, else null; a note joins the warnings when it needs one. */
    private static List<dev.cairn.models.result.TimelineDay> timeline(Spec spec, Path baseDir, SpendData data,
            List<String> arms, String control, Metric metric, SpendPriors priors, Fitting fitting, List<String> warnings) {
        if (!spec.data().mapped("time")) {
            return null;
        }
        List<dev.cairn.models.data.TimelineData.Period> periods = dev.cairn.models.data.TimelineData.read(spec.data(),
                baseDir, arms);
        SpendPriors used = priors.conjugate() ? priors : SpendPriors.fromSpec(new dev.cairn.models.spec.PriorsSpec(
                spec.priorsOrEmpty().payerRate(), null, null, null, null));
        if (!priors.conjugate() && data.hasSpend()) {
            warnings.add("timeline: computed under the conjugate default log-spend prior (exact draws each period); "
                    + "the fit itself used the spec's non-conjugate priors");
        }
        SamplerSpec s = spec.samplerOrDefault();
        return Timeline.of(periods, arms, control, metric, used, spec.decisionTolerance(), fitting.level(),
                fitting.currency(), s.seed(), s.chains() * s.draws());
    }

    /** auto: exact for conjugate priors or conversion-only data, slice sampling otherwise. */
    static String method(String requested, SpendPriors priors, SpendData data) {
        boolean conjugate = priors.conjugate() || !data.hasSpend();
        return switch (requested) {
            case "auto" -> conjugate ? "exact" : "slice";
            case "exact" -> {
                if (!conjugate) {
                    throw new InputException("/sampler/method: 'exact' needs conjugate priors");
                }
                yield "exact";
            }
            default -> requested;
        };
    }
}
