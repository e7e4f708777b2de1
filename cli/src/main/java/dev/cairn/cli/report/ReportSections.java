package dev.cairn.cli.report;

import dev.cairn.models.FitOutcome;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.FitResult;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.PooledResult;
import dev.cairn.models.result.RetentionResult;
import dev.cairn.samplers.Draws;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The report's sections that every model or a non-spend model has: the decision first, the priors, the
 * pooled effects, the retention curves and tables, and the comparison table they share. The spend models'
 * sections, the header and the convergence section are in {@link HtmlReport}.
 */
final class ReportSections {
    private ReportSections() {
    }

    /** The decision first: the outcome in a sentence, each arm's figures, the tolerance and what the rule means. */
    static void decision(StringBuilder sb, FitResult r) {
        dev.cairn.models.result.Decision d = r.decision();
        if (d == null) {
            return;
        }
        dev.cairn.models.result.Metric metric = dev.cairn.models.result.Metric.of(d.metric());
        sb.append("<section id=\"decision\"><h2>Decision on ").append(HtmlReport.esc(metric.label())).append("</h2><p class=\"decision\">")
                .append(HtmlReport.esc(d.statement())).append("</p><table><tr><th>arm</th><th>expected loss (")
                .append(HtmlReport.esc(metric.unit() == dev.cairn.models.result.Metric.Unit.SHARE ? "percentage points"
                        : metric.unitLabel(r.currency())))
                .append(")</th><th>P(best)</th><th>lift against the control, median [lo, hi]</th></tr>");
        for (dev.cairn.models.result.Decision.ArmDecision a : d.arms()) {
            double loss = metric.unit() == dev.cairn.models.result.Metric.Unit.SHARE ? 100 * a.expectedLoss() : a.expectedLoss();
            sb.append("<tr><td>").append(HtmlReport.esc(a.arm())).append("</td><td>").append(HtmlReport.sig(loss)).append("</td><td>")
                    .append(HtmlReport.esc(dev.cairn.models.result.Format.probability(a.probBest()))).append("</td><td>")
                    .append(a.lift() == null ? (a.arm().equals(r.control()) ? "control" : "undefined") : HtmlReport.pct(a.lift()))
                    .append("</td></tr>");
        }
        sb.append("</table><p class=\"note\">Tolerance ").append(HtmlReport.esc(metric.amount(d.tolerance(), r.currency())))
                .append("default".equals(d.toleranceSource()) ? " (1% of the control's posterior mean; set decision.tolerance)"
                        : " (from the spec)")
                .append(". The arm with the least expected loss against the best arm is chosen once that loss is below the "
                        + "tolerance; otherwise the test should run on. The rule bounds the loss expected from acting now, "
                        + "in the metric's unit; it is not a false-positive rate.");
        if ("default".equals(r.controlSource())) {
            sb.append(" The control, ").append(HtmlReport.esc(r.control()))
                    .append(", is the first arm in sorted order; the spec's \"control\" names another.");
        }
        sb.append("</p></section>\n");
    }

    /** The priors the fit used, as result.json records them (given or default, and where they came from). */
    static void priors(StringBuilder sb, FitResult r) {
        if (r.priors() == null) {
            return;
        }
        String json = dev.cairn.models.ResultWriter.jsonOf(r.priors());
        sb.append("<section id=\"priors\"><h2>Priors</h2><pre>").append(HtmlReport.esc(json.strip())).append("</pre></section>\n");
    }

