package dev.cairn.cli.report;

import dev.cairn.models.result.Format;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Rectangle;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.DeviationRenderer;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.statistics.HistogramDataset;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.jfree.svg.SVGGraphics2D;

/** Charts drawn with JFreeChart and exported as inline SVG (org.jfree.svg), in cairn's own colours. */
final class Charts {
    /** cairn's palette: deep teal, amber, moss, plum, brick, slate. */
    static final Color[] PALETTE = {new Color(0x1b6f8a), new Color(0xd07a2c), new Color(0x6b8f3e), new Color(0x8a4f9e),
        new Color(0xb23a48), new Color(0x54626f)};
    static final Color INK = new Color(0x22303a);
    static final Color GRID = new Color(0xdde3e8);
    static final int WIDTH = 560, HEIGHT = 300;

    private Charts() {
    }

    static Color colour(int i) {
        return PALETTE[i % PALETTE.length];
    }

    /** Pooled estimates and raw (own-data) estimates: colours of their own, never an arm's. */
    static final Color POOLED = INK, RAW = new Color(0x9a7b4f);
    /** A single distribution that is not one arm's (a replicated statistic, a hyperparameter). */
    static final Color NEUTRAL = new Color(0x7d8b96);

    /** The legend: the plot's series and, after them, the markers drawn on it, so every mark is named. */
    static void legendWith(XYPlot plot, org.jfree.chart.LegendItem... extra) {
        org.jfree.chart.LegendItemCollection items = new org.jfree.chart.LegendItemCollection();
        items.addAll(plot.getLegendItems());
        for (org.jfree.chart.LegendItem e : extra) {
            items.add(e);
        }
        plot.setFixedLegendItems(items);
    }

    /** A legend entry drawn as a line. */
    static org.jfree.chart.LegendItem line(String label, java.awt.Paint paint, java.awt.Stroke stroke) {
        return new org.jfree.chart.LegendItem(label, null, null, null, new java.awt.geom.Line2D.Double(-7, 0, 7, 0),
                stroke, paint);
    }

    static String svg(JFreeChart chart, int width, int height) {
        chart.setBackgroundPaint(Color.WHITE);
        chart.setAntiAlias(true);
        if (chart.getTitle() != null) {
            chart.getTitle().setFont(new Font("SansSerif", Font.BOLD, 13));
            chart.getTitle().setPaint(INK);
        }
        SVGGraphics2D g = new SVGGraphics2D(width, height);
        chart.draw(g, new Rectangle(0, 0, width, height));
        return g.getSVGElement();
    }

    static XYPlot style(XYPlot plot) {
        plot.setBackgroundPaint(Color.WHITE);
        plot.setDomainGridlinePaint(GRID);
        plot.setRangeGridlinePaint(GRID);
        plot.setOutlineVisible(false);
        return plot;
    }

    /** Longest name a chart shows in full; longer ones are cut (the tables beside them show every name whole). */
    static final int LABEL = 28;
    /** Longest chart title. */
    static final int TITLE = 90;

    /** A name as a chart shows it: control characters escaped, at most {@code max} characters, cut with "…". */
    static String shorten(String name, int max) {
        String s = dev.cairn.cli.TerminalText.escape(name);
        return s.codePointCount(0, s.length()) <= max ? s : s.substring(0, s.offsetByCodePoints(0, max - 1)) + "…";
    }

    /** Names as chart labels: each shortened to {@link #LABEL}, and kept distinct (a cut name that repeats gets "#n"). */
    static List<String> labels(List<String> names) {
        List<String> out = new java.util.ArrayList<>(names.size());
        java.util.Set<String> seen = new java.util.HashSet<>();
        for (String name : names) {
            String s = shorten(name, LABEL);
            for (int n = 2; !seen.add(s); n++) {
                s = shorten(name, LABEL - 4) + "#" + n;
            }
            out.add(s);
        }
        return out;
    }

    /** Overlaid posterior histograms (one series per label), optional vertical markers at values. */
    static String histograms(String title, String xLabel, List<String> names, List<double[]> draws, double[] markers) {
        return histograms(title, xLabel, names, draws, markers, "observed value");
    }

