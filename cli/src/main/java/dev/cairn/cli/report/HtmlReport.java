package dev.cairn.cli.report;

import dev.cairn.models.FitOutcome;
import dev.cairn.models.result.ArmSummary;
import dev.cairn.models.result.Check;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.DiagnosticsSummary;
import dev.cairn.models.result.FitResult;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.PooledResult;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.RetentionResult;
import dev.cairn.models.result.SegmentSummary;
import dev.cairn.samplers.Draws;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * A single-file HTML report of a fit: header with the question, data, model, sampler and verdict;
 * posterior plots per arm; comparisons; convergence (trace and rank plots of the slowest-mixing
 * quantities and the full table); predictive checks; segments, pooled effects or retention curves when
 * the model has them. Charts are inline SVG; no scripts, remote fonts or styles. The layout and colours
 * are cairn's own.
 */
public final class HtmlReport {
    static final String STYLE = """
            body{font-family:Georgia,'DejaVu Serif',serif;color:#22303a;margin:0;background:#f6f4ef}
            header{background:#1b6f8a;color:#fdfbf6;padding:1.2em 2em}
            header h1{margin:.1em 0 .3em;font-size:1.5em}
            header .meta{font-family:'DejaVu Sans Mono',monospace;font-size:.85em;opacity:.9}
            .verdict{display:inline-block;padding:.35em .8em;border-radius:3px;font-weight:bold;margin:.5em 0}
            .ok{background:#e4efd6;color:#2f4d12}.bad{background:#f6dcdc;color:#7a1d2a}
            .cautions{font-size:.85em;max-width:60em;opacity:.95}
            main{padding:1em 2em 3em;max-width:1250px}
            section{background:#fff;border-left:4px solid #d07a2c;margin:1.4em 0;padding:.6em 1.2em 1em}
            h2{font-size:1.15em;margin:.4em 0 .6em;color:#1b6f8a;overflow-wrap:anywhere}
            .grid{display:flex;flex-wrap:wrap;gap:12px}
            .grid svg{border:1px solid #e6e1d6}
            table{border-collapse:collapse;font-size:.85em;margin:.6em 0;font-family:'DejaVu Sans',sans-serif}
            th,td{padding:.25em .7em;border-bottom:1px solid #e6e1d6;text-align:right;overflow-wrap:anywhere}
            th:first-child,td:first-child{text-align:left}
            .flag{color:#b23a48;font-weight:bold}
            p.note{font-size:.85em;color:#54626f}
            """;

    private HtmlReport() {
    }

    public static String render(FitOutcome outcome, String source) {
        FitResult r = outcome.result();
        StringBuilder sb = new StringBuilder(1 << 16);
        sb.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>")
                .append(esc("cairn report: " + (r.title() != null ? r.title() : r.model()))).append("</title><style>")
                .append(STYLE).append("</style></head><body>\n");
        header(sb, r, source);
        sb.append("<main>\n");
        ReportSections.decision(sb, r);
        if (r instanceof Result spend) {
            spendSections(sb, spend, outcome);
        } else if (r instanceof PooledResult pooled) {
            ReportSections.pooledSections(sb, pooled, outcome.draws());
        } else if (r instanceof RetentionResult retention) {
            ReportSections.retentionSections(sb, retention, outcome);
        } else if (!r.comparisons().isEmpty()) {
            // a model the report has no sections for: its comparisons as they are
            sb.append("<section><h2>Comparisons</h2>");
            ReportSections.comparisonTable(sb, r.comparisons(), r.currency());
            sb.append("</section>\n");
        }
        if (r instanceof Result spend && spend.timeline() != null) {
            ReportSections.timeline(sb, spend);
        }
        ReportSections.priors(sb, r);
        diagnostics(sb, r.diagnostics(), outcome.draws());
        sb.append("</main></body></html>\n");
        return sb.toString();
    }

