package dev.cairn.models.data;

/**
 * Sufficient statistics of one arm (or one arm in one segment): n users, m payers (spend > 0) and, over
 * payers, S1 = sum log y and S2 = sum (log y)^2. The remaining fields are observed statistics for the
 * posterior predictive checks (NaN when the layout does not carry them).
 */
public record ArmStats(String arm, long users, long payers, double logSpendSum, double logSpendSqSum,
                       double spendSum, double payerP50, double payerP90, double payerP99, double spendMax) {

    /**
     * Statistics of an arm with conversions only (no spend).
     *
     * @param arm    the arm's name
     * @param users  users
     * @param payers users who paid
     * @return the statistics
     */
    public static ArmStats conversions(String arm, long users, long payers) {
        double nan = Double.NaN;
        return new ArmStats(arm, users, payers, nan, nan, nan, nan, nan, nan, nan);
    }

    /**
     * Statistics of an arm from a summary row: counts and the payers' log-spend sums.
     *
     * @param arm    the arm's name
     * @param users  users
     * @param payers users who paid
     * @param s1     sum of the payers' log spend
     * @param s2     sum of the payers' squared log spend
     * @return the statistics
     */
    public static ArmStats summary(String arm, long users, long payers, double s1, double s2) {
        double nan = Double.NaN;
        return new ArmStats(arm, users, payers, s1, s2, nan, nan, nan, nan, nan);
    }

    /** {@return mean log spend of payers, S1 / m} */
    public double meanLogSpend() {
        return logSpendSum / payers;
    }

    /** {@return sum of squared deviations of payers' log spend from their mean, S2 - S1^2 / m (never negative)} */
    public double logSpendSquaredDeviations() {
        return payers == 0 ? 0 : Math.max(0, logSpendSqSum - logSpendSum * logSpendSum / payers);
    }
}
