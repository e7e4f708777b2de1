package dev.cairn.models.retention;

import dev.cairn.models.Fitting;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.FitSupport;
import dev.cairn.models.InputException;
import dev.cairn.models.data.CohortDays;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.DataInfo;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.CohortRow;
import dev.cairn.models.result.Ltv;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.RetentionArm;
import dev.cairn.models.result.RetentionResult;
import dev.cairn.models.spec.Spec;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.RandomStreams;
import dev.cairn.samplers.RunSettings;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/** A retention fit: cohort curves with drift and censoring, day-N retention per arm, comparisons, LTV. */
public final class RetentionFit {
    private RetentionFit() {
    }

    static FitOutcome fit(Spec spec, RetentionModel.Options own, Path baseDir, FitOptions options) {
        Fitting fitting = Fitting.start(spec, options);
        boolean survival = "survival".equals(own.curve());
        List<Integer> days = own.daysOrDefault();
        if (days.stream().distinct().count() != days.size()) {
            throw new InputException("/days: each day once, was " + days);
        }
        CohortDays data = CohortDays.read(spec.data(), baseDir, survival);
        List<String> arms = data.arms();
        // One arm (no arm column) is a plain curve fit with nothing to compare; otherwise arms need a control.
        String control = arms.size() == 1 && (spec.control() == null || spec.control().equals(arms.get(0)))
                ? arms.get(0) : FitSupport.control(spec, arms, data.source());
        List<Metric> available = new ArrayList<>();
        days.forEach(d -> available.add(Metric.day(d)));
        if (own.ltv() != null) {
            available.add(Metric.LTV);
        }
        Metric decided = fitting.decisionMetric(available, own.ltv() != null ? Metric.LTV : available.get(0));
        String method = FitSupport.gradientMethod(spec.samplerOrDefault().method(), "retention",
                RetentionPosterior.AUTO, RetentionPosterior.LAPLACE_METROPOLIS);
        RetentionPosterior model = new RetentionPosterior(data, control, survival, method.equals(RetentionPosterior.LAPLACE_METROPOLIS));
        RunSettings settings = fitting.settings(false);
        Draws internal = model.sample(method, settings, options.progress(), options.cancellation());

        int horizon = own.ltv() == null ? 0 : own.ltv().horizon();
        double[][] revenue = own.ltv() == null ? null
                : revenueDraws(own.ltv(), baseDir, arms, settings.chains() * settings.draws(), settings.seed(), settings.chains());
        Draws draws = RetentionOutputs.of(internal, model, data.cohorts(), arms, days, horizon, revenue);
        fitting.diagnose(draws);
        double level = fitting.level();

        Map<String, RetentionArm> armOut = new LinkedHashMap<>();
        for (int k = 0; k < arms.size(); k++) {
            long installs = 0;
            for (int c = 0; c < data.cohorts().size(); c++) {
                installs += data.installs(c, k);
            }
            Map<String, Interval> retention = new LinkedHashMap<>();
            for (int d : days) {
                retention.put(RetentionOutputs.day(d), Interval.of(draws.pooled(RetentionOutputs.day(d) + "[" + arms.get(k) + "]"), level));
            }
            armOut.put(arms.get(k), new RetentionArm(installs, retention));
        }
        List<String> metrics = new ArrayList<>();
        days.forEach(d -> metrics.add(RetentionOutputs.day(d)));
        if (revenue != null) {
            metrics.add(Metric.LTV.key());
        }
        List<Comparison> comparisons = dev.cairn.models.decision.Decisions.compareAll(arms, control, metrics,
                (metric, arm) -> draws.pooled(metric + "[" + arm + "]"), level);
        List<CohortRow> cohorts = new ArrayList<>();
        for (int c = 0; c < data.cohorts().size(); c++) {
            for (int k = 0; k < arms.size(); k++) {
                if (data.installs(c, k) == 0) {
                    continue;
                }
                String cohort = data.cohorts().get(c), arm = arms.get(k);
                int last = data.lastObservedDay(c, k);
                Map<String, Interval> byDay = new LinkedHashMap<>();
                List<String> projected = new ArrayList<>();
                for (int d : days) {
                    byDay.put(RetentionOutputs.day(d), Interval.of(draws.pooled(RetentionOutputs.cell(RetentionOutputs.day(d), cohort, arm)), level));
                    if (d > last) {
                        projected.add(RetentionOutputs.day(d));
                    }
                }
                cohorts.add(new CohortRow(cohort, arm, data.installs(c, k), last, byDay, projected,
                        survival ? Interval.of(draws.pooled(RetentionOutputs.cell("alpha", cohort, arm)), level) : null,
                        survival ? Interval.of(draws.pooled(RetentionOutputs.cell("beta", cohort, arm)), level) : null));
            }
        }
        Map<String, Interval> drift = new LinkedHashMap<>();
        drift.put("level", Interval.of(draws.pooled("driftLevel"), level));
        drift.put("slope", Interval.of(draws.pooled("driftSlope"), level));
        Ltv ltv = null;
        if (revenue != null) {
            Map<String, Interval> byArm = new LinkedHashMap<>();
            for (String a : arms) {
                byArm.put(a, Interval.of(draws.pooled("ltv[" + a + "]"), level));
            }
            ltv = new Ltv(horizon, byArm);
        }
        RetentionResult.Priors priors = new RetentionResult.Priors("RetentionPosterior: " + (survival
                ? "log alpha_1 ~ N(0, 1.5^2), log beta_1 ~ N(1, 1.5^2)"
                : "day-7 logit level_1 ~ N(-1.5, 2^2), slope_1 ~ N(-0.6, 1), log kappa ~ N(log 100, 1.5^2)")
                + "; arm offsets ~ N(0, 1); drift scales ~ half-N(0.25)");
        RetentionResult result = new RetentionResult("retention", spec.title(), fitting.converged(),
                arms.size() < 2 ? null : fitting.decide(arms, control, decided, arm -> draws.pooled(decided.column(arm))),
                own.curve(), control, arms.size() < 2 ? null : fitting.controlSource(), level, fitting.currency(), days, new DataInfo(data.source(), "cohort-days", data.rows(), 0, null), armOut, comparisons,
                cohorts, drift, ltv, fitting.summary(), fitting.run(method, null),
                priors, fitting.warnings(List.of()), Result.CAUTIONS);
        return new FitOutcome(result, draws, curveBands(internal, model, data, days, level, horizon));
    }