    private static void header(StringBuilder sb, FitResult r, String source) {
        sb.append("<header><h1>").append(esc(r.title() != null ? r.title() : "cairn: " + r.model())).append("</h1>");
        String size = r.data().users() > 0 ? String.format(Locale.ROOT, "%,d users", r.data().users())
                : String.format(Locale.ROOT, "%,d rows", r.data().rows());
        sb.append("<div class=\"meta\">spec ").append(esc(source)).append(" &middot; data ").append(esc(r.data().source()))
                .append(" (").append(size).append(") &middot; model ").append(esc(r.model()))
                .append(" &middot; sampler ").append(esc(r.run().method())).append(", ").append(r.run().chains())
                .append(" chains &times; ").append(r.run().draws()).append(" draws, warmup ").append(r.run().warmup())
                .append(" &middot; seed ").append(r.run().seed()).append(" &middot; ").append(r.run().seconds())
                .append(" s &middot; cairn ").append(esc(r.run().version())).append("</div>");
        if (r.converged()) {
            sb.append("<div class=\"verdict ok\" id=\"verdict\">Converged: every R-hat is below ")
                    .append(r.diagnostics().thresholdRhat()).append(" and every bulk- and tail-ESS reaches ")
                    .append(fmt(r.diagnostics().thresholdEssPerChain() * r.run().chains(), 0))
                    .append(". The numbers below can be used.</div>");
        } else {
            sb.append("<div class=\"verdict bad\" id=\"verdict\">Not converged: do not use these numbers for decisions yet.")
                    .append(" See the convergence section for the reasons.</div>");
        }
        List<String> warnings = r.warnings() == null ? List.of()
                : r.warnings().stream().filter(w -> !w.startsWith("NOT converged")).toList();
        if (!warnings.isEmpty()) {
            sb.append("<div class=\"warnings\" id=\"warnings\"><strong>Warnings</strong><ul>");
            warnings.forEach(w -> sb.append("<li>").append(esc(w)).append("</li>"));
            sb.append("</ul></div>");
        }
        sb.append("<div class=\"cautions\">");
        for (String c : r.cautions()) {
            sb.append("<p>").append(esc(c)).append("</p>");
        }
        sb.append("</div></header>\n");
    }

