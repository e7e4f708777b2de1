package dev.cairn.cli;

import dev.cairn.models.result.ArmSummary;
import dev.cairn.models.result.Check;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.FitResult;
import dev.cairn.models.result.PooledResult;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Result;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/** The terminal summary of a spend result: arms, comparisons, verdict, checks, warnings, cautions. */
final class ResultPrinter {
    private ResultPrinter() {
    }

    static String print(FitResult r) {
        return decision(r) + body(r);
    }

    private static String body(FitResult r) {
        if (r instanceof PooledResult pooled) {
            return pooled(pooled);
        }
        if (r instanceof dev.cairn.models.result.RetentionResult retention) {
            return retention(retention);
        }
        if (r instanceof Result spend) {
            return spend(spend);
        }
        return generic(r);
    }

    /**
     * The decision, first: the outcome in a sentence, then each arm's expected loss, P(best) and lift on the
     * metric decided on; and which arm is the control when cairn chose it.
     */
    static String decision(FitResult r) {
        dev.cairn.models.result.Decision d = r.decision();
        if (d == null) {
            return "";
        }
        dev.cairn.models.result.Metric metric = dev.cairn.models.result.Metric.of(d.metric());
        StringBuilder sb = new StringBuilder();
        sb.append("Decision on ").append(metric.label()).append(": ").append(d.statement()).append('\n');
        int width = Math.max(4, d.arms().stream().mapToInt(a -> a.arm().length()).max().orElse(4));
        for (dev.cairn.models.result.Decision.ArmDecision a : d.arms()) {
            String lift = a.lift() == null ? (a.arm().equals(r.control()) ? "control" : "undefined")
                    : "lift " + dev.cairn.models.result.Format.lift(a.lift());
            sb.append(String.format(Locale.ROOT, "  %-" + width + "s  expected loss %-34s  P(best) %7s  %s%n",
                    a.arm(), metric.amount(a.expectedLoss(), r.currency()),
                    dev.cairn.models.result.Format.probability(a.probBest()), lift));
        }
        sb.append("  (tolerance ").append(metric.amount(d.tolerance(), r.currency()))
                .append("default".equals(d.toleranceSource()) ? ", 1% of the control's mean; set decision.tolerance" : ", from the spec")
                .append(". The rule bounds the loss expected from acting now; it is not an error rate.)\n");
        if ("default".equals(r.controlSource())) {
            sb.append("  Control: ").append(r.control()).append(", the first arm in sorted order (name another with \"control\").\n");
        }
        return sb.append('\n').toString();
    }

    /** A result of a model this printer has no table for: the run, the verdict, the comparisons, the warnings. */
    static String generic(FitResult r) {
        StringBuilder sb = new StringBuilder();
        title(sb, r);
        sb.append(String.format(Locale.ROOT, "%s from %s; %s sampler, %d chains x %,d draws, seed %d%n", r.model(),
                r.data().source(), r.run().method(), r.run().chains(), r.run().draws(), r.run().seed()));
        verdict(sb, r);
        if (!r.comparisons().isEmpty()) {
            sb.append('\n');
            for (Comparison c : r.comparisons()) {
                sb.append(String.format(Locale.ROOT, "  %-12s vs %-12s %-10s  lift %s  P(above) %s%n", c.arm(),
                        c.control(), c.metric(), lift(c), dev.cairn.models.result.Format.probability(c.probAbove())));
            }
        }
        warningsAndCautions(sb, r);
        return sb.toString();
    }

    static String pooled(PooledResult r) {
        String level = levelLabel(r.interval());
        StringBuilder sb = new StringBuilder();
        title(sb, r);
        sb.append(String.format(Locale.ROOT, "pooled-effects: %d estimates from %s; %s sampler, %d chains x %,d draws, seed %d%n",
                r.effects().size(), r.data().source(), r.run().method(), r.run().chains(), r.run().draws(), r.run().seed()));
        verdict(sb, r);
        int width = Math.max(6, r.effects().keySet().stream().mapToInt(String::length).max().orElse(6));
        String row = "%-" + width + "s  %22s  %-30s  %8s%n";
        sb.append('\n').append(String.format(Locale.ROOT, row, "effect", "as given (+- se)", "pooled: median [lo, hi]", "P(> 0)"));
        for (Map.Entry<String, Interval> e : r.effects().entrySet()) {
            PooledResult.Raw raw = r.raw().get(e.getKey());
            sb.append(String.format(Locale.ROOT, row, e.getKey(),
                    Numbers.sig(raw.estimate(), 3) + " +- " + Numbers.sig(raw.se(), 3), interval(e.getValue(), 3),
                    dev.cairn.models.result.Format.probability(r.probPositive().get(e.getKey()))));
        }
        sb.append(String.format(Locale.ROOT, "%nmu (population mean):    %s%n", interval(r.mu(), 3)));
        sb.append(String.format(Locale.ROOT, "tau (between-effect sd): %s%n", interval(r.tau(), 3)));
        sb.append(String.format(Locale.ROOT, "a new effect:            %s  -> informed prior: normal(mean %s, sd %s)%n",
                interval(r.predictive(), 3), Numbers.sig(r.predictive().mean(), 3), Numbers.sig(r.predictive().sd(), 3)));
        sb.append("(").append(level).append(" credible intervals: median [lo, hi])\n");
        warningsAndCautions(sb, r);
        return sb.toString();
    }

