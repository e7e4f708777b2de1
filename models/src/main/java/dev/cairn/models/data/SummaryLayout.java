package dev.cairn.models.data;

import static dev.cairn.models.data.SpendDataReader.ARM;
import static dev.cairn.models.data.SpendDataReader.LOG_SQ_SUM;
import static dev.cairn.models.data.SpendDataReader.LOG_SUM;
import static dev.cairn.models.data.SpendDataReader.PAYERS;
import static dev.cairn.models.data.SpendDataReader.USERS;
import static dev.cairn.models.data.UsersWarnings.conversionOnly;
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

    /** The layout's columns as the data name them (s1, s2 null for conversions only). */
    private record Columns(String arm, String users, String payers, String s1, String s2) {
        boolean hasSpend() {
            return s1 != null;
        }
    }

    private static Columns columns(Source source, DataSpec data, String segment) {
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
        return new Columns(arm, users, payers, s1, s2);
    }

    /** One row's values as the rules read them: text trimmed of spaces, numbers as doubles, absent as null. */
    private record Row(String arm, String segment, Double n, Double m, Double a, Double b) {
    }

    private static List<RowRule<Row>> rules(Columns c, DataSpec data, String segment, String armExpr, String segmentExpr) {
        String n = "CAST(" + Sql.identifier(c.users()) + " AS DOUBLE)";
        String m = "CAST(" + Sql.identifier(c.payers()) + " AS DOUBLE)";
        boolean spend = c.hasSpend();
        String a = spend ? "CAST(" + Sql.identifier(c.s1()) + " AS DOUBLE)" : "0.0";
        String b = spend ? "CAST(" + Sql.identifier(c.s2()) + " AS DOUBLE)" : "0.0";
        String sum = data.column("logSpendSum", LOG_SUM), sq = data.column("logSpendSqSum", LOG_SQ_SUM);
        // Java forms follow SQL's rule that a comparison with NULL is not true
        return List.of(
            new RowRule<Row>(armExpr + " IS NULL OR " + armExpr + " = ''", r -> r.arm() == null || r.arm().isEmpty(),
                c.arm(), "arm is empty"),
            new RowRule<Row>(segmentExpr == null ? "false" : segmentExpr + " IS NULL OR " + segmentExpr + " = ''",
                r -> segment != null && (r.segment() == null || r.segment().isEmpty()), segment, "segment is empty"),
            new RowRule<Row>(n + " IS NULL OR " + m + " IS NULL", r -> r.n() == null || r.m() == null,
                c.users() + "/" + c.payers(), "users and payers must be given"),
            new RowRule<Row>("isnan(" + n + ") OR isinf(" + n + ") OR " + n + " <> floor(" + n + ")",
                r -> r.n() != null && !(Double.isFinite(r.n()) && r.n() == Math.floor(r.n())), c.users(),
                "users must be a whole number"),
            new RowRule<Row>("isnan(" + m + ") OR isinf(" + m + ") OR " + m + " <> floor(" + m + ")",
                r -> r.m() != null && !(Double.isFinite(r.m()) && r.m() == Math.floor(r.m())), c.payers(),
                "payers must be a whole number"),
            new RowRule<Row>(n + " < 0 OR " + m + " < 0", r -> (r.n() != null && r.n() < 0) || (r.m() != null && r.m() < 0),
                c.users() + "/" + c.payers(), "users and payers must be >= 0"),
            new RowRule<Row>(m + " > " + n, r -> r.n() != null && r.m() != null && r.m() > r.n(), c.payers(),
                "payers must not exceed users"),
            new RowRule<Row>(spend ? "(" + m + " > 0 AND (" + a + " IS NULL OR " + b + " IS NULL))" : "false",
                r -> spend && r.m() != null && r.m() > 0 && (r.a() == null || r.b() == null), sum,
                "log-spend sums are needed where payers > 0"),
            new RowRule<Row>(spend ? "isnan(" + a + ") OR isinf(" + a + ") OR isnan(" + b + ") OR isinf(" + b + ")" : "false",
                r -> spend && ((r.a() != null && !Double.isFinite(r.a())) || (r.b() != null && !Double.isFinite(r.b()))),
                sum, "log-spend sums must be finite numbers"),
            new RowRule<Row>(spend ? "(" + m + " > 0 AND " + b + " < " + a + " * " + a + " / " + m + " - 1e-9 * abs(" + b + "))"
                    : "false",
                r -> spend && r.m() != null && r.m() > 0 && r.a() != null && r.b() != null
                        && r.b() < r.a() * r.a() / r.m() - 1e-9 * Math.abs(r.b()), sq,
                "log_spend_sq_sum is smaller than log_spend_sum^2 / payers, which no data can give"),
            new RowRule<Row>(spend ? "(" + m + " = 0 AND (coalesce(" + a + ", 0) <> 0 OR coalesce(" + b + ", 0) <> 0))" : "false",
                r -> spend && r.m() != null && r.m() == 0 && ((r.a() != null && r.a() != 0) || (r.b() != null && r.b() != 0)),
                sum, "log-spend sums must be 0 where payers = 0"));
    }

    static SpendDataReader.Cells read(Connection db, Source source, DataSpec data, String segment) throws SQLException {
        String segmentExpr = segment == null ? null : "trim(CAST(" + Sql.identifier(segment) + " AS VARCHAR))";
        List<String> segments = new ArrayList<>();
        Columns c = columns(source, data, segment);
        boolean hasSpend = c.hasSpend();
        String armExpr = "trim(CAST(" + Sql.identifier(c.arm()) + " AS VARCHAR))";
        // Counts are read as numbers and checked to be whole, so 100.5 users is refused rather than rounded.
        String n = "CAST(" + Sql.identifier(c.users()) + " AS DOUBLE)";
        String m = "CAST(" + Sql.identifier(c.payers()) + " AS DOUBLE)";
        String a = hasSpend ? "CAST(" + Sql.identifier(c.s1()) + " AS DOUBLE)" : "0.0";
        String b = hasSpend ? "CAST(" + Sql.identifier(c.s2()) + " AS DOUBLE)" : "0.0";
        // Row checks first: summary tables are small, and a bad row must be named, not summed away.
        source.check(db, RowRule.sqlForms(rules(c, data, segment, armExpr, segmentExpr)));
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
        return new SpendDataReader.Cells(segments, arms, hasSpend, source.name, rows, warnings(source, data, hasSpend),
                source.shown(query));
    }

    private static List<String> warnings(Source source, DataSpec data, boolean hasSpend) {
        return hasSpend ? List.of() : List.of(conversionOnly(source.name + " has no log-spend sums ('"
                + data.column("logSpendSum", LOG_SUM) + "', '" + data.column("logSpendSqSum", LOG_SQ_SUM) + "')"));
    }

    /**
     * The same layout from inline rows without the SQL engine (a program that passes statistics in memory,
     * or a jar without the engine's native library): the same column checks, the same rules in the same order
     * with the same messages, and the same sums (rows of one cell added in increasing order of value), so the
     * statistics equal the engine's. There is no query to show.
     *
     * @param data      the data block with inline rows of the summary layout
     * @param segmented whether a segment column is read (segmented-spend)
     * @return the cells
     * @throws InputException naming the row and column, as the engine's path does
     */
    static SpendDataReader.Cells readInline(DataSpec data, boolean segmented) {
        Source source = Source.inlineColumns(data, c -> SpendDataReader.typeOf(c, data));
        String segment = segmented ? source.require(data, SpendDataReader.SEGMENT, SpendDataReader.SEGMENT) : null;
        Columns c = columns(source, data, segment);
        List<com.fasterxml.jackson.databind.JsonNode> rows = data.rows();
        List<Row> values = new ArrayList<>(rows.size());
        for (com.fasterxml.jackson.databind.JsonNode r : rows) {
            values.add(new Row(RowRule.text(r.get(c.arm())), segment == null ? null : RowRule.text(r.get(segment)),
                    RowRule.number(r.get(c.users())), RowRule.number(r.get(c.payers())),
                    c.hasSpend() ? RowRule.number(r.get(c.s1())) : Double.valueOf(0),
                    c.hasSpend() ? RowRule.number(r.get(c.s2())) : Double.valueOf(0)));
        }
        RowRule.checkInline(values, rules(c, data, segment, null, null));
        // cells in key order (segment, then arm), sums over a cell's rows in increasing order of value
        java.util.TreeMap<List<String>, List<Row>> cells = new java.util.TreeMap<>((x, y) -> {
            int k = x.get(0).compareTo(y.get(0));
            return k != 0 ? k : x.get(1).compareTo(y.get(1));
        });
        for (Row r : values) {
            cells.computeIfAbsent(List.of(r.segment() == null ? "" : r.segment(), r.arm()), k -> new ArrayList<>()).add(r);
        }
        List<String> segments = new ArrayList<>();
        List<ArmStats> arms = new ArrayList<>();
        for (java.util.Map.Entry<List<String>, List<Row>> e : cells.entrySet()) {
            long users = 0, payers = 0;
            double[] s1 = new double[e.getValue().size()], s2 = new double[s1.length];
            for (int i = 0; i < s1.length; i++) {
                Row r = e.getValue().get(i);
                users += r.n().longValue();
                payers += r.m().longValue();
                s1[i] = r.a() == null ? 0 : r.a();
                s2[i] = r.b() == null ? 0 : r.b();
            }
            segments.add(segment == null ? null : e.getKey().get(0));
            String arm = e.getKey().get(1);
            arms.add(c.hasSpend() ? ArmStats.summary(arm, users, payers, ordered(s1), ordered(s2))
                    : ArmStats.conversions(arm, users, payers));
        }
        if (values.isEmpty()) {
            throw new InputException(source.name + ": no data rows");
        }
        // rows as the engine's path counts them: the cells its grouped query returns
        return new SpendDataReader.Cells(segments, arms, c.hasSpend(), source.name, arms.size(),
                warnings(source, data, c.hasSpend()), null);
    }

    /** The sum of the values in increasing order. */
    private static double ordered(double[] values) {
        double[] sorted = values.clone();
        java.util.Arrays.sort(sorted);
        double sum = 0;
        for (double v : sorted) {
            sum += v;
        }
        return sum;
    }

    /**
     * A summary table holds statistics only, so a column the layout does not read is most likely one it
     * should have read under another name ({@code revenue_sum} for {@code log_spend_sum}): refused with the
     * nearest expected name rather than fitted without it.
     */
    static void refuseOtherColumns(Source source, DataSpec data, String segment) {
        List<String> expected = new ArrayList<>(List.of(data.column(ARM, ARM), data.column(USERS, USERS),
                data.column(PAYERS, PAYERS), data.column("logSpendSum", LOG_SUM), data.column("logSpendSqSum", LOG_SQ_SUM)));
        if (data.mapped("time")) {
            expected.add(data.column("time", "time")); // read by the timeline (TimelineData)
        }
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
