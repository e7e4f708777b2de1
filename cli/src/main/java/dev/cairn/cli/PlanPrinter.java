package dev.cairn.cli;

import dev.cairn.models.plan.PlanResult;
import dev.cairn.models.result.Metric;
import java.util.List;
import java.util.Locale;

/** The terminal summary of a plan: the figures at the stop first, then a few fixed horizons. */
final class PlanPrinter {
    private PlanPrinter() {
    }

    static String print(PlanResult plan) {
        PlanResult.Settings s = plan.settings();
        Metric metric = Metric.of(s.metric());
        PlanResult.AtStop a = plan.atStop();
        StringBuilder sb = new StringBuilder();
        if (plan.title() != null) {
            sb.append(TerminalText.escape(plan.title())).append('\n');
        }
        sb.append(String.format(Locale.ROOT, "%,d simulated tests of %d arms (control %s) on %s.%n", s.experiments(),
                s.arms().size(), TerminalText.escape(s.control()), metric.label()));
        sb.append(TerminalText.escape(dev.cairn.cli.report.PlanReport.ruleText(s, metric))).append("\n\n");
        sb.append("At the stop\n");
        line(sb, "decided", p(a.decidedShare()) + "  (ship " + p(a.shipShare()) + ", keep the control "
                + p(a.keepControlShare()) + "; undecided at day " + s.maxDays() + ": " + p(a.undecidedShare()) + ")");
        line(sb, a.power() != null ? "power" : "assurance", p(a.power() != null ? a.power() : a.assurance())
                + (a.power() != null ? "  (ships an arm)" : "  (ships an arm, averaged over the drawn effects)"));
        line(sb, "ships a worse arm", p(a.shipWorseShare()) + "  (no better than the control: " + p(a.shipNotBetterShare()) + ")");
        line(sb, "ships the best arm", p(a.shipBestShare()) + "  (ends on the best arm: " + p(a.pickBestShare()) + ")");
        line(sb, "expected loss", metric.amount(a.expectedLoss(), s.currency()) + "  (realised: "
                + metric.amount(a.realisedLoss(), s.currency()) + ")");
        PlanResult.Duration d = a.duration();
        line(sb, "days to the stop", String.format(Locale.ROOT, "median %d, 10%% by day %d, 90%% by day %d, mean %.1f",
                d.median(), d.p10(), d.p90(), d.mean()));
        sb.append("\nAnalysed once on a fixed day (no early stop)\n");
        sb.append(String.format(Locale.ROOT, "  %4s  %8s  %8s  %11s  %10s  %s%n", "day", "decided", "shipped", "ships worse",
                "ships best", "expected loss"));
        for (PlanResult.Day day : horizons(plan.days())) {
            PlanResult.Fixed f = day.fixed();
            sb.append(String.format(Locale.ROOT, "  %4d  %8s  %8s  %11s  %10s  %s%n", day.day(), p(f.decidedShare()),
                    p(f.shipShare()), p(f.shipWorseShare()), p(f.shipBestShare()), metric.amount(f.expectedLoss(), s.currency())));
        }
        for (String w : plan.warnings()) {
            sb.append("Warning: ").append(w).append('\n');
        }
        sb.append('\n');
        for (String c : plan.cautions()) {
            sb.append(c).append('\n');
        }
        return sb.toString();
    }

    /** About five look days to show: the first, every week or so, the last. */
    static List<PlanResult.Day> horizons(List<PlanResult.Day> days) {
        int step = Math.max(1, (days.size() + 3) / 4);
        List<PlanResult.Day> shown = new java.util.ArrayList<>();
        for (int i = 0; i < days.size(); i += step) {
            shown.add(days.get(i));
        }
        if (shown.get(shown.size() - 1) != days.get(days.size() - 1)) {
            shown.add(days.get(days.size() - 1));
        }
        return shown;
    }

    private static void line(StringBuilder sb, String what, String value) {
        sb.append(String.format(Locale.ROOT, "  %-20s %s%n", what, value));
    }

    private static String p(double share) {
        return dev.cairn.cli.report.PlanReport.pct(share);
    }
}