    static String retention(dev.cairn.models.result.RetentionResult r) {
        StringBuilder sb = new StringBuilder();
        title(sb, r);
        long cohorts = r.cohorts().stream().map(dev.cairn.models.result.CohortRow::cohort).distinct().count();
        sb.append(String.format(Locale.ROOT, "retention (%s): %d cohorts, %d arms from %s; %s sampler, %d chains x %,d draws, seed %d%n",
                r.curve(), cohorts, r.arms().size(), r.data().source(), r.run().method(), r.run().chains(), r.run().draws(),
                r.run().seed()));
        verdict(sb, r);
        sb.append('\n').append(String.format(Locale.ROOT, "%-12s %10s", "arm", "installs"));
        for (int d : r.days()) {
            sb.append(String.format(Locale.ROOT, "  %-24s", "D" + d));
        }
        sb.append('\n');
        for (Map.Entry<String, dev.cairn.models.result.RetentionArm> e : r.arms().entrySet()) {
            sb.append(String.format(Locale.ROOT, "%-12s %,10d", e.getKey() + (e.getKey().equals(r.control()) ? "*" : ""),
                    e.getValue().installs()));
            for (int d : r.days()) {
                Interval i = e.getValue().retention().get("d" + d);
                sb.append(String.format(Locale.ROOT, "  %-24s", String.format(Locale.ROOT, "%.1f%% [%.1f, %.1f]",
                        100 * i.median(), 100 * i.lo(), 100 * i.hi())));
            }
            sb.append('\n');
        }
        sb.append("(* control; install-weighted over cohorts, unreached days projected; ").append(levelLabel(r.interval()))
                .append(" intervals)\n\nAgainst ").append(r.control()).append(":\n");
        for (Comparison c : r.comparisons()) {
            sb.append(String.format(Locale.ROOT, "  %-12s %-5s  lift %s  P(above) %s%n", c.arm(),
                    c.metric().toUpperCase(Locale.ROOT), lift(c), dev.cairn.models.result.Format.probability(c.probAbove())));
        }
        if (r.ltv() != null) {
            sb.append(String.format(Locale.ROOT, "%nLTV over %s days:", r.ltv().horizon()));
            r.ltv().arms().forEach((k, i) -> sb.append(String.format(Locale.ROOT, "  %s %s [%s, %s]", k,
                    Numbers.sig(i.median(), 3), Numbers.sig(i.lo(), 3), Numbers.sig(i.hi(), 3))));
            sb.append('\n');
        }
        sb.append(String.format(Locale.ROOT, "Drift per cohort: level %s, slope %s (random-walk sd)%n",
                interval(r.drift().get("level"), 2), interval(r.drift().get("slope"), 2)));
        sb.append("\nD" + r.days().get(Math.min(1, r.days().size() - 1)) + " by cohort (control; p = projected):\n");
        String key = "d" + r.days().get(Math.min(1, r.days().size() - 1));
        for (dev.cairn.models.result.CohortRow c : r.cohorts()) {
            if (!r.control().equals(c.arm())) {
                continue;
            }
            Interval i = c.day(key);
            sb.append(String.format(Locale.ROOT, "  %-12s %5.1f%% [%.1f, %.1f]%s%n", c.cohort(), 100 * i.median(),
                    100 * i.lo(), 100 * i.hi(), c.projected().contains(key) ? " p" : ""));
        }
        warningsAndCautions(sb, r);
        return sb.toString();
    }

    private static void title(StringBuilder sb, FitResult r) {
        if (r.title() != null) {
            sb.append(r.title()).append('\n');
        }
    }

    /** The verdict line and, when not converged, the first reasons. */
    private static void verdict(StringBuilder sb, FitResult r) {
        sb.append(r.converged() ? "Converged (R-hat and ESS checks passed).\n"
                : "NOT CONVERGED - the numbers below are not to be trusted:\n");
        if (!r.converged()) {
            r.diagnostics().reasons().stream().limit(12).forEach(x -> sb.append("  - ").append(x).append('\n'));
            if (r.diagnostics().reasons().size() > 12) {
                sb.append("  - and ").append(r.diagnostics().reasons().size() - 12).append(" more (diagnostics.reasons in result.json)\n");
            }
            if (r.diagnostics().advice() != null) {
                sb.append("  ").append(r.diagnostics().advice()).append('\n');
            }
        }
    }

