package dev.cairn.models.segmented;

import dev.cairn.models.Fitting;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.FitSupport;
import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SegmentedSpendData;
import dev.cairn.models.data.SpendDataReader;
import dev.cairn.models.result.ArmSummary;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.DataInfo;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.SegmentSummary;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.RunSettings;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** A segmented-spend fit: per-segment cells pooled hierarchically, with overall and per-segment decisions. */
public final class SegmentedFit {
    private SegmentedFit() {
    }

    static FitOutcome fit(Spec spec, SegmentedModel.Options own, Path baseDir, FitOptions options) {
        Fitting fitting = Fitting.start(spec, options);
        SegmentedSpendData data = SpendDataReader.readSegmented(spec.data(), baseDir, spec.isStrict());
        List<String> arms = data.arms();
        List<String> segments = data.segments();
        String control = FitSupport.control(spec, arms, data.source());
        List<Metric> available = Metric.spend(data.hasSpend());
        Metric decided = fitting.decisionMetric(available, available.get(0));
        String method = FitSupport.gradientMethod(spec.samplerOrDefault().method(), "segmented-spend",
                SegmentedPosterior.AUTO, SegmentedPosterior.SEGMENT_GIBBS);
        SegmentedPosterior model = new SegmentedPosterior(data, control, own.parameterisation());
        RunSettings settings = method.equals(SegmentedPosterior.SEGMENT_GIBBS)
                ? fitting.settingsWithWarmup(SegmentedPosterior.GIBBS_WARMUP) : fitting.settings(false);

        long total = 0;
        double[] weights = new double[segments.size()];
        for (int j = 0; j < segments.size(); j++) {
            for (String a : arms) {
                ArmStats c = data.cell(segments.get(j), a);
                weights[j] += c == null ? 0 : c.users();
            }
            total += (long) weights[j];
        }
        for (int j = 0; j < weights.length; j++) {
            weights[j] /= total;
        }
        Draws draws = model.sample(method, settings, options.progress(), options.cancellation(), weights);
        FitSupport.requireFinite(draws, "spend per payer overflows for these data and priors; check the spend "
                + "values (log-spend sums) or give tighter priors");
        fitting.diagnose(draws);
        double level = fitting.level();
        List<String> metrics = Metric.spend(data.hasSpend()).stream().map(Metric::key).toList();

        Map<String, long[]> totals = data.armTotals();
        Map<String, ArmSummary> overall = new LinkedHashMap<>();
        for (String a : arms) {
            overall.put(a, summary(draws, SegmentedOutputs.POPULATION, a, totals.get(a)[0], totals.get(a)[1], data, level));
        }
        List<Comparison> comparisons = new ArrayList<>();
        for (String scope : new String[] {SegmentedOutputs.POPULATION, SegmentedOutputs.TYPICAL}) {
            String label = scope.equals(SegmentedOutputs.TYPICAL) ? "typical-segment" : "population";
            dev.cairn.models.decision.Decisions.compareAll(arms, control, metrics,
                            (metric, arm) -> draws.pooled(SegmentedOutputs.cell(metric, scope, arm)), level)
                    .forEach(c -> comparisons.add(c.withScope(label, null)));
        }
        Map<String, SegmentSummary> perSegment = new LinkedHashMap<>();
        List<String> warnings = new ArrayList<>(data.warnings());
        for (String seg : segments) {
            Map<String, ArmSummary> cells = new LinkedHashMap<>();
            List<String> notes = new ArrayList<>();
            long users = 0;
            for (String a : arms) {
                ArmStats c = data.cell(seg, a);
                users += c == null ? 0 : c.users();
                if (c == null) {
                    notes.add("no users in arm " + a + ": its estimates come from the pooling alone");
                } else if (data.hasSpend() && c.payers() == 0) {
                    notes.add("no payers in arm " + a + ": its spend per payer comes from the pooling alone");
                } else if (c.users() == 1) {
                    notes.add("a single user in arm " + a);
                }
                cells.put(a, summary(draws, seg, a, c == null ? 0 : c.users(), c == null ? 0 : c.payers(), data, level));
            }
            List<Comparison> segComparisons = dev.cairn.models.decision.Decisions.compareAll(arms, control, metrics,
                            (metric, arm) -> draws.pooled(SegmentedOutputs.cell(metric, seg, arm)), level).stream()
                    .map(c -> c.withScope(null, rawLift(c.metric(), data.cell(seg, c.arm()), data.cell(seg, control))))
                    .toList();
            perSegment.put(seg, new SegmentSummary(users, cells, segComparisons, notes.isEmpty() ? null : notes));
        }
        Map<String, Map<String, Double>> probBest = new LinkedHashMap<>();
        for (String metric : metrics) {
            probBest.put(metric, dev.cairn.models.decision.Decisions.probBest(arms,
                    arm -> draws.pooled(SegmentedOutputs.cell(metric, SegmentedOutputs.POPULATION, arm))));
        }
        Result result = new Result("segmented-spend", spec.title(), fitting.converged(),
                fitting.decide(arms, control, decided,
                        arm -> draws.pooled(SegmentedOutputs.cell(decided.key(), SegmentedOutputs.POPULATION, arm))),
                control, fitting.controlSource(), level, fitting.currency(),
                new DataInfo(data.source(), spec.data().layout(), data.rows(), total, data.query()), overall,
                comparisons, perSegment, probBest, null, List.of(), fitting.summary(),
                fitting.run(method, model.layout.describe(own.parameterisation())),
                new dev.cairn.models.result.PriorsUsed.Documented("documented in SegmentedDensity: alpha0 ~ N(-3, 2^2); D, E ~ N(0, 1); "
                        + "beta0 ~ N(0, 5^2); s0 ~ N(0, 1); tauAlpha, tauBeta ~ half-N(1); tauD, tauE, tauS ~ half-N(0.5)"),
                fitting.warnings(warnings), Result.CAUTIONS);
        return new FitOutcome(result, draws);
    }