    /** The same, the dashed markers named {@code markerLabel} in the legend. */
    static String histograms(String title, String xLabel, List<String> names, List<double[]> draws, double[] markers,
                             String markerLabel) {
        List<String> labels = labels(names);
        title = shorten(title, TITLE);
        HistogramDataset data = new HistogramDataset();
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (double[] d : draws) {
            for (double v : d) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
        }
        if (!(hi > lo)) {
            hi = lo + 1e-9;
        }
        for (int i = 0; i < labels.size(); i++) {
            data.addSeries(labels.get(i), draws.get(i), 60, lo, hi);
        }
        XYBarRenderer renderer = new XYBarRenderer();
        renderer.setBarPainter(new StandardXYBarPainter());
        renderer.setShadowVisible(false);
        renderer.setDrawBarOutline(false);
        for (int i = 0; i < labels.size(); i++) {
            // arms keep their colour across the report; a lone distribution is not an arm
            Color c = labels.size() == 1 ? NEUTRAL : colour(i);
            renderer.setSeriesPaint(i, new Color(c.getRed(), c.getGreen(), c.getBlue(), 140));
        }
        NumberAxis x = new NumberAxis(xLabel);
        x.setAutoRangeIncludesZero(false);
        NumberAxis y = new NumberAxis("draws");
        XYPlot plot = style(new XYPlot(data, x, y, renderer));
        plot.setForegroundAlpha(0.8f);
        BasicStroke dashed = new BasicStroke(1.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10, new float[] {4, 3}, 0);
        if (markers != null) {
            for (double m : markers) {
                plot.addDomainMarker(new ValueMarker(m, INK, dashed));
            }
            legendWith(plot, line(markerLabel, INK, dashed));
        }
        return svg(new JFreeChart(title, JFreeChart.DEFAULT_TITLE_FONT, plot, labels.size() > 1 || markers != null),
                WIDTH, HEIGHT);
    }

    /** A lift distribution with its credible interval shaded and zero marked. */
    static String lift(String title, double[] draws, double lo, double hi) {
        title = shorten(title, TITLE);
        String svg;
        HistogramDataset data = new HistogramDataset();
        double min = Double.POSITIVE_INFINITY, max = Double.NEGATIVE_INFINITY;
        for (double v : draws) {
            min = Math.min(min, v);
            max = Math.max(max, v);
        }
        data.addSeries("lift", draws, 60, min, Math.max(max, min + 1e-9));
        XYBarRenderer renderer = new XYBarRenderer();
        renderer.setBarPainter(new StandardXYBarPainter());
        renderer.setShadowVisible(false);
        renderer.setSeriesPaint(0, POOLED); // a lift estimate, as the pooled intervals of the segment charts
        NumberAxis x = new NumberAxis("lift (arm / control - 1)");
        x.setAutoRangeIncludesZero(true);
        x.setNumberFormatOverride(new java.text.DecimalFormat("+0.#%;-0.#%"));
        XYPlot plot = style(new XYPlot(data, x, new NumberAxis("draws"), renderer));
        IntervalMarker band = new IntervalMarker(lo, hi, new Color(0xd07a2c), new BasicStroke(1f), null, null, 0.18f);
        plot.addDomainMarker(band, org.jfree.chart.ui.Layer.BACKGROUND);
        plot.addDomainMarker(new ValueMarker(0, PALETTE[4], new BasicStroke(1.5f)));
        legendWith(plot, new org.jfree.chart.LegendItem("credible interval", new Color(0xd07a2c, false)),
                line("no change (0%)", PALETTE[4], new BasicStroke(1.5f)));
        svg = svg(new JFreeChart(title, JFreeChart.DEFAULT_TITLE_FONT, plot, true), WIDTH, HEIGHT);
        return svg;
    }

