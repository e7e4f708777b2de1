package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;

/** Per arm: data counts and posterior intervals (ARPU and ARPPU absent for conversion-only data). */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record ArmSummary(long users, long payers, Interval arpu, Interval payerRate, Interval arppu) {

    /**
     * The interval of a spend metric; null for one these data do not give.
     *
     * @param metric ARPU, payer rate or ARPPU
     * @return the interval, or null
     */
    public Interval of(Metric metric) {
        if (metric.equals(Metric.ARPU)) {
            return arpu;
        }
        if (metric.equals(Metric.PAYER_RATE)) {
            return payerRate;
        }
        return metric.equals(Metric.ARPPU) ? arppu : null;
    }
}
