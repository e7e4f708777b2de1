package dev.cairn.models.data;

import java.util.List;

/**
 * What the spend models see of the data: one {@link ArmStats} per arm, in sorted arm order.
 *
 * @param arms     per-arm sufficient statistics
 * @param hasSpend false for conversion-only data (users and payers only)
 * @param source   the file (or "inline rows") the statistics came from
 * @param rows     data rows read
 * @param warnings data warnings (e.g. duplicate user ids) to show with the result
 * @param query    the SQL that built the statistics, so a warehouse can run the same
 */
public record SpendData(List<ArmStats> arms, boolean hasSpend, String source, long rows, List<String> warnings,
                        String query) {
    public SpendData {
        arms = List.copyOf(arms);
        warnings = List.copyOf(warnings);
    }

    /**
     * {@return the arms' names, in the data's sorted order}
     */
    public List<String> armNames() {
        return arms.stream().map(ArmStats::arm).toList();
    }

    /**
     * The statistics of one arm.
     *
     * @param name the arm
     * @return its statistics
     * @throws IllegalArgumentException when there is no such arm
     */
    public ArmStats arm(String name) {
        for (ArmStats a : arms) {
            if (a.arm().equals(name)) {
                return a;
            }
        }
        throw new IllegalArgumentException("no arm '" + name + "'");
    }

    /**
     * {@return whether the arms carry observed spend sums (a users or summary table with spend), which the predictive checks need}
     */
    public boolean hasObservedSpendStatistics() {
        return hasSpend && !arms.isEmpty() && !Double.isNaN(arms.get(0).spendSum());
    }
}