    private static void spendSections(StringBuilder sb, Result r, FitOutcome outcome) {
        Draws d = outcome.draws();
        boolean segmented = r.segments() != null;
        List<String> arms = new ArrayList<>(r.arms().keySet());
        boolean spend = r.arms().values().iterator().next().arpu() != null;
        List<Metric> metrics = Metric.spend(spend);
        sb.append("<section id=\"arms\"><h2>Per arm").append(segmented ? " (population: segments weighted by users)" : "")
                .append("</h2><div class=\"grid\">");
        for (Metric metric : metrics) {
            List<double[]> draws = new ArrayList<>();
            for (String a : arms) {
                double[] values = d.pooled(segmented ? metric.column(Metric.POPULATION, a) : metric.column(a));
                // shares are charted as percentages, as the heading says
                draws.add(metric.unit() == Metric.Unit.SHARE ? java.util.Arrays.stream(values).map(v -> 100 * v).toArray() : values);
            }
            sb.append(Charts.histograms("Posterior of " + metric.label(), dev.cairn.models.result.Format.heading(metric, r.currency()), arms, draws, null));
        }
        sb.append("</div><table><tr><th>arm</th><th>users</th><th>payers</th>");
        for (Metric metric : metrics) {
            sb.append("<th>").append(esc(dev.cairn.models.result.Format.heading(metric, r.currency()))).append(" median [lo, hi]</th>");
        }
        sb.append("</tr>");
        for (Map.Entry<String, ArmSummary> e : r.arms().entrySet()) {
            ArmSummary a = e.getValue();
            sb.append("<tr><td>").append(esc(e.getKey())).append(e.getKey().equals(r.control()) ? " (control)" : "")
                    .append("</td><td>").append(String.format(Locale.ROOT, "%,d", a.users())).append("</td><td>")
                    .append(String.format(Locale.ROOT, "%,d", a.payers())).append("</td>");
            for (Metric metric : metrics) {
                sb.append("<td>").append(esc(dev.cairn.models.result.Format.interval(metric, a.of(metric)))).append("</td>");
            }
            sb.append("</tr>");
        }
        sb.append("</table></section>\n");

        sb.append("<section id=\"comparisons\"><h2>Against ").append(esc(r.control())).append("</h2><div class=\"grid\">");
        for (Comparison c : r.comparisons()) {
            if (!c.metric().equals(metrics.get(0).key()) || "typical-segment".equals(c.scope()) || c.lift() == null) {
                continue;
            }
            Metric metric = Metric.of(c.metric());
            double[] x = d.pooled(segmented ? metric.column(Metric.POPULATION, c.arm()) : metric.column(c.arm()));
            double[] base = d.pooled(segmented ? metric.column(Metric.POPULATION, c.control()) : metric.column(c.control()));
            double[] lift = dev.cairn.models.decision.Decisions.liftDraws(x, base);
            sb.append(Charts.lift(String.format(Locale.ROOT, "%s %s lift: P(above) %s", c.arm(), label(c.metric()),
                    dev.cairn.models.result.Format.probability(c.probAbove())), lift, c.lift().lo(), c.lift().hi()));
        }
        sb.append("</div><table><tr><th>arm</th><th>metric</th><th>scope</th><th>lift median [lo, hi]</th>"
                + "<th>P(above)</th><th>expected loss</th></tr>");
        for (Comparison c : r.comparisons()) {
            sb.append("<tr><td>").append(esc(c.arm())).append("</td><td>").append(label(c.metric())).append("</td><td>")
                    .append(c.scope() == null ? "" : esc(c.scope())).append("</td><td>").append(pct(c.lift()))
                    .append("</td><td>").append(dev.cairn.models.result.Format.probability(c.probAbove())).append("</td><td>")
                    .append(esc(dev.cairn.models.result.Format.loss(Metric.of(c.metric()), c.expectedLoss(), r.currency())))
                    .append("</td></tr>");
        }
        sb.append("</table><table><tr><th>P(best)</th>");
        for (String a : arms) {
            sb.append("<th>").append(esc(a)).append("</th>");
        }
        sb.append("</tr>");
        for (Map.Entry<String, Map<String, Double>> e : r.probBest().entrySet()) {
            sb.append("<tr><td>").append(label(e.getKey())).append("</td>");
            for (String a : arms) {
                sb.append("<td>").append(dev.cairn.models.result.Format.probability(e.getValue().get(a))).append("</td>");
            }
            sb.append("</tr>");
        }
        sb.append("</table></section>\n");

        if (!r.checks().isEmpty()) {
            sb.append("<section id=\"checks\"><h2>Posterior predictive checks</h2><p class=\"note\">Each panel: the "
                    + "statistic in data sets replicated from the posterior; the dashed line is the observed value. A "
                    + "line far in a tail means the model does not reproduce it.</p><div class=\"grid\">");
            for (Check c : r.checks()) {
                double[] values = outcome.figures().replicated().get(c.arm() + "/" + c.statistic());
                if (values != null) {
                    CheckAxis axis = CheckAxis.of(c.statistic(), r.currency());
                    double[] scaled = values.clone();
                    for (int i = 0; i < scaled.length; i++) {
                        scaled[i] *= axis.scale();
                    }
                    sb.append(Charts.histograms(String.format(Locale.ROOT, "%s: %s (p = %.3f)%s", c.arm(), axis.name(),
                                    c.pValue(), c.misfit() ? " MISFIT" : ""), axis.label(), List.of("replicated"),
                            List.of(scaled), new double[] {c.observed() * axis.scale()}));
                }
            }
            sb.append("</div></section>\n");
        }
        if (segmented) {
            List<Map.Entry<String, SegmentSummary>> bySize = new ArrayList<>(r.segments().entrySet());
            bySize.sort(Comparator.comparingLong((Map.Entry<String, SegmentSummary> e) -> -e.getValue().users())
                    .thenComparing(Map.Entry::getKey));
            boolean capped = bySize.size() > SEGMENTS_CHARTED;
            sb.append("<section id=\"segments\"><h2>Segments: pooled lift beside each segment's own data</h2>"
                    + "<p class=\"note\">Segments by size, largest first")
                    .append(capped ? " (the " + SEGMENTS_CHARTED + " largest of " + bySize.size() + " charted; every one is in the table)" : "")
                    .append(". Intervals: pooled estimates; hollow points: the raw lift from the segment alone; the axis "
                    + "fits the pooled intervals, and a raw lift beyond it is a triangle at the edge with its value written. "
                    + "Small segments move toward the overall lift (shrinkage).</p><div class=\"grid\">");
            for (String a : arms) {
                if (a.equals(r.control())) {
                    continue;
                }
                List<String> labels = new ArrayList<>();
                List<double[]> rows = new ArrayList<>();
                for (Map.Entry<String, SegmentSummary> e : bySize.subList(0, Math.min(SEGMENTS_CHARTED, bySize.size()))) {
                    for (Comparison c : e.getValue().comparisons()) {
                        if (c.arm().equals(a) && c.metric().equals(metrics.get(0).key()) && c.lift() != null) {
                            labels.add(e.getKey());
                            rows.add(new double[] {100 * c.lift().lo(), 100 * c.lift().median(), 100 * c.lift().hi(),
                                c.rawLift() == null ? Double.NaN : 100 * c.rawLift()});
                        }
                    }
                }
                double[] lo = rows.stream().mapToDouble(x -> x[0]).toArray();
                double[] mid = rows.stream().mapToDouble(x -> x[1]).toArray();
                double[] hi = rows.stream().mapToDouble(x -> x[2]).toArray();
                double[] raw = rows.stream().mapToDouble(x -> x[3]).toArray();
                double low = Math.min(0, java.util.Arrays.stream(lo).min().orElse(0));
                double high = Math.max(0, java.util.Arrays.stream(hi).max().orElse(0));
                double pad = 0.08 * (high - low + 1e-9);
                sb.append(Charts.intervals(a + ": " + metrics.get(0).label() + " lift by segment (%)", "lift (%)", labels, lo, mid,
                        hi, raw, "raw (segment alone)", new Charts.Reference(0, "no change (0%)"),
                        new double[] {low - pad, high + pad}));
            }
            sb.append("</div>");
            segmentTable(sb, r, arms, metrics.get(0));
            sb.append("</section>\n");
        }
    }