    static void pooledSections(StringBuilder sb, PooledResult r, Draws d) {
        List<String> labels = new ArrayList<>(r.effects().keySet());
        double[] lo = new double[labels.size()], mid = new double[labels.size()], hi = new double[labels.size()];
        double[] raw = new double[labels.size()];
        for (int i = 0; i < labels.size(); i++) {
            Interval e = r.effects().get(labels.get(i));
            lo[i] = e.lo();
            mid[i] = e.median();
            hi[i] = e.hi();
            raw[i] = r.raw().get(labels.get(i)).estimate();
        }
        sb.append("<section id=\"effects\"><h2>Effects: pooled beside as given</h2><div class=\"grid\">")
                .append(Charts.intervals("Effects after pooling", "effect (the estimates' own unit)", labels, lo, mid, hi, raw,
                        "as given", new Charts.Reference(r.mu().median(),
                                "population mean mu, median (" + HtmlReport.sig(r.mu().median()) + ")")))
                .append(Charts.histograms("Population mean mu and a new effect", "effect (the estimates' own unit)", List.of("mu", "new effect"),
                        List.of(d.pooled("mu"), d.pooled("predictive")), new double[] {0}, "no effect (0)"))
                .append(Charts.histograms("Between-effect sd tau", "tau", List.of("tau"), List.of(d.pooled("tau")), null))
                .append("</div><table><tr><th>effect</th><th>as given</th><th>se</th><th>pooled median [lo, hi]</th>"
                        + "<th>P(&gt; 0)</th></tr>");
        for (String name : labels) {
            sb.append("<tr><td>").append(HtmlReport.esc(name)).append("</td><td>").append(HtmlReport.sig(r.raw().get(name).estimate()))
                    .append("</td><td>").append(HtmlReport.sig(r.raw().get(name).se())).append("</td><td>")
                    .append(HtmlReport.interval(r.effects().get(name))).append("</td><td>").append(HtmlReport.esc(dev.cairn.models.result.Format.probability(r.probPositive().get(name))))
                    .append("</td></tr>");
        }
        sb.append("</table><p class=\"note\">Informed prior for the next test: normal(mean ")
                .append(HtmlReport.sig(r.predictive().mean())).append(", sd ").append(HtmlReport.sig(r.predictive().sd())).append(").</p></section>\n");
    }

