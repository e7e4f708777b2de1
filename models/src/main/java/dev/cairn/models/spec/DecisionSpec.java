package dev.cairn.models.spec;

/**
 * How results are summarised and decided.
 *
 * @param interval  the credible interval mass (default 0.95)
 * @param metric    the metric the decision block decides on (default: the model's primary metric)
 * @param tolerance the expected loss accepted when acting, in the metric's unit (default: 1% of the
 *                  control's posterior mean)
 */
public record DecisionSpec(Double interval, String metric, Double tolerance) {
}
