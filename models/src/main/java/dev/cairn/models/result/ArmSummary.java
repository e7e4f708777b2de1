package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;

/** Per arm: data counts and posterior intervals (ARPU and ARPPU absent for conversion-only data). */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record ArmSummary(long users, long payers, Interval arpu, Interval payerRate, Interval arppu) {
}
