package dev.cairn.models.plan;

/**
 * What a planned test assumes is true of one arm: the users it gets each day and, for each user, a payer
 * rate and a lognormal spend per payer (log spend ~ N(logSpendMean, logSpendSd^2)).
 *
 * @param usersPerDay  new users of the arm per day, >= 0
 * @param payerRate    the share of users who pay, in [0, 1]
 * @param logSpendMean the mean of a payer's log spend
 * @param logSpendSd   the standard deviation of a payer's log spend, > 0
 */
public record ArmTruth(long usersPerDay, double payerRate, double logSpendMean, double logSpendSd) {
    public ArmTruth {
        if (usersPerDay < 0 || usersPerDay > Integer.MAX_VALUE) {
            throw new IllegalArgumentException("usersPerDay must be 0.." + Integer.MAX_VALUE + ", was " + usersPerDay);
        }
        if (!(payerRate >= 0 && payerRate <= 1)) {
            throw new IllegalArgumentException("payerRate must be in [0, 1], was " + payerRate);
        }
        if (!Double.isFinite(logSpendMean)) {
            throw new IllegalArgumentException("logSpendMean must be finite, was " + logSpendMean);
        }
        if (!(logSpendSd > 0 && Double.isFinite(logSpendSd))) {
            throw new IllegalArgumentException("logSpendSd must be > 0, was " + logSpendSd);
        }
    }

    /** {@return the true ARPU: payer rate x exp(mean + sd^2 / 2)} */
    public double arpu() {
        return payerRate * Math.exp(logSpendMean + 0.5 * logSpendSd * logSpendSd);
    }
}