    private static void warningsAndCautions(StringBuilder sb, FitResult r) {
        // the not-converged warning is the verdict above, with its reasons and advice: not repeated here
        List<String> rest = r.warnings() == null ? List.of()
                : r.warnings().stream().filter(w -> !w.startsWith("NOT converged")).toList();
        if (!rest.isEmpty()) {
            sb.append("\nWarnings:\n");
            rest.forEach(w -> sb.append("  ! ").append(w).append('\n'));
        }
        sb.append('\n');
        r.cautions().forEach(c -> sb.append("Note: ").append(c).append('\n'));
    }

    static String levelLabel(double interval) {
        return String.format(Locale.ROOT, "%.4g%%", 100 * interval).replaceFirst("\\.?0+%$", "%");
    }

    /**
     * The timeline, at most about a dozen periods (evenly spaced, the last always): users so far, the
     * best-looking arm with its P(best) and its lift, and what the rule said then.
     */
    static void timeline(StringBuilder sb, Result r) {
        List<dev.cairn.models.result.TimelineDay> t = r.timeline();
        String metric = r.decision() != null ? label(r.decision().metric()) : "the decided metric";
        sb.append("\nTimeline (").append(t.size()).append(t.size() == 1 ? " period" : " periods")
                .append(", everything up to the end of each; decided on ").append(metric).append("):\n");
        sb.append(String.format(Locale.ROOT, "  %-12s  %12s  %-24s  %-28s  %s%n", "time", "users", "best-looking (P)",
                "its lift [lo, hi]", "rule said"));
        int step = Math.max(1, (t.size() + 11) / 12);
        for (int i = 0; i < t.size(); i++) {
            if (i % step != 0 && i != t.size() - 1) {
                continue;
            }
            dev.cairn.models.result.TimelineDay d = t.get(i);
            long users = d.users().values().stream().mapToLong(Long::longValue).sum();
            String best = "-", lift = "-";
            if (d.arm() != null) {
                best = TerminalText.escape(d.arm()) + " (" + dev.cairn.models.result.Format.probability(d.probBest().get(d.arm())) + ")";
                lift = d.arm().equals(r.control()) ? "control" : dev.cairn.models.result.Format.lift(d.lift().get(d.arm()));
            }
            sb.append(String.format(Locale.ROOT, "  %-12s  %,12d  %-24s  %-28s  %s%n", String.valueOf(d.time()), users,
                    best, lift, d.outcome()));
        }
    }

