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
        Path file = baseDir.resolve(path).normalize();
        if (!Files.isRegularFile(file)) {
            throw new InputException(path + ": no such file (ltv.revenuePerActiveDay.path)");
        }
        String quoted = "'" + file.toString().replace("'", "''") + "'";
        String relation = file.toString().toLowerCase(java.util.Locale.ROOT).endsWith(".parquet")
                ? "read_parquet(" + quoted + ")" : "read_csv(" + quoted + ", header = true, delim = ',')";
        // Users are first counted per distinct (arm, revenue, active days); the sums then run over those
        // unique cells in a fixed order, so their last bits do not depend on how many threads read the file.
        String order = " ORDER BY revenue, days)";
        String sql = "SELECT arm, CAST(sum(n) AS BIGINT), sum(n * revenue" + order + ", sum(n * days" + order + ", "
                + "sum(n * revenue * revenue" + order + ", sum(n * days * days" + order + ", "
                + "sum(n * revenue * days" + order + ", "
                + "CAST(coalesce(sum(n) FILTER (WHERE revenue < 0 OR days < 0), 0) AS BIGINT) "
                + "FROM (SELECT arm, revenue, days, count(*) AS n FROM (SELECT trim(CAST(arm AS VARCHAR)) AS arm, "
                + "CAST(revenue AS DOUBLE) AS revenue, CAST(active_days AS DOUBLE) AS days FROM " + relation + ") "
                + "GROUP BY arm, revenue, days) GROUP BY arm ORDER BY arm";
        Map<String, double[]> out = new LinkedHashMap<>();
        try (Connection db = dev.cairn.models.data.Engine.connect(); Statement s = db.createStatement();
             ResultSet r = s.executeQuery(sql)) {
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
        } catch (SQLException e) {
            throw new InputException(path + ": cannot read revenue per active day (columns arm, revenue, active_days): "
                    + e.getMessage().lines().findFirst().orElse(""));
        }
        return out;
    }
}
