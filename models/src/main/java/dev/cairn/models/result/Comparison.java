package dev.cairn.models.result;

import com.fasterxml.jackson.annotation.JsonInclude;

/**
 * One arm against the control on one metric, draw by draw: lift = arm / control - 1, difference =
 * arm - control, probAbove = P(arm > control), expectedLoss = E[max(control - arm, 0)] (what shipping
 * the arm costs per user, in the metric's unit, in the draws where it is worse). {@code lift} is null (absent
 * from the JSON) when the control's value is 0 in some draw: a ratio to 0 has no value.
 *
 * @param scope   segmented-spend only: "population" (user-weighted over segments) or "typical-segment"
 *                for the overall comparisons, absent for per-segment ones
 * @param rawLift segmented-spend only: the lift from the segment's own data alone (no pooling), so the
 *                shrinkage shows; absent when the data cannot give one (no payers, a missing arm)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Comparison(String arm, String control, String metric, Interval lift, Interval difference,
                         double probAbove, double expectedLoss, String scope, Double rawLift) {

    public Comparison(String arm, String control, String metric, Interval lift, Interval difference,
                      double probAbove, double expectedLoss) {
        this(arm, control, metric, lift, difference, probAbove, expectedLoss, null, null);
    }

    /**
     * The same comparison marked with its scope and the raw lift from the segment's own data.
     *
     * @param s   "population", "typical-segment", or null for a segment's own
     * @param raw the lift from the segment's data alone, or null
     * @return the comparison
     */
    public Comparison withScope(String s, Double raw) {
        return new Comparison(arm, control, metric, lift, difference, probAbove, expectedLoss, s, raw);
    }
}
