package dev.cairn.models.retention;

import dev.cairn.models.InputException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Revenue per active day per arm from a per-user table (arm, revenue, active_days): the ratio estimate
 * R = sum revenue / sum active_days with its standard error by the delta method for a ratio of sums,
 * se = sqrt(n / (n - 1) sum_i (revenue_i - R days_i)^2) / sum days (Cochran 1977, Sampling Techniques,
 * section 6.3). LTV draws use R + se z per draw, so this uncertainty flows into the LTV interval.
 */
final class RevenuePerActiveDay {
    private RevenuePerActiveDay() {
    }

    /** arm -> {estimate, standard error}. */
    static Map<String, double[]> read(String path, Path baseDir) {
        // Users are first counted per distinct (arm, revenue, active days); the sums then run over those
        // unique cells in a fixed order, so their last bits do not depend on how many threads read the file.
        String order = " ORDER BY revenue, days)";
        Map<String, String> columns = new LinkedHashMap<>();
        columns.put("arm", "VARCHAR");
        columns.put("revenue", "DOUBLE");
        columns.put("active_days", "DOUBLE");
        return dev.cairn.models.data.SideTable.read(path, baseDir, "ltv.revenuePerActiveDay.path", columns, relation ->
                "SELECT arm, CAST(sum(n) AS BIGINT), sum(n * revenue" + order + ", sum(n * days" + order + ", "
                + "sum(n * revenue * revenue" + order + ", sum(n * days * days" + order + ", "
                + "sum(n * revenue * days" + order + ", "
                + "CAST(coalesce(sum(n) FILTER (WHERE revenue < 0 OR days < 0), 0) AS BIGINT) "
                + "FROM (SELECT arm, revenue, days, count(*) AS n FROM (SELECT trim(arm) AS arm, "
                + "revenue, active_days AS days FROM " + relation + ") "
                + "GROUP BY arm, revenue, days) GROUP BY arm ORDER BY arm", r -> {
                    Map<String, double[]> out = new LinkedHashMap<>();
                    while (r.next()) {
                        String arm = r.getString(1);
                        double n = r.getLong(2), rev = r.getDouble(3), days = r.getDouble(4);
                        double rev2 = r.getDouble(5), days2 = r.getDouble(6), cross = r.getDouble(7);
                        if (r.getLong(8) > 0) {
                            throw new InputException(path + ": arm " + arm + ": revenue and active_days must be >= 0");
                        }
                        if (!(days > 0) || n < 2) {
                            throw new InputException(path + ": arm " + arm + ": needs at least 2 users with active days");
                        }
                        double ratio = rev / days;
                        double residual = Math.max(0, rev2 - 2 * ratio * cross + ratio * ratio * days2);
                        double se = Math.sqrt(n / (n - 1) * residual) / days;
                        out.put(arm, new double[] {ratio, se});
                    }
                    return out;
                });
    }
}
