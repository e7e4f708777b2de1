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
}