    /** Every segment, largest first: users, pooled and raw lift per arm on the primary metric, notes. */
    private static void segmentTable(StringBuilder sb, Result r, List<String> arms, Metric metric) {
        List<Map.Entry<String, SegmentSummary>> rows = new ArrayList<>(r.segments().entrySet());
        rows.sort(Comparator.comparingLong((Map.Entry<String, SegmentSummary> e) -> -e.getValue().users())
                .thenComparing(Map.Entry::getKey));
        sb.append("<table id=\"segment-table\"><tr><th>segment</th><th>users</th>");
        for (String a : arms) {
            if (!a.equals(r.control())) {
                sb.append("<th>").append(esc(a)).append(": ").append(esc(metric.label()))
                        .append(" lift, pooled [lo, hi]</th><th>raw</th>");
            }
        }
        sb.append("<th>notes</th></tr>");
        for (Map.Entry<String, SegmentSummary> e : rows) {
            sb.append("<tr><td>").append(esc(e.getKey())).append("</td><td>").append(String.format(Locale.ROOT, "%,d",
                    e.getValue().users())).append("</td>");
            for (String a : arms) {
                if (a.equals(r.control())) {
                    continue;
                }
                Comparison c = e.getValue().comparisons().stream()
                        .filter(x -> x.arm().equals(a) && x.metric().equals(metric.key())).findFirst().orElse(null);
                sb.append("<td>").append(c == null ? "" : pct(c.lift())).append("</td><td>")
                        .append(c == null || c.rawLift() == null ? "" : fmt(100 * c.rawLift(), 1) + "%").append("</td>");
            }
            sb.append("<td>").append(e.getValue().notes() == null ? "" : esc(String.join("; ", e.getValue().notes())))
                    .append("</td></tr>");
        }
        sb.append("</table>");
    }

    /** Segments charted at most (a page's worth); the table beside the charts lists every one. */
    static final int SEGMENTS_CHARTED = 40;

