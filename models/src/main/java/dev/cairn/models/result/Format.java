package dev.cairn.models.result;

import java.util.Locale;

/**
 * How numbers read, one way for the terminal and the report: significant digits with thousands separators and
 * no exponent for the magnitudes results have, shares and lifts as percentages, money and losses with their
 * unit.
 */
public final class Format {
    private Format() {
    }

    /**
     * {@code digits} significant digits: "12,345", "0.2992", "0.00269"; an exponent only below 1e-9 or from
     * 1e15 on; "-" when undefined.
     *
     * @param x      the number
     * @param digits significant digits, >= 1
     * @return the text
     */
    public static String sig(double x, int digits) {
        if (Double.isNaN(x)) {
            return "-";
        }
        if (Double.isInfinite(x)) {
            return x > 0 ? "inf" : "-inf";
        }
        if (x == 0) {
            return "0";
        }
        double a = Math.abs(x);
        if (a < 1e-9 || a >= 1e15) {
            return String.format(Locale.ROOT, "%." + (digits - 1) + "e", x);
        }
        java.math.BigDecimal d = new java.math.BigDecimal(x).round(new java.math.MathContext(digits));
        if (a >= 1000) {
            return String.format(Locale.ROOT, "%,." + Math.max(0, d.scale()) + "f", d);
        }
        return d.toPlainString();
    }

    /**
     * A metric's interval: shares as percentages with two decimals, other values with four significant digits.
     *
     * @param metric the metric
     * @param i      median [lo, hi]
     * @return e.g. "3.01% [2.85%, 3.19%]" or "0.2992 [0.2711, 0.3322]"
     */
    public static String interval(Metric metric, Interval i) {
        if (i == null) {
            return "-";
        }
        if (metric.unit() == Metric.Unit.SHARE) {
            return String.format(Locale.ROOT, "%.2f%% [%.2f%%, %.2f%%]", 100 * i.median(), 100 * i.lo(), 100 * i.hi());
        }
        return sig(i.median(), 4) + " [" + sig(i.lo(), 4) + ", " + sig(i.hi(), 4) + "]";
    }

    /**
     * A probability as a percentage with one decimal: "81.1%"; "< 0.1%" and "> 99.9%" at the ends, where the
     * draws cannot say more.
     *
     * @param p the probability, in [0, 1] (NaN: "-")
     * @return the text
     */
    public static String probability(double p) {
        if (Double.isNaN(p)) {
            return "-";
        }
        if (p < 0.0005) {
            return "< 0.1%";
        }
        if (p > 0.9995) {
            return "> 99.9%";
        }
        return String.format(Locale.ROOT, "%.1f%%", 100 * p);
    }

    /**
     * A lift interval as signed percentages, or why there is none.
     *
     * @param lift median [lo, hi] as fractions, or null when the control can be 0
     * @return e.g. "+14.1% [-2.1%, +33.0%]"
     */
    public static String lift(Interval lift) {
        return lift == null ? "undefined (control can be 0)" : String.format(Locale.ROOT, "%+.1f%% [%+.1f%%, %+.1f%%]",
                100 * lift.median(), 100 * lift.lo(), 100 * lift.hi());
    }

    /**
     * An expected loss (or any difference of the metric) with its unit.
     *
     * @param metric   the metric
     * @param value    in the metric's unit
     * @param currency the ISO 4217 code, or null
     * @return e.g. "0.00269 EUR per user" or "0.12 percentage points"
     */
    public static String loss(Metric metric, double value, String currency) {
        return metric.amount(value, currency);
    }

    /**
     * A table heading naming the metric and its unit.
     *
     * @param metric   the metric
     * @param currency the ISO 4217 code, or null
     * @return e.g. "ARPU (EUR per user)" or "payer rate (%)"
     */
    public static String heading(Metric metric, String currency) {
        return metric.label() + " (" + (metric.unit() == Metric.Unit.SHARE ? "%" : metric.unitLabel(currency)) + ")";
    }
}
