package dev.cairn.models.plan;

import dev.cairn.models.prior.Beta;
import dev.cairn.models.prior.NormalInverseGamma;
import dev.cairn.models.result.Metric;
import java.util.List;

/**
 * A validated plan spec (see {@code plan.schema.json} and {@link PlanReader}), with defaults filled in.
 *
 * @param title         a title, or null
 * @param arms          the arms, in the spec's order
 * @param control       the control's index in arms
 * @param usersPerDay   new users per day, per arm
 * @param baseline      what is true of the control
 * @param payerRateLift per arm, the relative change of the payer rate
 * @param arppuLift     per arm, the relative change of spend per payer
 * @param payerPrior    the analysis prior of the payer rate
 * @param spendPrior    the analysis prior of log spend
 * @param metric        the metric decided on
 * @param rule          the decision rule
 * @param tolerance     expected-loss rule: the loss accepted (metric units), or null for 1% of the control's mean
 * @param threshold     prob-above rule: the probability needed to ship
 * @param minDays       the first look (no decision before it)
 * @param maxDays       the last day of the test
 * @param lookEvery     days between looks
 * @param experiments   simulated tests
 * @param seed          the simulation's seed
 * @param approximate   whether looks with enough payers use the approximation
 * @param draws         posterior draws per arm when a look takes draws
 * @param currency      ISO 4217 code of money figures, or null
 */
public record PlanSpec(String title, List<String> arms, int control, long[] usersPerDay, Baseline baseline,
                       Lift[] payerRateLift, Lift[] arppuLift, Beta payerPrior, NormalInverseGamma spendPrior,
                       Metric metric, LookRule.Kind rule, Double tolerance, double threshold, int minDays, int maxDays,
                       int lookEvery, int experiments, long seed, boolean approximate, int draws, String currency) {

    /** {@return the days on which the test is looked at: minDays, then every lookEvery days, and the last day} */
    public int[] lookDays() {
        java.util.List<Integer> days = new java.util.ArrayList<>();
        for (int d = minDays; d <= maxDays; d += lookEvery) {
            days.add(d);
        }
        if (days.isEmpty() || days.get(days.size() - 1) != maxDays) {
            days.add(maxDays);
        }
        return days.stream().mapToInt(Integer::intValue).toArray();
    }

    /** {@return whether any effect or the baseline is a distribution (the success share is then an assurance)} */
    public boolean uncertain() {
        if (!baseline.fixed()) {
            return true;
        }
        for (int k = 0; k < arms.size(); k++) {
            if (!payerRateLift[k].fixed() || !arppuLift[k].fixed()) {
                return true;
            }
        }
        return false;
    }

    /**
     * The rule the looks apply.
     *
     * @return the look rule
     */
    public LookRule lookRule() {
        return new LookRule(rule, metric, control, tolerance, threshold, payerPrior, spendPrior, approximate, draws);
    }
}
