package dev.cairn.cli.report;

import java.awt.BasicStroke;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/** Charts over days or periods (a plan's look days, a running test's timeline), in {@link Charts}' style. */
final class DayCharts {
    private DayCharts() {
    }

    /**
     * Lines over days, one series per name (dashed where {@code dashed[k]}, in palette colour {@code colours[k]}),
     * y as a percentage when
     * {@code percent}; an optional horizontal reference line.
     */
    static String lines(String title, String xLabel, String yLabel, boolean percent, List<String> names, int[] x,
                        List<double[]> ys, boolean[] dashed, int[] colours, Double reference, String referenceLabel) {
        XYSeriesCollection data = new XYSeriesCollection();
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, false);
        List<String> labels = Charts.labels(names);
        for (int k = 0; k < labels.size(); k++) {
            XYSeries s = new XYSeries(labels.get(k));
            double[] y = ys.get(k);
            for (int i = 0; i < x.length; i++) {
                if (Double.isFinite(y[i])) {
                    s.add(x[i], y[i]);
                }
            }
            data.addSeries(s);
            renderer.setSeriesPaint(k, Charts.colour(colours[k]));
            renderer.setSeriesStroke(k, dashed[k] ? new BasicStroke(2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10,
                    new float[] {6, 4}, 0) : new BasicStroke(2f));
        }
        NumberAxis xAxis = new NumberAxis(xLabel);
        xAxis.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        NumberAxis yAxis = new NumberAxis(yLabel);
        if (percent) {
            yAxis.setNumberFormatOverride(new java.text.DecimalFormat("0%"));
        }
        XYPlot plot = Charts.style(new XYPlot(data, xAxis, yAxis, renderer));
        if (reference != null) {
            ValueMarker m = new ValueMarker(reference, Charts.NEUTRAL, new BasicStroke(1.2f, BasicStroke.CAP_BUTT,
                    BasicStroke.JOIN_MITER, 10, new float[] {2, 3}, 0));
            plot.addRangeMarker(m);
            Charts.legendWith(plot, Charts.line(referenceLabel, Charts.NEUTRAL, m.getStroke()));
        }
        return Charts.svg(new JFreeChart(Charts.shorten(title, Charts.TITLE), JFreeChart.DEFAULT_TITLE_FONT, plot, true), Charts.WIDTH, Charts.HEIGHT);
    }

    /** Bars over days (a distribution of days), y as a percentage. */
    static String dayBars(String title, String xLabel, String yLabel, int[] x, double[] y) {
        XYSeriesCollection data = new XYSeriesCollection();
        XYSeries s = new XYSeries(yLabel);
        for (int i = 0; i < x.length; i++) {
            s.add(x[i], y[i]);
        }
        data.addSeries(s);
        XYBarRenderer renderer = new XYBarRenderer(0.15);
        renderer.setBarPainter(new StandardXYBarPainter());
        renderer.setShadowVisible(false);
        renderer.setSeriesPaint(0, Charts.colour(0));
        NumberAxis xAxis = new NumberAxis(xLabel);
        xAxis.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        NumberAxis yAxis = new NumberAxis(yLabel);
        yAxis.setNumberFormatOverride(new java.text.DecimalFormat("0%"));
        XYPlot plot = Charts.style(new XYPlot(new org.jfree.data.xy.XYBarDataset(data, 0.8), xAxis, yAxis, renderer));
        return Charts.svg(new JFreeChart(Charts.shorten(title, Charts.TITLE), JFreeChart.DEFAULT_TITLE_FONT, plot, false), Charts.WIDTH, Charts.HEIGHT);
    }
}
