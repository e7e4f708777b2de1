package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.Map;

/**
 * The evidence at the end of one period of a running test ({@code data.columns.time}): everything up to and
 * including it, and the decision the rule would have given then.
 *
 * @param time         the period: a date (YYYY-MM-DD) or a day number
 * @param users        per arm, users so far
 * @param payers       per arm, payers so far
 * @param lift         per non-control arm, the decided metric's lift over the control (null figures when
 *                     the data so far cannot give one)
 * @param probBest     per arm, P(best) on the decided metric
 * @param expectedLoss per arm, the expected loss of choosing it now, in the metric's unit
 * @param outcome      ship, keep-control, keep-collecting, or no-decision (an arm without payers yet under
 *                     the default spend prior)
 * @param arm          the arm the outcome names (the best-looking one)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record TimelineDay(Object time, Map<String, Long> users, Map<String, Long> payers, Map<String, Interval> lift,
                          Map<String, Double> probBest, Map<String, Double> expectedLoss, String outcome, String arm) {
}
