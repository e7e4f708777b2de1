package dev.cairn.models.result;

import java.util.List;

/**
 * What to do, for one metric: ship an arm, keep the control, or keep collecting data, with the figures behind
 * it. The rule (see {@link dev.cairn.models.decision.Decisions#decide}): the arm with the least expected loss
 * against the best alternative is chosen once that loss is below the tolerance; otherwise more data are needed.
 *
 * @param metric          the metric decided on (its key, as in the result)
 * @param unit            the metric's unit, e.g. "EUR per user" or "share of installs"
 * @param outcome         "ship", "keep-control" or "keep-collecting"; "no-decision" when the fit did not converge
 * @param arm             the arm to ship or keep; for keep-collecting, the best choice so far; null for no-decision
 * @param statement       the outcome in one plain sentence
 * @param tolerance       the expected loss accepted, in the metric's unit
 * @param toleranceSource "spec" or "default" (1% of the control's posterior mean)
 * @param arms            per arm: expected loss, P(best), lift against the control
 */
public record Decision(String metric, String unit, String outcome, String arm, String statement, double tolerance,
                       String toleranceSource, List<ArmDecision> arms) {

    /**
     * One arm's figures.
     *
     * @param arm          the arm
     * @param expectedLoss E[max over arms of the metric minus this arm's], in the metric's unit
     * @param probBest     the share of draws in which this arm is the best
     * @param lift         the lift against the control (null for the control, or when the control can be 0)
     */
    public record ArmDecision(String arm, double expectedLoss, double probBest, Interval lift) {
    }
}
