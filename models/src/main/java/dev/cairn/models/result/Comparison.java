package dev.cairn.models.result;

/**
 * One arm against the control on one metric, draw by draw: lift = arm / control - 1, difference =
 * arm - control, probAbove = P(arm > control), expectedLoss = E[max(control - arm, 0)] (what shipping
 * the arm costs per user, in the metric's unit, in the draws where it is worse).
 */
public record Comparison(String arm, String control, String metric, Interval lift, Interval difference,
                         double probAbove, double expectedLoss) {
}