    private static ArmSummary summary(Draws draws, String scope, String arm, long users, long payers,
                                      SegmentedSpendData data, double level) {
        Interval rate = Interval.of(draws.pooled(SegmentedOutputs.cell(Metric.PAYER_RATE.key(), scope, arm)), level);
        if (!data.hasSpend()) {
            return new ArmSummary(users, payers, null, rate, null);
        }
        return new ArmSummary(users, payers, Interval.of(draws.pooled(SegmentedOutputs.cell(Metric.ARPU.key(), scope, arm)), level),
                rate, Interval.of(draws.pooled(SegmentedOutputs.cell(Metric.ARPPU.key(), scope, arm)), level));
    }

    /**
     * The lift from the segment's own data: payer rate m/n; ARPPU spend / payers (or, from a summary, the
     * lognormal plug-in exp(ybar + s^2/2)); ARPU = payer rate x ARPPU. Null when either side has none.
     */
    static Double rawLift(String metric, ArmStats arm, ArmStats control) {
        double a = raw(metric, arm), c = raw(metric, control);
        return Double.isFinite(a) && Double.isFinite(c) && c > 0 ? a / c - 1 : null;
    }

    private static double raw(String metric, ArmStats s) {
        if (s == null || s.users() == 0) {
            return Double.NaN;
        }
        double rate = (double) s.payers() / s.users();
        if (metric.equals(Metric.PAYER_RATE.key())) {
            return rate;
        }
        double arppu;
        if (!Double.isNaN(s.spendSum())) {
            arppu = s.payers() == 0 ? Double.NaN : s.spendSum() / s.payers();
        } else if (s.payers() >= 2) {
            double v = s.logSpendSquaredDeviations() / (s.payers() - 1);
            arppu = Math.exp(s.meanLogSpend() + v / 2);
        } else {
            arppu = Double.NaN;
        }
        return metric.equals(Metric.ARPPU.key()) ? arppu : rate * arppu;
    }
}