    static void retentionSections(StringBuilder sb, RetentionResult r, FitOutcome outcome) {
        List<String> arms = new ArrayList<>(r.arms().keySet());
        List<double[][]> bands = new ArrayList<>();
        List<double[]> observed = new ArrayList<>();
        int[] last = new int[arms.size()];
        for (int k = 0; k < arms.size(); k++) {
            dev.cairn.models.Figures.Curve curve = outcome.figures().curves().get(arms.get(k));
            bands.add(curve.band());
            observed.add(curve.observed());
            last[k] = curve.lastDay();
        }
        sb.append("<section id=\"retention\"><h2>Retention curves (").append(HtmlReport.esc(r.curve())).append(")</h2>")
                .append("<p class=\"note\">Install-weighted over cohorts: median and ").append(HtmlReport.fmt(100 * r.interval(), 0))
                .append("% band; solid up to the last day any cohort reached, dashed beyond (projected); points: observed.</p>")
                .append("<div class=\"grid\">").append(Charts.curves("Retention by day", arms, bands, observed, last));
        int drift = r.days().contains(7) ? 7 : r.days().get(0);
        // every arm's drift panel on one axis, so that the panels compare at a glance
        double low = Double.POSITIVE_INFINITY, high = Double.NEGATIVE_INFINITY;
        for (dev.cairn.models.result.CohortRow c : r.cohorts()) {
            Interval i = c.day("d" + drift);
            if (i != null) {
                low = Math.min(low, 100 * i.lo());
                high = Math.max(high, 100 * i.hi());
            }
        }
        double pad = 0.05 * (high - low + 1e-9);
        for (String a : arms) {
            List<String> labels = new ArrayList<>();
            List<Interval> values = new ArrayList<>();
            for (dev.cairn.models.result.CohortRow c : r.cohorts()) {
                if (a.equals(c.arm())) {
                    labels.add(c.cohort());
                    values.add(c.day("d" + drift));
                }
            }
            sb.append(Charts.intervals(a + ": D" + drift + " by install cohort (drift)", "D" + drift + " (%)", labels,
                    values.stream().mapToDouble(i -> 100 * i.lo()).toArray(),
                    values.stream().mapToDouble(i -> 100 * i.median()).toArray(),
                    values.stream().mapToDouble(i -> 100 * i.hi()).toArray(), null, null, null,
                    Double.isFinite(low) ? new double[] {low - pad, high + pad} : null));
        }
        if (r.ltv() != null) {
            List<String> labels = new ArrayList<>();
            List<Interval> values = new ArrayList<>();
            for (String a : arms) {
                labels.add(a);
                values.add(r.ltv().arms().get(a));
            }
            sb.append(Charts.intervals("LTV over " + r.ltv().horizon() + " days", "LTV ("
                    + (r.currency() != null ? r.currency() : "currency units") + " per install)", labels,
                    values.stream().mapToDouble(Interval::lo).toArray(), values.stream().mapToDouble(Interval::median).toArray(),
                    values.stream().mapToDouble(Interval::hi).toArray(), null, null, null));
        }
        sb.append("</div><table id=\"retention-table\"><tr><th>arm</th><th>installs</th>");
        for (int day : r.days()) {
            sb.append("<th>D").append(day).append(" median [lo, hi]</th>");
        }
        if (r.ltv() != null) {
            sb.append("<th>LTV over ").append(r.ltv().horizon()).append(" days (")
                    .append(HtmlReport.esc(r.currency() != null ? r.currency() : "currency units")).append(" per install)</th>");
        }
        sb.append("</tr>");
        for (String a : arms) {
            sb.append("<tr><td>").append(HtmlReport.esc(a)).append(a.equals(r.control()) ? " (control)" : "").append("</td><td>")
                    .append(String.format(Locale.ROOT, "%,d", r.arms().get(a).installs())).append("</td>");
            for (int day : r.days()) {
                sb.append("<td>").append(percentInterval(r.arms().get(a).retention().get("d" + day))).append("</td>");
            }
            if (r.ltv() != null) {
                sb.append("<td>").append(HtmlReport.interval(r.ltv().arms().get(a))).append("</td>");
            }
            sb.append("</tr>");
        }
        sb.append("</table><p class=\"note\">Drift per install cohort (random-walk sd on the curve's logit or log "
                + "scale): level ").append(HtmlReport.interval(r.drift().get("level"))).append(", slope ")
                .append(HtmlReport.interval(r.drift().get("slope"))).append(".</p>");
        comparisonTable(sb, r.comparisons(), r.currency());
        sb.append("</section>\n");
    }

    /** A share's interval as percentages: median [lo, hi]. */
    static String percentInterval(Interval i) {
        return i == null ? "" : HtmlReport.fmt(100 * i.median(), 1) + "% [" + HtmlReport.fmt(100 * i.lo(), 1) + "%, " + HtmlReport.fmt(100 * i.hi(), 1) + "%]";
    }

    /** The comparisons as a table: arm, metric, lift interval, P(above), expected loss. */
    static void comparisonTable(StringBuilder sb, List<Comparison> comparisons, String currency) {
        sb.append("<table><tr><th>arm</th><th>metric</th><th>lift median [lo, hi]</th><th>P(above)</th>"
                + "<th>expected loss</th></tr>");
        for (Comparison c : comparisons) {
            sb.append("<tr><td>").append(HtmlReport.esc(c.arm())).append("</td><td>").append(HtmlReport.esc(c.metric().toUpperCase(Locale.ROOT)))
                    .append("</td><td>").append(HtmlReport.pct(c.lift())).append("</td><td>").append(HtmlReport.esc(dev.cairn.models.result.Format.probability(c.probAbove())))
                    .append("</td><td>").append(HtmlReport.esc(dev.cairn.models.result.Format.loss(Metric.of(c.metric()),
                            c.expectedLoss(), currency))).append("</td></tr>");
        }
        sb.append("</table>");
    }

