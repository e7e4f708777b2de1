package dev.cairn.models.decision;

import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.Decision;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.Interval;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * What the models say about arms against each other, computed one way for every model and for the report:
 * draw by draw comparisons with the control (lift, difference, P(above), expected loss), P(best) over the
 * arms, and the lift draws a chart shows. Comparisons of several arms and metrics run in parallel; each
 * depends on its own draws only, so the result does not depend on the number of threads.
 */
public final class Decisions {
    private Decisions() {
    }

    /**
     * One arm against the control, draw by draw. The lift is left out (null) when the control's value is 0 in
     * some draw (no retention at all, say), since a ratio to 0 has no value; the rest stays.
     *
     * @param arm     the arm
     * @param control the control arm
     * @param metric  the metric's key
     * @param x       the arm's draws of the metric
     * @param c       the control's draws, paired with x
     * @param level   the intervals' probability
     * @return the comparison: lift, difference, P(arm above control), expected loss
     */
    public static Comparison compare(String arm, String control, String metric, double[] x, double[] c, double level) {
        double[] lift = new double[x.length];
        double[] difference = new double[x.length];
        double above = 0;
        double loss = 0;
        boolean ratio = true;
        for (int i = 0; i < x.length; i++) {
            ratio &= c[i] > 0;
            lift[i] = x[i] / c[i] - 1;
            difference[i] = x[i] - c[i];
            above += x[i] > c[i] ? 1 : 0;
            loss += Math.max(c[i] - x[i], 0);
        }
        return new Comparison(arm, control, metric, ratio ? Interval.of(lift, level) : null, Interval.of(difference, level),
                above / x.length, loss / x.length);
    }

