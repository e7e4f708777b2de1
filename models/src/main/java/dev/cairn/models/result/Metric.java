package dev.cairn.models.result;

import java.util.List;

/**
 * A quantity the models compare arms on: its key in result.json and in draw names ({@code arpu[A]}), its
 * label for people, and the kind of unit its values are in — so that a table never mixes currency per user
 * with a share without saying so.
 *
 * @param key   the key in result.json and the prefix of its draw columns
 * @param label how a report or terminal names it
 * @param unit  what its values measure
 */
public record Metric(String key, String label, Unit unit) {

    /** What a metric's values measure. */
    public enum Unit {
        /** currency per user (ARPU) */
        CURRENCY_PER_USER,
        /** currency per paying user (ARPPU) */
        CURRENCY_PER_PAYER,
        /** currency per install over a horizon (LTV) */
        CURRENCY_PER_INSTALL,
        /** a share between 0 and 1 (payer rate, day-N retention) */
        SHARE
    }

    public static final Metric ARPU = new Metric("arpu", "ARPU", Unit.CURRENCY_PER_USER);
    public static final Metric PAYER_RATE = new Metric("payerRate", "payer rate", Unit.SHARE);
    public static final Metric ARPPU = new Metric("arppu", "ARPPU", Unit.CURRENCY_PER_PAYER);
    public static final Metric LTV = new Metric("ltv", "LTV", Unit.CURRENCY_PER_INSTALL);

    /**
     * The spend models' metrics, primary first; conversion-only data have {@link #PAYER_RATE} alone.
     *
     * @param hasSpend whether the data have spend
     * @return the metrics
     */
    public static List<Metric> spend(boolean hasSpend) {
        return hasSpend ? List.of(ARPU, PAYER_RATE, ARPPU) : List.of(PAYER_RATE);
    }

    /**
     * Day-N retention (key {@code d7}, label {@code D7}).
     *
     * @param n the day
     * @return the metric
     */
    public static Metric day(int n) {
        return new Metric("d" + n, "D" + n, Unit.SHARE);
    }

    /**
     * The metric of a key as results write it; an unknown key becomes a metric labelled by itself.
     *
     * @param key the key, e.g. "arpu" or "d7"
     * @return the metric
     */
    public static Metric of(String key) {
        for (Metric m : List.of(ARPU, PAYER_RATE, ARPPU, LTV)) {
            if (m.key.equals(key)) {
                return m;
            }
        }
        if (key.matches("d\\d+")) {
            return day(Integer.parseInt(key.substring(1)));
        }
        return new Metric(key, key, Unit.SHARE);
    }

    /**
     * The draw column of this metric for an arm or scope: {@code key[arm]}.
     *
     * @param armOrScope the arm, or a scope such as "population"
     * @return the column name
     */
    public String column(String armOrScope) {
        return key + "[" + armOrScope + "]";
    }

    /** The scope of segmented-spend's population quantities (segments weighted by their users). */
    public static final String POPULATION = "population";

    /**
     * The draw column of this metric for an arm within a scope (segmented-spend): {@code key[scope/arm]}.
     *
     * @param scope {@link #POPULATION}, "typical" or a segment
     * @param arm   the arm
     * @return the column name
     */
    public String column(String scope, String arm) {
        return column(scope + "/" + arm);
    }

    /**
     * The unit of this metric's values, for people.
     *
     * @param currency the ISO 4217 code of money figures, or null when the spec gives none
     * @return e.g. "EUR per user", "currency units per payer", "share" (shares are fractions of 1)
     */
    public String unitLabel(String currency) {
        String money = currency != null ? currency : "currency units";
        return switch (unit) {
            case CURRENCY_PER_USER -> money + " per user";
            case CURRENCY_PER_PAYER -> money + " per payer";
            case CURRENCY_PER_INSTALL -> money + " per install";
            case SHARE -> "share";
        };
    }

    /**
     * A value of this metric, or a difference of two, as people read it: shares as percentage points, money
     * with its unit, three significant digits, never in exponent notation.
     *
     * @param value    the value in the metric's own unit
     * @param currency the ISO 4217 code, or null
     * @return e.g. "0.12 percentage points" or "0.0042 EUR per user"
     */
    public String amount(double value, String currency) {
        if (unit == Unit.SHARE) {
            return plain(100 * value) + " percentage points";
        }
        return plain(value) + " " + unitLabel(currency);
    }

    /** Three significant digits in plain notation (0 as "0"). */
    static String plain(double v) {
        if (v == 0 || !Double.isFinite(v)) {
            return v == 0 ? "0" : Double.toString(v);
        }
        return new java.math.BigDecimal(v).round(new java.math.MathContext(3)).stripTrailingZeros().toPlainString();
    }
}
