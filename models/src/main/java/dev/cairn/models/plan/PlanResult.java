package dev.cairn.models.plan;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;
import java.util.Map;

/**
 * What {@code cairn plan} writes to plan.json: the plan's settings and assumptions, the figures at the stop of
 * the sequential rule (looking at every look day from minDays, stopping at the first decision), and per look
 * day the same figures cumulated up to that day and, for comparison, those of a test run to exactly that
 * day with no early stop ("fixed horizon").
 *
 * @param kind        always "plan"
 * @param title       the plan's title, or null
 * @param settings    the plan as run, defaults filled in
 * @param assumptions what was assumed true, and how often each arm was truly best
 * @param atStop      the sequential rule's figures at the stop
 * @param days        per look day
 * @param warnings    what a reader should know about these figures
 * @param cautions    the cautions shown with every output
 * @param run         seconds, version, threads
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record PlanResult(String kind, String title, Settings settings, Assumptions assumptions, AtStop atStop,
                         List<Day> days, List<String> warnings, List<String> cautions, Run run) {

    /**
     * The plan as run.
     *
     * @param arms            the arms
     * @param control         the control
     * @param usersPerDay     per arm
     * @param metric          the metric's key
     * @param unit            the metric's unit
     * @param rule            "expected-loss" or "prob-above"
     * @param tolerance       the tolerance given, or null
     * @param toleranceSource "spec", "default" (1% of the control's mean at each look), or null for prob-above
     * @param threshold       prob-above's threshold, or null
     * @param minDays         first day a decision may be taken
     * @param maxDays         last day
     * @param lookEvery       days between looks
     * @param lookDays        the look days
     * @param experiments     simulated tests
     * @param seed            the seed
     * @param method          "approximate" or "draws"
     * @param draws           posterior draws per arm at a look that takes draws
     * @param currency        the currency, or null
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Settings(List<String> arms, String control, Map<String, Long> usersPerDay, String metric, String unit,
                           String rule, Double tolerance, String toleranceSource, Double threshold, int minDays,
                           int maxDays, int lookEvery, List<Integer> lookDays, int experiments, long seed,
                           String method, int draws, String currency) {
    }

    /**
     * What was assumed true.
     *
     * @param baseline the baseline's source and values
     * @param arms     per arm
     */
    public record Assumptions(BaselineUsed baseline, Map<String, ArmAssumed> arms) {
    }

    /**
     * The baseline as used.
     *
     * @param source       "fixed", "priors", "history" or "result"
     * @param payerRate    the payer rate (fixed) or its mean over the simulated tests
     * @param logSpendMean likewise, or null without spend
     * @param logSpendSd   likewise, or null without spend
     * @param note         where a drawn baseline came from, or null
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record BaselineUsed(String source, double payerRate, Double logSpendMean, Double logSpendSd, String note) {
    }

    /**
     * One arm's assumed truth.
     *
     * @param payerRateLift its payer-rate lift: a number, or the distribution
     * @param arppuLift     its ARPPU lift: a number, or the distribution
     * @param value         the metric's true value (the mean over the simulated tests when drawn)
     * @param lift          the metric's true lift over the control (mean over tests), null for the control
     * @param bestShare     the share of tests in which it was truly best (ties shared)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record ArmAssumed(Object payerRateLift, Object arppuLift, double value, Double lift, double bestShare) {
    }

    /**
     * The sequential rule at its stop. Shares are of all simulated tests.
     *
     * @param decidedShare       stopped with a decision before or on maxDays
     * @param shipShare          shipped an arm other than the control
     * @param keepControlShare   decided to keep the control
     * @param undecidedShare     reached maxDays without a decision (the control is kept)
     * @param shipWorseShare     shipped an arm truly worse than the control
     * @param shipNotBetterShare shipped an arm truly no better than the control (under no effect: the false-positive rate)
     * @param shipBetterShare    shipped an arm truly better than the control
     * @param shipBestShare      shipped the truly best arm
     * @param pickBestShare      ended on the truly best arm (shipped, or the control kept when it is best)
     * @param expectedLoss       mean posterior expected loss of the arm acted on at the stop, metric units
     * @param realisedLoss       mean true loss: best arm's true value less the acted-on arm's
     * @param power              with fixed effects: the share shipping an arm (null when effects are drawn)
     * @param assurance          with drawn effects or baseline: the same share, averaged over them (null when fixed)
     * @param duration           days to the stop
     * @param acted              per arm, the share of tests ending on it
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record AtStop(double decidedShare, double shipShare, double keepControlShare, double undecidedShare,
                         double shipWorseShare, double shipNotBetterShare, double shipBetterShare, double shipBestShare,
                         double pickBestShare, double expectedLoss, double realisedLoss, Double power, Double assurance,
                         Duration duration, Map<String, Double> acted) {
    }

    /**
     * Days to the stop (an undecided test counts as maxDays).
     *
     * @param mean   mean days
     * @param p10    10th percentile
     * @param p25    25th percentile
     * @param median median
     * @param p75    75th percentile
     * @param p90    90th percentile
     */
    public record Duration(double mean, int p10, int p25, int median, int p75, int p90) {
    }

    /**
     * One look day.
     *
     * @param day        the day
     * @param sequential the sequential rule, cumulated up to this day
     * @param fixed      a test run to exactly this day, no early stop
     */
    public record Day(int day, Sequential sequential, Fixed fixed) {
    }

    /**
     * The sequential rule up to a day; shares of all tests.
     *
     * @param stoppingShare  tests stopping on this day
     * @param stoppedShare   stopped with a decision by this day
     * @param shipShare      shipped by this day
     * @param shipWorseShare shipped a truly worse arm by this day
     * @param shipBestShare  shipped the truly best arm by this day
     * @param expectedLoss   mean expected loss at the stop of the tests stopped by this day, or null if none
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Sequential(double stoppingShare, double stoppedShare, double shipShare, double shipWorseShare,
                             double shipBestShare, Double expectedLoss) {
    }

    /**
     * A test analysed once, on this day (the control is kept unless the rule ships).
     *
     * @param decidedShare       the rule decided (ship or keep the control)
     * @param shipShare          shipped an arm
     * @param shipWorseShare     shipped a truly worse arm
     * @param shipNotBetterShare shipped an arm truly no better than the control
     * @param shipBestShare      shipped the truly best arm
     * @param pickBestShare      ended on the truly best arm
     * @param expectedLoss       mean posterior expected loss of the arm acted on
     * @param realisedLoss       mean true loss of the arm acted on
     * @param drawsShare         share of these looks that took exact draws (too few payers for the approximation)
     */
    public record Fixed(double decidedShare, double shipShare, double shipWorseShare, double shipNotBetterShare,
                        double shipBestShare, double pickBestShare, double expectedLoss, double realisedLoss,
                        double drawsShare) {
    }

    /**
     * @param seconds wall-clock seconds of the simulation
     * @param threads worker threads (the figures do not depend on them)
     * @param version cairn's version
     */
    public record Run(double seconds, int threads, String version) {
    }
}