    /**
     * The lift of each draw, x / control - 1, for charts; NaN in a draw where the control is 0.
     *
     * @param x       the arm's draws
     * @param control the control's draws, as many
     * @return the lift per draw
     */
    public static double[] liftDraws(double[] x, double[] control) {
        double[] lift = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            lift[i] = control[i] > 0 ? x[i] / control[i] - 1 : Double.NaN;
        }
        return lift;
    }

    /**
     * P(best) over the arms, given each arm's draws of one metric (all of the same length).
     *
     * @param arms    the arms
     * @param drawsOf an arm's draws
     * @return per arm, the share of draws in which it has the highest value
     */
    public static Map<String, Double> probBest(List<String> arms, java.util.function.Function<String, double[]> drawsOf) {
        double[][] values = new double[arms.size()][];
        for (int k = 0; k < arms.size(); k++) {
            values[k] = drawsOf.apply(arms.get(k));
        }
        long[] best = new long[arms.size()];
        int n = values[0].length;
        for (int i = 0; i < n; i++) {
            best[bestIn(values, i)]++;
        }
        Map<String, Double> m = new LinkedHashMap<>();
        for (int k = 0; k < arms.size(); k++) {
            m.put(arms.get(k), (double) best[k] / n);
        }
        return m;
    }

    /**
     * Every non-control arm against the control on each metric, reading draws through {@code drawsOf(metric, arm)}.
     *
     * @param arms    the arms
     * @param control the control arm
     * @param metrics the metrics' keys
     * @param drawsOf the draws of a metric for an arm
     * @param level   the intervals' probability
     * @return the comparisons, metric by metric, arm by arm
     */
    public static List<Comparison> compareAll(List<String> arms, String control, List<String> metrics,
                                              java.util.function.BiFunction<String, String, double[]> drawsOf,
                                              double level) {
        List<String[]> pairs = new ArrayList<>();
        for (String a : arms) {
            if (a.equals(control)) {
                continue;
            }
            for (String metric : metrics) {
                pairs.add(new String[] {a, metric});
            }
        }
        return new ArrayList<>(java.util.stream.IntStream.range(0, pairs.size()).parallel().mapToObj(k -> {
            String a = pairs.get(k)[0];
            String metric = pairs.get(k)[1];
            return compare(a, control, metric, drawsOf.apply(metric, a), drawsOf.apply(metric, control), level);
        }).toList());
    }

    /** The arm with the highest value in draw i (a tie goes to the first). */
    private static int bestIn(double[][] values, int i) {
        int argmax = 0;
        for (int k = 1; k < values.length; k++) {
            if (values[k][i] > values[argmax][i]) {
                argmax = k;
            }
        }
        return argmax;
    }

    /** The default tolerance: this share of the control's posterior mean of the metric. */
    public static final double DEFAULT_RELATIVE_TOLERANCE = 0.01;

    /**
     * The decision on one metric by the expected-loss rule of Bayesian decision theory (Berger 1985,
     * "Statistical Decision Theory and Bayesian Analysis", chapter 4): choosing arm a loses, in a draw,
     * max_b theta_b - theta_a; its expected loss is that averaged over the draws. The arm with the least
     * expected loss is the Bayes choice; it is acted on (ship it, or keep the control when it is the control)
     * once its expected loss is below {@code tolerance}, else the outcome is to keep collecting data. The rule
     * bounds the loss expected from acting now, in the metric's unit; it is not a frequentist error rate.
     *
     * @param arms      the arms (at least two)
     * @param control   the control arm
     * @param metric    the metric
     * @param drawsOf   an arm's draws of the metric (paired across arms, all of one length)
     * @param tolerance the expected loss accepted, in the metric's unit; null for the default,
     *                  {@value #DEFAULT_RELATIVE_TOLERANCE} x the control's posterior mean (its absolute value)
     * @param level     the lift intervals' probability
     * @param currency  the ISO 4217 code of money figures, or null
     * @return the decision and each arm's figures
     */
    public static Decision decide(List<String> arms, String control, Metric metric,
                                  java.util.function.Function<String, double[]> drawsOf, Double tolerance,
                                  double level, String currency) {
        double[][] values = new double[arms.size()][];
        for (int k = 0; k < arms.size(); k++) {
            values[k] = drawsOf.apply(arms.get(k));
        }
        int n = values[0].length;
        double[] loss = new double[arms.size()];
        long[] best = new long[arms.size()];
        for (int i = 0; i < n; i++) {
            int argmax = bestIn(values, i);
            best[argmax]++;
            for (int k = 0; k < arms.size(); k++) {
                loss[k] += values[argmax][i] - values[k][i];
            }
        }
        int c = arms.indexOf(control);
        double controlMean = java.util.Arrays.stream(values[c]).average().orElse(0);
        double tol = tolerance != null ? tolerance : DEFAULT_RELATIVE_TOLERANCE * Math.abs(controlMean);
        List<Decision.ArmDecision> figures = new ArrayList<>();
        int chosen = 0;
        for (int k = 0; k < arms.size(); k++) {
            loss[k] /= n;
            if (loss[k] < loss[chosen] || (loss[k] == loss[chosen] && k == c)) {
                chosen = k;
            }
            Interval lift = null;
            if (k != c) {
                Comparison cmp = compare(arms.get(k), control, metric.key(), values[k], values[c], level);
                lift = cmp.lift();
            }
            figures.add(new Decision.ArmDecision(arms.get(k), loss[k], (double) best[k] / n, lift));
        }
        String arm = arms.get(chosen);
        String unit = metric.unitLabel(currency);
        String lossText = metric.amount(loss[chosen], currency);
        String tolText = metric.amount(tol, currency);
        String outcome;
        String statement;
        String share = Math.round(100 * (double) best[chosen] / n) + "%";
        if (loss[chosen] < tol || loss[chosen] == 0) {
            outcome = chosen == c ? "keep-control" : "ship";
            statement = chosen == c
                    ? "Keep the control, " + arm + ": it is the best arm on " + metric.label() + " with probability "
                    + share + ", and no other arm is expected to gain more than the tolerance (expected loss "
                    + lossText + ", tolerance " + tolText + ")."
                    : "Ship " + arm + ": it is the best arm on " + metric.label() + " with probability " + share
                    + ", and choosing it is expected to cost " + lossText + " against whichever arm is truly best, "
                    + "below the tolerance of " + tolText + ".";
        } else {
            outcome = "keep-collecting";
            statement = "Keep collecting data: " + arm + " looks best on " + metric.label() + " (probability " + share
                    + "), but choosing it now could still cost " + lossText + " in expectation, above the tolerance of "
                    + tolText + ".";
        }
        return new Decision(metric.key(), unit, outcome, arm, statement, tol, tolerance != null ? "spec" : "default",
                figures);
    }
}
