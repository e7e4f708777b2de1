package dev.cairn.models.plan;

/**
 * What a planned test assumes is true of one arm: the users it gets each day and, for each user, a payer
 * rate and a lognormal spend per payer (log spend ~ N(logSpendMean, logSpendSd^2)). A conversion-only arm
 * (no spend simulated) has both spend parameters NaN; see {@link #conversion}.
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
        boolean noSpend = Double.isNaN(logSpendMean) && Double.isNaN(logSpendSd);
        if (!noSpend && !Double.isFinite(logSpendMean)) {
            throw new IllegalArgumentException("logSpendMean must be finite, was " + logSpendMean);
        }
        if (!noSpend && !(logSpendSd > 0 && Double.isFinite(logSpendSd))) {
            throw new IllegalArgumentException("logSpendSd must be > 0, was " + logSpendSd);
        }
    }

    /**
     * An arm whose users convert or not, with no spend simulated.
     *
     * @param usersPerDay new users per day
     * @param payerRate   the share who convert
     * @return the arm's truth, spend parameters NaN
     */
    public static ArmTruth conversion(long usersPerDay, double payerRate) {
        return new ArmTruth(usersPerDay, payerRate, Double.NaN, Double.NaN);
    }

    /** {@return whether spend is simulated (false for a conversion-only arm)} */
    public boolean hasSpend() {
        return !Double.isNaN(logSpendSd);
    }

    /** {@return the true ARPPU, exp(mean + sd^2 / 2); NaN without spend} */
    public double arppu() {
        return Math.exp(logSpendMean + 0.5 * logSpendSd * logSpendSd);
    }

    /** {@return the true ARPU: payer rate x exp(mean + sd^2 / 2)} */
    public double arpu() {
        return payerRate * Math.exp(logSpendMean + 0.5 * logSpendSd * logSpendSd);
    }
}
