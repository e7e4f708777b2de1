package dev.cairn.cli.report;

import static dev.cairn.cli.report.HtmlReport.esc;

import dev.cairn.models.ResultWriter;
import dev.cairn.models.plan.PlanResult;
import dev.cairn.models.result.Format;
import dev.cairn.models.result.Metric;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The plan's report.html: the figures at the stop first, then charts over the look days — how many tests have
 * stopped, how often a worse or the best arm is shipped, the days to the stop, the expected loss — each
 * beside the same figure for a test analysed once on that day, and the table of every look day.
 */
public final class PlanReport {
    private PlanReport() {
    }

    /**
     * Writes DIR/report.html.
     *
     * @param plan   the plan's figures
     * @param source the plan spec's name
     * @param dir    the folder
     * @return the file
     */
    public static Path write(PlanResult plan, String source, Path dir) {
        Path target = dir.resolve(ReportWriter.REPORT);
        String html = render(plan, source);
        try {
            ResultWriter.atomically(target, w -> w.write(html));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return target;
    }

    /**
     * A share of simulated tests as a percentage with one decimal (counted, so 0 and 1 are exact).
     *
     * @param share the share
     * @return e.g. "4.5%"
     */
    public static String pct(double share) {
        return String.format(Locale.ROOT, "%.1f%%", 100 * share);
    }

    /**
     * The report's HTML.
     *
     * @param plan   the figures
     * @param source the plan spec's name
     * @return the page
     */
    public static String render(PlanResult plan, String source) {
        PlanResult.Settings s = plan.settings();
        Metric metric = Metric.of(s.metric());
        StringBuilder sb = new StringBuilder(1 << 15);
        String title = plan.title() != null ? plan.title() : "cairn plan: " + s.arms().size() + " arms on " + metric.label();
        sb.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>").append(esc("cairn plan: " + title))
                .append("</title><style>").append(HtmlReport.STYLE).append("</style></head><body>\n");
        sb.append("<header><h1>").append(esc(title)).append("</h1><div class=\"meta\">plan ").append(esc(source))
                .append(" &middot; ").append(String.format(Locale.ROOT, "%,d", s.experiments())).append(" simulated tests")
                .append(" &middot; seed ").append(s.seed()).append(" &middot; method ").append(esc(s.method()))
                .append(" &middot; ").append(String.format(Locale.ROOT, "%.1f", plan.run().seconds())).append(" s &middot; cairn ").append(esc(plan.run().version()))
                .append("</div>");
        if (!plan.warnings().isEmpty()) {
            sb.append("<div class=\"warnings\" id=\"warnings\"><strong>Warnings</strong><ul>");
            plan.warnings().forEach(w -> sb.append("<li>").append(esc(w)).append("</li>"));
            sb.append("</ul></div>");
        }
        sb.append("<div class=\"cautions\"><p>").append(esc("These figures describe the decision rule under the assumed "
                + "truth; if the truth differs, so do they.")).append("</p>");
        plan.cautions().forEach(c -> sb.append("<p>").append(esc(c)).append("</p>"));
        sb.append("</div></header>\n<main>\n");
        summary(sb, plan, metric);
        charts(sb, plan, metric);
        assumptions(sb, plan, metric);
        dayTable(sb, plan, metric);
        sb.append("</main></body></html>\n");
        return sb.toString();
    }

    private static void summary(StringBuilder sb, PlanResult plan, Metric metric) {
        PlanResult.Settings s = plan.settings();
        PlanResult.AtStop a = plan.atStop();
        sb.append("<section id=\"at-stop\"><h2>At the stop</h2><p>").append(esc(ruleText(s, metric))).append("</p><table>");
        row(sb, "decided by day " + s.maxDays(), pct(a.decidedShare()) + " (ship " + pct(a.shipShare()) + ", keep the control "
                + pct(a.keepControlShare()) + ")");
        row(sb, "undecided at day " + s.maxDays() + " (the control is kept)", pct(a.undecidedShare()));
        row(sb, a.power() != null ? "power (ships an arm)" : "assurance (ships an arm, averaged over the drawn effects)",
                pct(a.power() != null ? a.power() : a.assurance()));
        row(sb, "ships an arm truly worse than the control", pct(a.shipWorseShare()));
        row(sb, "ships an arm truly no better than the control", pct(a.shipNotBetterShare()));
        row(sb, "ships the truly best arm", pct(a.shipBestShare()));
        row(sb, "ends on the truly best arm (shipped, or the control kept)", pct(a.pickBestShare()));
        row(sb, "expected loss at the stop (posterior)", metric.amount(a.expectedLoss(), s.currency()));
        row(sb, "realised loss at the stop (true best less the arm acted on)", metric.amount(a.realisedLoss(), s.currency()));
        PlanResult.Duration d = a.duration();
        row(sb, "days to the stop", String.format(Locale.ROOT, "median %d (10%%: %d, 25%%: %d, 75%%: %d, 90%%: %d), mean %.1f",
                d.median(), d.p10(), d.p25(), d.p75(), d.p90(), d.mean()));
        sb.append("</table></section>\n");
    }

    /**
     * The rule and the schedule in one sentence.
     *
     * @param s      the settings
     * @param metric the metric
     * @return the sentence
     */
    public static String ruleText(PlanResult.Settings s, Metric metric) {
        String rule = s.rule().equals("expected-loss")
                ? "act once the best-looking arm's expected loss on " + metric.label() + " is below "
                + (s.tolerance() != null ? metric.amount(s.tolerance(), s.currency()) : "1% of the control's posterior mean")
                : "ship the arm most likely above the control once P(above) > " + s.threshold();
        return "Rule: " + rule + "; looks on day " + s.minDays() + (s.lookEvery() == 1 ? " and every day after"
                : " and every " + s.lookEvery() + " days after") + ", until day " + s.maxDays() + ". Control: "
                + s.control() + ".";
    }

    private static void row(StringBuilder sb, String what, String value) {
        sb.append("<tr><td>").append(esc(what)).append("</td><td>").append(esc(value)).append("</td></tr>");
    }

    private static void charts(StringBuilder sb, PlanResult plan, Metric metric) {
        List<PlanResult.Day> days = plan.days();
        int[] x = days.stream().mapToInt(PlanResult.Day::day).toArray();
        double[] stopped = days.stream().mapToDouble(d -> d.sequential().stoppedShare()).toArray();
        double[] decided = days.stream().mapToDouble(d -> d.fixed().decidedShare()).toArray();
        double[] worseSeq = days.stream().mapToDouble(d -> d.sequential().shipWorseShare()).toArray();
        double[] worseFixed = days.stream().mapToDouble(d -> d.fixed().shipWorseShare()).toArray();
        double[] bestSeq = days.stream().mapToDouble(d -> d.sequential().shipBestShare()).toArray();
        double[] bestFixed = days.stream().mapToDouble(d -> d.fixed().shipBestShare()).toArray();
        double[] stopping = days.stream().mapToDouble(d -> d.sequential().stoppingShare()).toArray();
        double[] loss = days.stream().mapToDouble(d -> d.fixed().expectedLoss()).toArray();
        double[] realised = days.stream().mapToDouble(d -> d.fixed().realisedLoss()).toArray();
        sb.append("<section id=\"charts\"><h2>Day by day</h2><p class=\"note\">Solid: the sequential rule, cumulated to "
                + "the day. Dashed: a test analysed once, on that day, with no earlier look.</p><div class=\"grid\">");
        sb.append(DayCharts.lines("Tests decided", "day", "share of tests", true, List.of("stopped by this day",
                "decided when analysed once on this day"), x, List.of(stopped, decided), new boolean[] {false, true}, new int[] {0, 0}, null, null));
        sb.append(DayCharts.lines("Shipped the best arm / a worse arm", "day", "share of tests", true,
                List.of("best arm (sequential)", "worse arm (sequential)", "best arm (once)", "worse arm (once)"), x,
                List.of(bestSeq, worseSeq, bestFixed, worseFixed), new boolean[] {false, false, true, true}, new int[] {0, 1, 0, 1}, null, null));
        sb.append(DayCharts.dayBars("Days to the stop", "day", "share of tests stopping", x, stopping));
        Double tolerance = plan.settings().tolerance();
        String unit = metric.unitLabel(plan.settings().currency());
        sb.append(DayCharts.lines("Loss when analysed once on this day", "day", unit, false,
                List.of("expected loss (posterior)", "realised loss (true)"), x, List.of(loss, realised),
                new boolean[] {true, true}, new int[] {0, 1}, tolerance, tolerance == null ? null : "tolerance"));
        sb.append("</div></section>\n");
    }

    private static void assumptions(StringBuilder sb, PlanResult plan, Metric metric) {
        PlanResult.Settings s = plan.settings();
        PlanResult.BaselineUsed b = plan.assumptions().baseline();
        sb.append("<section id=\"assumptions\"><h2>Assumed truth</h2><p>Baseline (").append(esc(b.source())).append("): payer rate ")
                .append(esc(Format.sig(b.payerRate(), 4)));
        if (b.logSpendMean() != null) {
            sb.append(", log spend per payer mean ").append(esc(Format.sig(b.logSpendMean(), 4))).append(" and sd ")
                    .append(esc(Format.sig(b.logSpendSd(), 4)));
        }
        sb.append("fixed".equals(b.source()) ? "" : " (means over the simulated tests)").append(b.note() == null ? "" : "; " + esc(b.note()))
                .append(".</p><table><tr><th>arm</th><th>users per day</th><th>payer-rate lift</th><th>ARPPU lift</th><th>")
                .append(esc(metric.label())).append("</th><th>lift over control</th><th>truly best in</th></tr>");
        for (Map.Entry<String, PlanResult.ArmAssumed> e : plan.assumptions().arms().entrySet()) {
            PlanResult.ArmAssumed a = e.getValue();
            sb.append("<tr><td>").append(esc(e.getKey())).append("</td><td>")
                    .append(String.format(Locale.ROOT, "%,d", s.usersPerDay().get(e.getKey()))).append("</td><td>")
                    .append(esc(liftText(a.payerRateLift()))).append("</td><td>").append(esc(liftText(a.arppuLift())))
                    .append("</td><td>").append(esc(Format.sig(a.value(), 4))).append("</td><td>")
                    .append(a.lift() == null ? "control" : String.format(Locale.ROOT, "%+.2f%%", 100 * a.lift()))
                    .append("</td><td>").append(pct(a.bestShare())).append("</td></tr>");
        }
        sb.append("</table></section>\n");
    }

    static String liftText(Object lift) {
        if (lift == null) {
            return "-";
        }
        if (lift instanceof Number n) {
            return String.format(Locale.ROOT, "%+.2f%%", 100 * n.doubleValue());
        }
        Map<?, ?> m = (Map<?, ?>) lift;
        if ("normal".equals(m.get("family"))) {
            return String.format(Locale.ROOT, "normal(%+.2f%%, sd %.2f%%)", 100 * ((Number) m.get("mean")).doubleValue(),
                    100 * ((Number) m.get("sd")).doubleValue());
        }
        return String.format(Locale.ROOT, "uniform(%+.2f%%, %+.2f%%)", 100 * ((Number) m.get("lower")).doubleValue(),
                100 * ((Number) m.get("upper")).doubleValue());
    }

    private static void dayTable(StringBuilder sb, PlanResult plan, Metric metric) {
        String currency = plan.settings().currency();
        sb.append("<section id=\"days\"><h2>Every look day</h2><table><tr><th>day</th><th>stopping</th><th>stopped</th>"
                + "<th>shipped worse</th><th>shipped best</th><th>once: decided</th><th>once: shipped</th>"
                + "<th>once: shipped worse</th><th>once: shipped best</th><th>once: expected loss</th>"
                + "<th>once: realised loss</th></tr>");
        for (PlanResult.Day d : plan.days()) {
            PlanResult.Sequential q = d.sequential();
            PlanResult.Fixed f = d.fixed();
            sb.append("<tr><td>").append(d.day()).append("</td><td>").append(pct(q.stoppingShare())).append("</td><td>")
                    .append(pct(q.stoppedShare())).append("</td><td>").append(pct(q.shipWorseShare())).append("</td><td>")
                    .append(pct(q.shipBestShare())).append("</td><td>").append(pct(f.decidedShare())).append("</td><td>")
                    .append(pct(f.shipShare())).append("</td><td>").append(pct(f.shipWorseShare())).append("</td><td>")
                    .append(pct(f.shipBestShare())).append("</td><td>").append(esc(Format.sig(f.expectedLoss(), 3)))
                    .append("</td><td>").append(esc(Format.sig(f.realisedLoss(), 3))).append("</td></tr>");
        }
        sb.append("</table><p class=\"note\">Losses in ").append(esc(metric.unitLabel(currency)))
                .append(". \"Once\": a test analysed a single time, on that day, acting on the rule's answer (the control "
                        + "is kept when it says keep collecting).</p></section>\n");
    }
}