    /**
     * The timeline: the lift of each arm over the control as data arrived (median, and the interval dashed),
     * P(best) per period, and a table of every period.
     */
    static void timeline(StringBuilder sb, dev.cairn.models.result.Result r) {
        List<dev.cairn.models.result.TimelineDay> t = r.timeline();
        List<String> arms = new java.util.ArrayList<>(r.arms().keySet());
        int[] x = java.util.stream.IntStream.rangeClosed(1, t.size()).toArray();
        String metric = r.decision() != null ? Metric.of(r.decision().metric()).label() : "the decided metric";
        List<String> names = new java.util.ArrayList<>();
        List<double[]> ys = new java.util.ArrayList<>();
        List<Boolean> dashed = new java.util.ArrayList<>();
        List<Integer> colours = new java.util.ArrayList<>();
        for (int k = 0; k < arms.size(); k++) {
            String arm = arms.get(k);
            if (arm.equals(r.control())) {
                continue;
            }
            for (String part : new String[] {"median", "lo", "hi"}) {
                double[] y = new double[t.size()];
                for (int i = 0; i < t.size(); i++) {
                    dev.cairn.models.result.Interval lift = t.get(i).lift() == null ? null : t.get(i).lift().get(arm);
                    y[i] = lift == null ? Double.NaN : switch (part) {
                        case "median" -> lift.median();
                        case "lo" -> lift.lo();
                        default -> lift.hi();
                    };
                }
                names.add(arm + (part.equals("median") ? "" : " " + part));
                ys.add(y);
                dashed.add(!part.equals("median"));
                colours.add(k);
            }
        }
        List<double[]> best = new java.util.ArrayList<>();
        for (String arm : arms) {
            best.add(t.stream().mapToDouble(d -> d.probBest() == null ? Double.NaN : d.probBest().get(arm)).toArray());
        }
        boolean[] dash = new boolean[dashed.size()];
        for (int i = 0; i < dash.length; i++) {
            dash[i] = dashed.get(i);
        }
        sb.append("<section id=\"timeline\"><h2>Timeline</h2><p class=\"note\">Each period's figures use all data up "
                + "to its end; period 1 is ").append(HtmlReport.esc(String.valueOf(t.get(0).time()))).append(", period ")
                .append(t.size()).append(" is ").append(HtmlReport.esc(String.valueOf(t.get(t.size() - 1).time())))
                .append(". Dashed: the interval's ends.</p><div class=\"grid\">");
        sb.append(DayCharts.lines("Lift over " + r.control() + " on " + metric, "period", "lift", true, names, x, ys, dash,
                colours.stream().mapToInt(Integer::intValue).toArray(), 0.0, "no lift"));
        sb.append(DayCharts.lines("P(best) on " + metric, "period", "probability", true, arms, x, best, new boolean[arms.size()],
                java.util.stream.IntStream.range(0, arms.size()).toArray(), null, null));
        sb.append("</div><table><tr><th>period</th><th>time</th><th>users</th><th>payers</th><th>best-looking</th>"
                + "<th>P(best)</th><th>expected loss</th><th>rule said</th></tr>");
        for (int i = 0; i < t.size(); i++) {
            dev.cairn.models.result.TimelineDay d = t.get(i);
            sb.append("<tr><td>").append(i + 1).append("</td><td>").append(HtmlReport.esc(String.valueOf(d.time())))
                    .append("</td><td>").append(String.format(java.util.Locale.ROOT, "%,d",
                            d.users().values().stream().mapToLong(Long::longValue).sum()))
                    .append("</td><td>").append(String.format(java.util.Locale.ROOT, "%,d",
                            d.payers().values().stream().mapToLong(Long::longValue).sum()))
                    .append("</td><td>").append(HtmlReport.esc(d.arm() == null ? "-" : d.arm())).append("</td><td>")
                    .append(d.arm() == null ? "-" : dev.cairn.models.result.Format.probability(d.probBest().get(d.arm())))
                    .append("</td><td>").append(d.arm() == null ? "-" : HtmlReport.esc(dev.cairn.models.result.Format.sig(
                            d.expectedLoss().get(d.arm()), 3))).append("</td><td>").append(HtmlReport.esc(d.outcome()))
                    .append("</td></tr>");
        }
        sb.append("</table></section>\n");
    }
}