    /**
     * For plots: per arm, the install-weighted curve's {mean, lo, median, hi} at every day 1..T (T the
     * largest of the LTV horizon, the requested days and half again the last observed day), the observed share per day pooled over the cohorts that
     * reached it, and the last day any cohort reached.
     */
    static dev.cairn.models.Figures curveBands(Draws internal, RetentionPosterior m, CohortDays data, List<Integer> days,
                                                    double level, int horizon) {
        // Plot beyond the data: to the LTV horizon, the largest requested day, or half again the last observed day.
        int maxDay = Math.max(horizon, days.stream().mapToInt(Integer::intValue).max().orElse(30));
        for (int c = 0; c < data.cohorts().size(); c++) {
            for (int k = 0; k < data.arms().size(); k++) {
                maxDay = Math.max(maxDay, data.lastObservedDay(c, k) * 3 / 2);
            }
        }
        int total = internal.chains() * internal.iterations();
        int step = Math.max(1, total / 400);
        int kept = (total + step - 1) / step;
        java.util.Map<String, dev.cairn.models.Figures.Curve> out = new LinkedHashMap<>();
        double[] x = new double[m.size], coordinates = new double[m.size];
        double[][] columns = new double[m.size][];
        for (int i = 0; i < m.size; i++) {
            columns[i] = internal.pooled(m.parameters.name(i));
        }
        double[] curve = new double[maxDay + 1];
        for (int k = 0; k < data.arms().size(); k++) {
            double[][] byDay = new double[maxDay + 1][kept];
            int j = 0;
            for (int draw = 0; draw < total; draw += step, j++) {
                for (int i = 0; i < m.size; i++) {
                    coordinates[i] = columns[i][draw];
                }
                m.centred(coordinates, x);
                double installs = 0;
                double[] sum = new double[maxDay + 1];
                for (int c = 0; c < data.cohorts().size(); c++) {
                    double w = data.installs(c, k);
                    if (w == 0) {
                        continue;
                    }
                    installs += w;
                    RetentionOutputs.series(m, x, c, k, curve);
                    for (int t = 1; t <= maxDay; t++) {
                        sum[t] += w * curve[t];
                    }
                }
                for (int t = 1; t <= maxDay; t++) {
                    byDay[t][j] = installs == 0 ? 0 : sum[t] / installs;
                }
            }
            double[][] band = new double[maxDay + 1][];
            for (int t = 1; t <= maxDay; t++) {
                Interval i = Interval.of(byDay[t], level);
                band[t] = new double[] {i.mean(), i.lo(), i.median(), i.hi()};
            }
            double[] observed = new double[maxDay + 1];
            java.util.Arrays.fill(observed, Double.NaN);
            double[] active = new double[maxDay + 1], installed = new double[maxDay + 1];
            int last = 0;
            for (int c = 0; c < data.cohorts().size(); c++) {
                for (java.util.Map.Entry<Integer, Long> e : data.observed(c, k).entrySet()) {
                    active[e.getKey()] += e.getValue();
                    installed[e.getKey()] += data.installs(c, k);
                    last = Math.max(last, e.getKey());
                }
            }
            for (int t = 1; t <= maxDay; t++) {
                if (installed[t] > 0) {
                    observed[t] = active[t] / installed[t];
                }
            }
            out.put(data.arms().get(k), new dev.cairn.models.Figures.Curve(band, observed, last));
        }
        return new dev.cairn.models.Figures(java.util.Map.of(), out);
    }

    /** Revenue per active day per arm and draw: a fixed number, or R + se z from a table (seeded). */
    static double[][] revenueDraws(RetentionModel.Ltv ltv, Path baseDir, List<String> arms, int total, long seed, int chains) {
        com.fasterxml.jackson.databind.JsonNode v = ltv.revenuePerActiveDay();
        double[][] out = new double[arms.size()][total];
        if (v.isNumber()) {
            for (double[] row : out) {
                java.util.Arrays.fill(row, v.doubleValue());
            }
            return out;
        }
        Map<String, double[]> estimates = RevenuePerActiveDay.read(v.get("path").asText(), baseDir);
        UniformRandomProvider rng = RandomStreams.forChain(seed, chains + 1);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        for (int k = 0; k < arms.size(); k++) {
            double[] e = estimates.get(arms.get(k));
            if (e == null) {
                throw new InputException(v.get("path").asText() + ": no revenue rows for arm '" + arms.get(k) + "'");
            }
            for (int i = 0; i < total; i++) {
                out[k][i] = Math.max(0, e[0] + e[1] * g.sample());
            }
        }
        return out;
    }
}