    static String spend(Result r) {
        String level = levelLabel(r.interval());
        StringBuilder sb = new StringBuilder();
        title(sb, r);
        sb.append(String.format(Locale.ROOT, "%s: %,d users in %d arms%s from %s; %s sampler, %d chains x %,d draws, seed %d%n",
                r.model(), r.data().users(), r.arms().size(),
                r.segments() == null ? "" : String.format(Locale.ROOT, " and %d segments", r.segments().size()),
                r.data().source(), r.run().method(), r.run().chains(), r.run().draws(), r.run().seed()));
        if (r.run().parameterisation() != null) {
            sb.append("Parameterisation: ").append(r.run().parameterisation()).append('\n');
        }
        verdict(sb, r);
        sb.append('\n');
        boolean spend = r.arms().values().iterator().next().arpu() != null;
        int width = Math.max(3, r.arms().keySet().stream().mapToInt(String::length).max().orElse(3));
        int money = Math.max(29, dev.cairn.models.result.Format.heading(dev.cairn.models.result.Metric.ARPU, r.currency()).length());
        String header = spend ? "%-" + width + "s  %10s  %8s  %-" + money + "s  %-29s  %s%n" : "%-" + width + "s  %10s  %8s  %s%n";
        if (spend) {
            sb.append(String.format(Locale.ROOT, header, "arm", "users", "payers",
                    dev.cairn.models.result.Format.heading(dev.cairn.models.result.Metric.ARPU, r.currency()), "payer rate",
                    dev.cairn.models.result.Format.heading(dev.cairn.models.result.Metric.ARPPU, r.currency())));
        } else {
            sb.append(String.format(Locale.ROOT, header, "arm", "users", "payers", "payer rate"));
        }
        for (Map.Entry<String, ArmSummary> e : r.arms().entrySet()) {
            ArmSummary a = e.getValue();
            String name = e.getKey() + (e.getKey().equals(r.control()) ? "*" : "");
            if (spend) {
                sb.append(String.format(Locale.ROOT, header, name, String.format(Locale.ROOT, "%,d", a.users()),
                        String.format(Locale.ROOT, "%,d", a.payers()), interval(a.arpu(), 4), percent(a.payerRate()),
                        interval(a.arppu(), 4)));
            } else {
                sb.append(String.format(Locale.ROOT, header, name, String.format(Locale.ROOT, "%,d", a.users()),
                        String.format(Locale.ROOT, "%,d", a.payers()), percent(a.payerRate())));
            }
        }
        sb.append("(* control; intervals are ").append(level).append(" credible intervals: median [lo, hi])\n\n");

        if (r.segments() != null) {
            sb.append("Overall rows are the population (segments weighted by users); comparisons marked typical are for "
                    + "a typical segment.\n\n");
        }
        sb.append("Against ").append(r.control()).append(":\n");
        String row = "  %-" + (width + 10) + "s  %-10s  %-28s  %11s  %s%n";
        sb.append(String.format(Locale.ROOT, row, "arm", "metric", "lift median [lo, hi]", "P(above)", "expected loss"));
        for (Comparison c : r.comparisons()) {
            sb.append(String.format(Locale.ROOT, row, c.arm() + ("typical-segment".equals(c.scope()) ? " (typical)" : ""),
                    label(c.metric()),
                    lift(c),
                    dev.cairn.models.result.Format.probability(c.probAbove()), dev.cairn.models.result.Format.loss(
                            dev.cairn.models.result.Metric.of(c.metric()), c.expectedLoss(), r.currency())));
        }
        if (r.segments() != null) {
            appendSegments(sb, r, width);
        }
        sb.append('\n');
        for (Map.Entry<String, Map<String, Double>> e : r.probBest().entrySet()) {
            sb.append("P(best ").append(label(e.getKey())).append("): ");
            StringBuilder parts = new StringBuilder();
            e.getValue().forEach((arm, p) -> parts.append(parts.length() == 0 ? "" : ", ")
                    .append(arm).append(' ').append(dev.cairn.models.result.Format.probability(p)));
            sb.append(parts).append('\n');
        }
        if (r.timeline() != null) {
            timeline(sb, r);
        }
        long misfits = r.checks().stream().filter(Check::misfit).count();
        if (!r.checks().isEmpty()) {
            sb.append(String.format(Locale.ROOT, "%nPredictive checks: %d of %d statistics reproduced%s%n",
                    r.checks().size() - misfits, r.checks().size(), misfits == 0 ? "." : "; see warnings."));
        }
        warningsAndCautions(sb, r);
        return sb.toString();
    }

    /** Per segment, the headline metric's lift of each arm: raw (own data) beside pooled, so shrinkage shows. */
    private static void appendSegments(StringBuilder sb, Result r, int armWidth) {
        int width = Math.max(7, r.segments().keySet().stream().mapToInt(String::length).max().orElse(7));
        String metric = r.comparisons().get(0).metric();
        sb.append(String.format(Locale.ROOT, "%nBy segment (%s lift against %s; raw = the segment's own data alone):%n",
                label(metric), r.control()));
        String row = "  %-" + width + "s  %-" + armWidth + "s  %10s  %9s  %-28s  %9s%n";
        sb.append(String.format(Locale.ROOT, row, "segment", "arm", "users", "raw", "pooled median [lo, hi]", "P(above)"));
        for (Map.Entry<String, dev.cairn.models.result.SegmentSummary> e : r.segments().entrySet()) {
            for (Comparison c : e.getValue().comparisons()) {
                if (!c.metric().equals(metric)) {
                    continue;
                }
                sb.append(String.format(Locale.ROOT, row, e.getKey(), c.arm(), String.format(Locale.ROOT, "%,d", e.getValue().users()),
                        c.rawLift() == null ? "-" : String.format(Locale.ROOT, "%+.1f%%", 100 * c.rawLift()),
                        lift(c),
                        dev.cairn.models.result.Format.probability(c.probAbove())));
            }
            if (e.getValue().notes() != null) {
                e.getValue().notes().forEach(n -> sb.append("    note: ").append(n).append('\n'));
            }
        }
    }

    private static String label(String metric) {
        return dev.cairn.models.result.Metric.of(metric).label();
    }

    private static String interval(Interval i, int digits) {
        return Numbers.sig(i.median(), digits) + " [" + Numbers.sig(i.lo(), digits) + ", " + Numbers.sig(i.hi(), digits) + "]";
    }

    private static String percent(Interval i) {
        return String.format(Locale.ROOT, "%.2f%% [%.2f%%, %.2f%%]", 100 * i.median(), 100 * i.lo(), 100 * i.hi());
    }

    /** A comparison's lift as median [lo, hi] in percent, or why there is none. */
    static String lift(Comparison c) {
        return c.lift() == null ? "undefined (control can be 0)" : String.format(Locale.ROOT, "%+.1f%% [%+.1f%%, %+.1f%%]",
                100 * c.lift().median(), 100 * c.lift().lo(), 100 * c.lift().hi());
    }
}