    /** One line per chain over iterations (thinned to at most 800 points per chain). */
    static String trace(String title, double[][] chains) {
        title = shorten(title, TITLE);
        XYSeriesCollection data = new XYSeriesCollection();
        for (int c = 0; c < chains.length; c++) {
            XYSeries s = new XYSeries("chain " + (c + 1), false, true);
            int step = Math.max(1, chains[c].length / 400);
            for (int t = 0; t < chains[c].length; t += step) {
                s.add(t + 1, chains[c][t]);
            }
            data.addSeries(s);
        }
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, false);
        renderer.setDrawSeriesLineAsPath(true); // one SVG path per chain, not one element per segment
        for (int c = 0; c < chains.length; c++) {
            renderer.setSeriesPaint(c, colour(c));
            renderer.setSeriesStroke(c, new BasicStroke(0.7f));
        }
        NumberAxis y = new NumberAxis("value");
        y.setAutoRangeIncludesZero(false);
        XYPlot plot = style(new XYPlot(data, new NumberAxis("iteration"), y, renderer));
        return svg(new JFreeChart(title, JFreeChart.DEFAULT_TITLE_FONT, plot, true), WIDTH, 240);
    }

    /**
     * Rank plot: the draws of all chains ranked together; each chain's ranks in 20 bins. Well-mixed chains
     * give flat, overlapping histograms (Vehtari et al. 2021, section 4).
     */
    static String ranks(String title, double[][] chains) {
        title = shorten(title, TITLE);
        int m = chains.length, n = chains[0].length;
        double[] pooled = new double[m * n];
        for (int c = 0; c < m; c++) {
            System.arraycopy(chains[c], 0, pooled, c * n, n);
        }
        double[] sorted = pooled.clone();
        java.util.Arrays.sort(sorted);
        int bins = 20;
        XYSeriesCollection data = new XYSeriesCollection();
        for (int c = 0; c < m; c++) {
            double[] counts = new double[bins];
            for (int t = 0; t < n; t++) {
                int rank = java.util.Arrays.binarySearch(sorted, chains[c][t]);
                rank = Math.max(0, rank);
                counts[Math.min(bins - 1, (int) ((long) rank * bins / sorted.length))]++;
            }
            XYSeries s = new XYSeries("chain " + (c + 1));
            for (int b = 0; b < bins; b++) {
                s.add(b + 0.5, counts[b]);
                s.add(b + 1.0 - 1e-9, counts[b]);
            }
            data.addSeries(s);
        }
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, false);
        renderer.setDrawSeriesLineAsPath(true);
        for (int c = 0; c < m; c++) {
            renderer.setSeriesPaint(c, colour(c));
            renderer.setSeriesStroke(c, new BasicStroke(1.2f));
        }
        XYPlot plot = style(new XYPlot(data, new NumberAxis("rank bin (of 20)"), new NumberAxis("draws"), renderer));
        plot.addRangeMarker(new ValueMarker((double) n / bins, INK, new BasicStroke(1f, BasicStroke.CAP_BUTT,
                BasicStroke.JOIN_MITER, 10, new float[] {3, 3}, 0)));
        return svg(new JFreeChart(title, JFreeChart.DEFAULT_TITLE_FONT, plot, true), WIDTH, 240);
    }

    /**
     * Intervals per labelled row (vertical error bars at positions 0..n-1) with the median as the point,
     * optionally beside a second set of points (e.g. raw estimates) drawn as hollow markers.
     */
    static String intervals(String title, String yLabel, List<String> names, double[] lo, double[] mid, double[] hi,
                            double[] raw, String rawLabel, Reference reference) {
        return intervals(title, yLabel, names, lo, mid, hi, raw, rawLabel, reference, null);
    }

    /**
     * A horizontal reference line and what it means, for the legend.
     *
     * @param value where, on the value axis
     * @param label its legend entry, with the value in the axis' unit (e.g. "no change (0%)")
     */
    record Reference(double value, String label) {
    }

    /**
     * As above on a fixed value axis {@code range} = {lower, upper} (null: fitted to the data). Raw points
     * beyond it are drawn at its edge as triangles with their value written beside them, so that a few
     * extreme raw estimates cannot squash the intervals.
     */
    static String intervals(String title, String yLabel, List<String> names, double[] lo, double[] mid, double[] hi,
                            double[] raw, String rawLabel, Reference reference, double[] range) {
        List<String> labels = labels(names);
        title = shorten(title, TITLE);
        YIntervalSeriesCollection data = new YIntervalSeriesCollection();
        YIntervalSeries s = new YIntervalSeries("pooled (median and interval)");
        for (int i = 0; i < labels.size(); i++) {
            s.add(i, mid[i], lo[i], hi[i]);
        }
        data.addSeries(s);
        XYErrorRenderer renderer = new XYErrorRenderer();
        renderer.setDrawXError(false);
        renderer.setErrorPaint(POOLED);
        renderer.setSeriesPaint(0, POOLED);
        renderer.setErrorStroke(new BasicStroke(2f));
        SymbolAxis x = new SymbolAxis(null, labels.toArray(new String[0]));
        x.setTickLabelFont(new Font("SansSerif", Font.PLAIN, 10));
        x.setVerticalTickLabels(labels.size() > 8);
        NumberAxis y = new NumberAxis(yLabel);
        y.setAutoRangeIncludesZero(false);
        if (range != null) {
            y.setRange(range[0], range[1]);
        }
        XYPlot plot = style(new XYPlot(data, x, y, renderer));
        if (raw != null) {
            XYSeriesCollection rawData = new XYSeriesCollection();
            XYSeries r = new XYSeries(rawLabel);
            XYSeries beyond = new XYSeries(rawLabel + ", beyond the axis (value written)");
            for (int i = 0; i < raw.length; i++) {
                if (!Double.isFinite(raw[i])) {
                    continue;
                }
                if (range != null && (raw[i] < range[0] || raw[i] > range[1])) {
                    double edge = raw[i] < range[0] ? range[0] : range[1];
                    beyond.add(i + 0.15, edge);
                    org.jfree.chart.annotations.XYTextAnnotation text = new org.jfree.chart.annotations.XYTextAnnotation(
                            dev.cairn.models.result.Format.sig(raw[i], 3), i + 0.45, edge);
                    text.setFont(new Font("SansSerif", Font.PLAIN, 9));
                    text.setPaint(RAW);
                    text.setTextAnchor(raw[i] < range[0] ? org.jfree.chart.ui.TextAnchor.BOTTOM_LEFT
                            : org.jfree.chart.ui.TextAnchor.TOP_LEFT);
                    plot.addAnnotation(text);
                } else {
                    r.add(i + 0.15, raw[i]);
                }
            }
            rawData.addSeries(r);
            rawData.addSeries(beyond);
            XYLineAndShapeRenderer dots = new XYLineAndShapeRenderer(false, true);
            dots.setSeriesPaint(0, RAW);
            dots.setSeriesShapesFilled(0, false);
            dots.setSeriesPaint(1, RAW);
            dots.setSeriesShape(1, new java.awt.Polygon(new int[] {-4, 4, 0}, new int[] {3, 3, -4}, 3));
            dots.setSeriesShapesFilled(1, true);
            dots.setSeriesVisibleInLegend(1, beyond.getItemCount() > 0);
            plot.setDataset(1, rawData);
            plot.setRenderer(1, dots);
        }
        if (reference != null) {
            plot.addRangeMarker(new ValueMarker(reference.value(), PALETTE[4], new BasicStroke(1f)));
            legendWith(plot, line(reference.label(), PALETTE[4], new BasicStroke(1f)));
        }
        return svg(new JFreeChart(title, JFreeChart.DEFAULT_TITLE_FONT, plot, raw != null || reference != null), WIDTH,
                labels.size() > 8 ? 340 : HEIGHT);
    }

    /**
     * Retention curves: per arm the median with a band over days 1..T, solid up to the last observed day
     * and dashed beyond (projected), with the observed shares as points.
     */
    static String curves(String title, List<String> names, List<double[][]> bands, List<double[]> observed, int[] lastDay) {
        List<String> arms = labels(names);
        title = shorten(title, TITLE);
        YIntervalSeriesCollection data = new YIntervalSeriesCollection();
        DeviationRenderer renderer = new DeviationRenderer(true, false);
        int series = 0;
        for (int k = 0; k < arms.size(); k++) {
            double[][] band = bands.get(k);
            YIntervalSeries seen = new YIntervalSeries(arms.get(k) + " (observed days)");
            YIntervalSeries ahead = new YIntervalSeries(arms.get(k) + " (projected)");
            for (int t = 1; t < band.length; t++) {
                if (t <= lastDay[k]) {
                    seen.add(t, band[t][2], band[t][1], band[t][3]);
                }
                if (t >= lastDay[k]) {
                    ahead.add(t, band[t][2], band[t][1], band[t][3]);
                }
            }
            data.addSeries(seen);
            data.addSeries(ahead);
            Color c = colour(k);
            renderer.setSeriesPaint(series, c);
            renderer.setSeriesFillPaint(series, c);
            renderer.setSeriesStroke(series, new BasicStroke(2f));
            renderer.setSeriesPaint(series + 1, c);
            renderer.setSeriesFillPaint(series + 1, c);
            renderer.setSeriesStroke(series + 1, new BasicStroke(2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10,
                    new float[] {6, 4}, 0));
            series += 2;
        }
        renderer.setAlpha(0.15f);
        NumberAxis x = new NumberAxis("days since install");
        NumberAxis y = new NumberAxis("share of installs");
        y.setNumberFormatOverride(new java.text.DecimalFormat("0%"));
        XYPlot plot = style(new XYPlot(data, x, y, renderer));
        XYSeriesCollection points = new XYSeriesCollection();
        XYLineAndShapeRenderer dots = new XYLineAndShapeRenderer(false, true);
        for (int k = 0; k < arms.size(); k++) {
            XYSeries s = new XYSeries(arms.get(k) + " observed");
            double[] o = observed.get(k);
            for (int t = 1; t < o.length; t++) {
                if (Double.isFinite(o[t])) {
                    s.add(t, o[t]);
                }
            }
            points.addSeries(s);
            dots.setSeriesPaint(k, colour(k));
        }
        plot.setDataset(1, points);
        plot.setRenderer(1, dots);
        return svg(new JFreeChart(title, JFreeChart.DEFAULT_TITLE_FONT, plot, true), WIDTH, 340);
    }
}