    private static void diagnostics(StringBuilder sb, DiagnosticsSummary diag, Draws d) {
        sb.append("<section id=\"diagnostics\"><h2>Convergence</h2>");
        if (!diag.reasons().isEmpty()) {
            sb.append("<p class=\"flag\">Not converged because:</p><ul>");
            diag.reasons().forEach(x -> sb.append("<li>").append(esc(x)).append("</li>"));
            sb.append("</ul>");
            if (diag.advice() != null) {
                sb.append("<p id=\"advice\">").append(esc(diag.advice())).append("</p>");
            }
        }
        List<DiagnosticsSummary.Parameter> slowest = new ArrayList<>(diag.parameters());
        slowest.removeIf(p -> p.essBulk() == null);
        slowest.sort(Comparator.comparingDouble(DiagnosticsSummary.Parameter::essBulk));
        sb.append("<p class=\"note\">Trace and rank plots of the ").append(Math.min(3, slowest.size()))
                .append(" slowest-mixing quantities (lowest bulk-ESS). Rank plots of well-mixed chains are flat and overlap.</p>")
                .append("<div class=\"grid\">");
        for (DiagnosticsSummary.Parameter p : slowest.subList(0, Math.min(3, slowest.size()))) {
            double[][] chains = d.column(p.name());
            sb.append(Charts.trace("Trace: " + p.name(), chains)).append(Charts.ranks("Ranks: " + p.name(), chains));
        }
        sb.append("</div><table><tr><th>quantity</th><th>R-hat</th><th>bulk-ESS</th><th>tail-ESS</th><th>MCSE of mean</th></tr>");
        double need = diag.thresholdEssPerChain();
        for (DiagnosticsSummary.Parameter p : diag.parameters()) {
            boolean bad = p.rhat() != null && p.rhat() >= diag.thresholdRhat();
            sb.append("<tr").append(bad ? " class=\"flag\"" : "").append("><td>").append(esc(p.name())).append("</td><td>")
                    .append(p.rhat() == null ? "-" : fmt(p.rhat(), 3)).append("</td><td>")
                    .append(p.essBulk() == null ? "-" : fmt(p.essBulk(), 0)).append("</td><td>")
                    .append(p.essTail() == null ? "-" : fmt(p.essTail(), 0)).append("</td><td>")
                    .append(p.mcseMean() == null ? "-" : sig(p.mcseMean())).append("</td></tr>");
        }
        sb.append("</table><p class=\"note\">Thresholds: R-hat &lt; ").append(diag.thresholdRhat())
                .append(", bulk- and tail-ESS &ge; ").append(fmt(need, 0)).append(" per chain.</p></section>\n");
    }

    static String label(String metric) {
        return Metric.of(metric).label();
    }

    static String esc(String s) {
        if (s == null) {
            return "";
        }
        StringBuilder out = new StringBuilder(s.length());
        for (char c : s.toCharArray()) {
            switch (c) {
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '&' -> out.append("&amp;");
                case '"' -> out.append("&quot;");
                default -> out.append(c);
            }
        }
        return out.toString();
    }

    /**
     * How a predictive-check statistic reads on its axis: a plain name, the axis label with its unit, and the
     * factor that turns a share into a percentage.
     */
    record CheckAxis(String name, String label, double scale) {
        static CheckAxis of(String statistic, String currency) {
            String money = currency != null ? currency : "currency units";
            return switch (statistic) {
                case "zeroShare" -> new CheckAxis("share spending nothing", "users who spent nothing (%)", 100);
                case "meanSpend" -> new CheckAxis("mean spend", "mean spend (" + money + " per user)", 1);
                case "payerP50" -> new CheckAxis("payers' median spend", "median spend of payers (" + money + ")", 1);
                case "payerP90" -> new CheckAxis("payers' 90th percentile", "90th percentile of payers' spend (" + money + ")", 1);
                case "payerP99" -> new CheckAxis("payers' 99th percentile", "99th percentile of payers' spend (" + money + ")", 1);
                case "maxSpend" -> new CheckAxis("largest spend", "largest spend of one user (" + money + ")", 1);
                default -> new CheckAxis(statistic, statistic, 1);
            };
        }
    }

    static String fmt(double v, int decimals) {
        return String.format(Locale.ROOT, "%." + decimals + "f", v);
    }

    static String sig(double v) {
        return dev.cairn.models.result.Format.sig(v, 4);
    }

    static String interval(Interval i) {
        return sig(i.median()) + " [" + sig(i.lo()) + ", " + sig(i.hi()) + "]";
    }

    static String pct(Interval i) {
        if (i == null) {
            return "undefined (control can be 0)";
        }
        return String.format(Locale.ROOT, "%+.1f%% [%+.1f%%, %+.1f%%]", 100 * i.median(), 100 * i.lo(), 100 * i.hi());
    }
}
