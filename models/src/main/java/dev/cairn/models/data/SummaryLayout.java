package dev.cairn.models.data;

import static dev.cairn.models.data.SpendDataReader.ARM;
import static dev.cairn.models.data.SpendDataReader.LOG_SQ_SUM;
import static dev.cairn.models.data.SpendDataReader.LOG_SUM;
import static dev.cairn.models.data.SpendDataReader.PAYERS;
import static dev.cairn.models.data.SpendDataReader.USERS;
import static dev.cairn.models.data.SpendDataReader.conversionOnly;
import static dev.cairn.models.data.SpendDataReader.keys;
import static dev.cairn.models.data.SpendDataReader.selected;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.models.spec.SpecReader;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;

/**
 * The spend models' {@code summary} layout: one row per arm (or segment and arm) with users, payers and the
 * payers' sums of log spend and of its square. Rows are checked one by one first (a bad row is named, not
 * summed away), then added per arm in increasing order of value, so the sums do not depend on threads.
 */
final class SummaryLayout {
    private SummaryLayout() {
    }

    static SpendDataReader.Cells read(Connection db, Source source, DataSpec data, String segment) throws SQLException {
        String segmentExpr = segment == null ? null : "trim(CAST(" + Sql.identifier(segment) + " AS VARCHAR))";
        List<String> segments = new ArrayList<>();
        String arm = source.require(data, ARM, ARM);
        String users = source.require(data, USERS, USERS);
        String payers = source.require(data, PAYERS, PAYERS);
        refuseOtherColumns(source, data, segment);
        String s1 = source.optional(data, "logSpendSum", LOG_SUM);
        String s2 = source.optional(data, "logSpendSqSum", LOG_SQ_SUM);
        if ((s1 == null) != (s2 == null)) {
            throw new InputException(source.name + ": give both '" + data.column("logSpendSum", LOG_SUM) + "' and '"
                    + data.column("logSpendSqSum", LOG_SQ_SUM) + "' for spend, or neither for conversions only");
        }
        boolean hasSpend = s1 != null;
        String armExpr = "trim(CAST(" + Sql.identifier(arm) + " AS VARCHAR))";
        // Counts are read as numbers and checked to be whole, so 100.5 users is refused rather than rounded.
        String n = "CAST(" + Sql.identifier(users) + " AS DOUBLE)";
        String m = "CAST(" + Sql.identifier(payers) + " AS DOUBLE)";
        String a = hasSpend ? "CAST(" + Sql.identifier(s1) + " AS DOUBLE)" : "0.0";
        String b = hasSpend ? "CAST(" + Sql.identifier(s2) + " AS DOUBLE)" : "0.0";
        // Row checks first: summary tables are small, and a bad row must be named, not summed away.
        String[][] rules = {
            {armExpr + " IS NULL OR " + armExpr + " = ''", arm, "arm is empty"},
            {segmentExpr == null ? "false" : segmentExpr + " IS NULL OR " + segmentExpr + " = ''", segment, "segment is empty"},
            {n + " IS NULL OR " + m + " IS NULL", users + "/" + payers, "users and payers must be given"},
            {"isnan(" + n + ") OR isinf(" + n + ") OR " + n + " <> floor(" + n + ")", users,
                "users must be a whole number"},
            {"isnan(" + m + ") OR isinf(" + m + ") OR " + m + " <> floor(" + m + ")", payers,
                "payers must be a whole number"},
            {n + " < 0 OR " + m + " < 0", users + "/" + payers, "users and payers must be >= 0"},
            {m + " > " + n, payers, "payers must not exceed users"},
            {hasSpend ? "(" + m + " > 0 AND (" + a + " IS NULL OR " + b + " IS NULL))" : "false",
                data.column("logSpendSum", LOG_SUM), "log-spend sums are needed where payers > 0"},
            {hasSpend ? "isnan(" + a + ") OR isinf(" + a + ") OR isnan(" + b + ") OR isinf(" + b + ")" : "false",
                data.column("logSpendSum", LOG_SUM), "log-spend sums must be finite numbers"},
            {hasSpend ? "(" + m + " > 0 AND " + b + " < " + a + " * " + a + " / " + m + " - 1e-9 * abs(" + b + "))" : "false",
                data.column("logSpendSqSum", LOG_SQ_SUM),
                "log_spend_sq_sum is smaller than log_spend_sum^2 / payers, which no data can give"},
            {hasSpend ? "(" + m + " = 0 AND (coalesce(" + a + ", 0) <> 0 OR coalesce(" + b + ", 0) <> 0))" : "false",
                data.column("logSpendSum", LOG_SUM), "log-spend sums must be 0 where payers = 0"},
        };
        source.check(db, rules);
        // Several rows of one arm are added in increasing order of value, so sums do not depend on threads.
        String query = """
                SELECT %1$s,
                       CAST(sum(users) AS BIGINT) AS users,
                       CAST(sum(payers) AS BIGINT) AS payers,
                       sum(log_spend_sum ORDER BY log_spend_sum) AS log_spend_sum,
                       sum(log_spend_sq_sum ORDER BY log_spend_sq_sum) AS log_spend_sq_sum
                FROM (SELECT %2$s, CAST(%3$s AS BIGINT) AS users, CAST(%4$s AS BIGINT) AS payers,
                             coalesce(%5$s, 0.0) AS log_spend_sum,
                             coalesce(%6$s, 0.0) AS log_spend_sq_sum FROM %7$s)
                GROUP BY %1$s ORDER BY %1$s""".formatted(keys(segmentExpr), selected(armExpr, segmentExpr), n, m,
                a, b, source.relation);
        List<ArmStats> arms = new ArrayList<>();
        long rows = 0;
        try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(query)) {
            while (r.next()) {
                rows++;
                String name = r.getString("arm");
                segments.add(segmentExpr == null ? null : r.getString("segment"));
                arms.add(hasSpend
                        ? ArmStats.summary(name, r.getLong("users"), r.getLong("payers"), r.getDouble("log_spend_sum"),
                                r.getDouble("log_spend_sq_sum"))
                        : ArmStats.conversions(name, r.getLong("users"), r.getLong("payers")));
            }
        } catch (SQLException e) {
            throw Sql.readError(source.name, e);
        }
        if (rows == 0) {
            throw new InputException(source.name + ": no data rows" + (source.csv ? " after the header" : ""));
        }
        List<String> warnings = hasSpend ? List.of() : List.of(conversionOnly(source.name + " has no log-spend sums ('"
                + data.column("logSpendSum", LOG_SUM) + "', '" + data.column("logSpendSqSum", LOG_SQ_SUM) + "')"));
        return new SpendDataReader.Cells(segments, arms, hasSpend, source.name, rows, warnings, source.shown(query));
    }

    /**
     * A summary table holds statistics only, so a column the layout does not read is most likely one it
     * should have read under another name ({@code revenue_sum} for {@code log_spend_sum}): refused with the
     * nearest expected name rather than fitted without it.
     */
    private static void refuseOtherColumns(Source source, DataSpec data, String segment) {
        List<String> expected = new ArrayList<>(List.of(data.column(ARM, ARM), data.column(USERS, USERS),
                data.column(PAYERS, PAYERS), data.column("logSpendSum", LOG_SUM), data.column("logSpendSqSum", LOG_SQ_SUM)));
        if (segment != null) {
            expected.add(segment);
        }
        List<String> absent = expected.stream().filter(e -> !source.columns.contains(e)).toList();
        for (String c : source.columns) {
            if (!expected.contains(c)) {
                String near = SpecReader.nearest(c, absent);
                throw new InputException(source.name + ": column '" + c + "' is not one the summary layout reads"
                        + (near == null ? "" : " (did you mean '" + near + "'?)") + "; expected "
                        + String.join(", ", expected) + " (rename the column, map it in data.columns, or remove it)");
            }
        }
    }
}
