package dev.cairn.models.data;

import dev.cairn.models.InputException;
import dev.cairn.models.Limits;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;

/**
 * Builds the spend model's sufficient statistics with the embedded SQL engine (DuckDB): one aggregation
 * query per layout over a CSV file, a Parquet file or inline rows. Bad data are refused with the file,
 * line and column, never dropped.
 *
 * <p>The {@code users} layout query is {@link #usersQuery}: one scan, grouped by arm, counting users and
 * gathering the non-zero values, from which come payers, the observed statistics the predictive checks need
 * and the checks for bad values; the payers' values are handed to {@link ExactSums}, whose sums of log spend,
 * its square and spend are exact, so that any engine that adds the same quanta gets the same bits.
 */
public final class SpendDataReader {
    static final String ARM = "arm";
    static final String SEGMENT = "segment";
    static final String SPEND = "spend";
    static final String CONVERTED = "converted";
    static final String USERS = "users";
    static final String PAYERS = "payers";
    static final String LOG_SUM = "log_spend_sum";
    static final String LOG_SQ_SUM = "log_spend_sq_sum";
    private SpendDataReader() {
    }

    /**
     * Reads the data of a spend spec.
     *
     * @param data    the spec's data part
     * @param baseDir folder that relative paths are resolved against (the spec's folder)
     * @param strict  whether warnings (duplicate user ids) are errors
     * @return the per-arm statistics
     * @throws InputException one line naming the file, row or column
     */
    public static SpendData read(DataSpec data, Path baseDir, boolean strict) {
        Cells c = cells(data, baseDir, strict, false);
        Limits.names(c.source, "arm", new java.util.TreeSet<>(c.stats.stream().map(ArmStats::arm).toList()), Limits.ARMS,
                data.column(ARM, ARM));
        return new SpendData(c.stats, c.hasSpend, c.source, c.rows, c.warnings, c.query);
    }

    /**
     * Statistics per (segment, arm) cell, for the segmented model: {@code data.columns.segment} names the column.
     *
     * @param data    the spec's data part
     * @param baseDir the folder relative paths resolve against
     * @param strict  whether warnings are errors
     * @return the cells' statistics
     * @throws InputException one line naming the file, row or column
     */
    public static SegmentedSpendData readSegmented(DataSpec data, Path baseDir, boolean strict) {
        Cells c = cells(data, baseDir, strict, true);
        Limits.names(c.source, "arm", new java.util.TreeSet<>(c.stats.stream().map(ArmStats::arm).toList()), Limits.ARMS,
                data.column(ARM, ARM));
        Limits.names(c.source, "segment", new java.util.TreeSet<>(c.segments), Limits.SEGMENTS, data.column(SEGMENT, SEGMENT));
        if (c.stats.size() > Limits.CELLS) {
            throw new InputException(String.format(java.util.Locale.ROOT, "%s: %,d segment x arm cells, more than the "
                    + "%,d cairn fits", c.source, c.stats.size(), Limits.CELLS));
        }
        List<SegmentedSpendData.Cell> cells = new ArrayList<>();
        for (int i = 0; i < c.stats.size(); i++) {
            cells.add(new SegmentedSpendData.Cell(c.segments.get(i), c.stats.get(i)));
        }
        return new SegmentedSpendData(cells, c.hasSpend, c.source, c.rows, c.warnings, c.query);
    }

    /** What a layout's query gave: per cell its segment (null when not segmented) and statistics. */
    record Cells(List<String> segments, List<ArmStats> stats, boolean hasSpend, String source, long rows,
                         List<String> warnings, String query) {
    }

    private static Cells cells(DataSpec data, Path baseDir, boolean strict, boolean segmented) {
        if (StatisticsEngine.external(data)) {
            StatisticsEngine engine = StatisticsEngine.named(data.engine());
            if ("summary".equals(data.layout())) {
                return StatisticsEngine.fromRows(data, () -> SummaryLayout.readInline(data.withRows(
                        StatisticsEngine.typed(engine.rows(data, baseDir), c -> typeOf(c, data))),
                        segmented));
            }
            StatisticsEngine.UsersStatistics u = engine.users(data, baseDir, strict, segmented);
            return new Cells(u.segments(), u.cells(), u.hasSpend(), u.source(), u.rows(), u.warnings(), null);
        }
        if (data.rows() != null) {
            // data given in memory need no query engine (and fit where its native library is missing)
            return "summary".equals(data.layout()) ? SummaryLayout.readInline(data, segmented)
                    : UsersInline.read(data, strict, segmented);
        }
        return throughEngine(data, baseDir, strict, segmented);
    }

    /** The cells as the engine reads them (every file; inline rows only in the parity tests). */
    static Cells throughEngine(DataSpec data, Path baseDir, boolean strict, boolean segmented) {
        DataFile file = data.rows() != null ? null : DataFile.of(data.path(), baseDir, "data.path");
        return DataFile.whole(() -> cells(data, file, strict, segmented), file);
    }

    private static Cells cells(DataSpec data, DataFile file, boolean strict, boolean segmented) {
        try (Connection db = Engine.open(false, file)) {
            Source source = file == null ? Source.inline(db, data, c -> typeOf(c, data))
                    : Source.file(db, file, c -> typeOf(c, data));
            String segment = segmented ? source.require(data, SEGMENT, SEGMENT) : null;
            return "summary".equals(data.layout()) ? SummaryLayout.read(db, source, data, segment)
                    : users(db, source, data, strict, segment);
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }

    // ----------------------------------------------------------------------------------------------------
    // users layout

    private static Cells users(Connection db, Source source, DataSpec data, boolean strict, String segment)
            throws SQLException {
        String segmentExpr = segment == null ? null : "trim(CAST(" + Sql.identifier(segment) + " AS VARCHAR))";
        List<String> segments = new ArrayList<>();
        String arm = source.require(data, ARM, ARM);
        String spend = source.optional(data, SPEND, SPEND);
        String converted = spend == null ? source.optional(data, CONVERTED, CONVERTED) : null;
        if (spend == null && converted == null) {
            throw new InputException(source.name + ": needs a spend column ('" + data.column(SPEND, SPEND)
                    + "', set data.columns.spend) or a 0/1 conversion column ('" + data.column(CONVERTED, CONVERTED)
                    + "', set data.columns.converted); columns found: " + source.found());
        }
        // Arms are grouped as written; only if some value carries surrounding blanks is the query run again
        // with trim(), so " B " and "B" count as one arm without paying for trim() on every row.
        List<ArmStats> arms = null;
        String query = null;
        long rows = 0;
        long blanks = 0;
        for (boolean trim : new boolean[] {false, true}) {
            String armExpr = trim ? "trim(CAST(" + Sql.identifier(arm) + " AS VARCHAR))"
                    : "CAST(" + Sql.identifier(arm) + " AS VARCHAR)";
            query = spend != null ? usersQuery(armExpr, Sql.identifier(spend), source.relation, segmentExpr)
                    : conversionQuery(armExpr, Sql.identifier(converted), source.relation, segmentExpr);
            arms = new ArrayList<>();
            segments.clear();
            long emptySegments = 0;
            rows = 0;
            boolean untrimmed = false;
            long missing = 0, emptyArms = 0, negative = 0;
            boolean outOfRange = false;
            boolean notFinite = false;
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(query)) {
                while (r.next()) {
                    String name = r.getString("arm");
                    long users = r.getLong("users");
                    rows += users;
                    missing += users - r.getLong("present");
                    if (name == null || name.isBlank()) {
                        emptyArms += users;
                        continue;
                    }
                    if (segmentExpr != null) {
                        String seg = r.getString("segment");
                        if (seg == null || seg.isEmpty()) {
                            emptySegments += users;
                            continue;
                        }
                        segments.add(seg);
                    } else {
                        segments.add(null);
                    }
                    untrimmed |= !name.equals(name.strip());
                    if (spend != null) {
                        double sum = r.getDouble("spend_sum");
                        double min = r.getDouble("spend_min");
                        double max = r.getDouble("spend_max");
                        notFinite |= r.getLong("present") > 0 && (!Double.isFinite(sum) || !Double.isFinite(max)
                                || !Double.isFinite(min));
                        negative += min < 0 ? 1 : 0;
                        double payerMin = orNaN(r, "payer_min");
                        outOfRange |= payerMin < SMALLEST_SPEND || max > LARGEST_SPEND;
                        ExactSums.PayerSums sums = new ExactSums.PayerSums();
                        java.sql.Array paid = r.getArray("paid");
                        if (paid != null && !outOfRange && !notFinite && min >= 0) {
                            for (Object y : (Object[]) paid.getArray()) {
                                sums.add(((Number) y).doubleValue());
                            }
                        }
                        arms.add(new ArmStats(name, users, r.getLong("payers"), sums.logSum(), sums.logSqSum(),
                                sums.spendSum(), orNaN(r, "payer_p50"), orNaN(r, "payer_p90"), orNaN(r, "payer_p99"), max));
                    } else {
                        arms.add(ArmStats.conversions(name, users, r.getLong("payers")));
                    }
                }
            } catch (SQLException e) {
                throw Sql.readError(source.name, e);
            }
            if (rows == 0) {
                throw new InputException(source.name + ": no data rows" + (source.csv ? " after the header" : ""));
            }
            String valueColumn = spend != null ? spend : converted;
            String cast = spend != null ? "CAST(" + Sql.identifier(spend) + " AS DOUBLE)"
                    : "CAST(" + Sql.identifier(converted) + " AS BOOLEAN)";
            String trimmedArm = "trim(CAST(" + Sql.identifier(arm) + " AS VARCHAR))";
            if (emptyArms > 0) {
                throw source.bad(db, trimmedArm + " IS NULL OR " + trimmedArm + " = ''", arm, emptyArms, "arm is empty");
            }
            if (emptySegments > 0) {
                throw source.bad(db, segmentExpr + " IS NULL OR " + segmentExpr + " = ''", segment, emptySegments,
                        "segment is empty");
            }
            if (missing > 0 && !(spend != null && data.blankSpendIsZero())) {
                throw source.bad(db, cast + " IS NULL", valueColumn, missing, spend == null ? "value is empty"
                        : "spend is empty (if a blank means the user did not pay, set data.missingSpend to \"zero\")");
            }
            blanks = missing;
            if (notFinite) {
                long bad = count(db, source, "isnan(" + cast + ") OR isinf(" + cast + ")");
                if (bad > 0) {
                    throw source.bad(db, "isnan(" + cast + ") OR isinf(" + cast + ")", valueColumn, bad,
                            "spend must be a finite number (NaN or infinity found)");
                }
                outOfRange = true; // finite values whose sum overflows: some lie beyond the range, named below
            }
            if (negative > 0) {
                throw source.bad(db, cast + " < 0", valueColumn, count(db, source, cast + " < 0"),
                        "spend must be >= 0 (0 for users who did not pay)");
            }
            if (outOfRange) {
                String outside = cast + " > 0 AND (" + cast + " < " + SMALLEST_SPEND + " OR " + cast + " > " + LARGEST_SPEND + ")";
                throw source.bad(db, outside, valueColumn, count(db, source, outside), "a positive spend must lie between "
                        + SMALLEST_SPEND + " and " + LARGEST_SPEND + " (the model works with log spend and its square; "
                        + "rescale the currency unit)");
            }
            if (!untrimmed) {
                break;
            }
        }
        List<String> warnings = UsersWarnings.usersWarnings(source.name, data, spend, blanks);
        String user = source.optionalMapped(data, "user");
        if (user != null) {
            long duplicates;
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(
                    "SELECT count(*) - count(DISTINCT " + Sql.identifier(user) + ") FROM " + source.relation)) {
                r.next();
                duplicates = r.getLong(1);
            }
            UsersWarnings.duplicateUsers(source.name, user, duplicates, strict, warnings);
        }
        return new Cells(segments, arms, spend != null, source.name, rows, warnings, source.shown(query));
    }

    /**
     * The range of a positive spend the model represents: far beyond any currency amount, while log spend,
     * its square and the ARPPU of the fitted log-normal stay well inside floating point.
     */
    public static final double SMALLEST_SPEND = 1e-12, LARGEST_SPEND = 1e15;

    /**
     * The users-layout query: one scan, per arm (per segment and arm when a segment expression is given).
     *
     * <p>The scan counts users and values per arm and gathers the non-zero values into a list: nearly all
     * users of a game spend nothing, so the lists hold a few percent of the rows. Sorted, a list gives the
     * rest without another pass:
     * <ul>
     *   <li>payers (spend &gt; 0), and fewer values than users means empty cells;</li>
     *   <li>S1 = sum of log spend and S2 = sum of its square over payers, and the payers' total spend, each
     *       added in increasing order of spend, so the last bit of each sum is the same however many threads
     *       read the file (a parallel sum's is not);</li>
     *   <li>the smallest and largest spend (a negative minimum means negative spend, a NaN or infinite
     *       extreme means a value that is not a finite number);</li>
     *   <li>payers' p50, p90 and p99: the k-th smallest payer spend, k = floor(q (m - 1)) + 1 of m payers,
     *       the same order statistic the predictive checks replicate.</li>
     * </ul>
     */
    static String usersQuery(String armExpr, String spendColumn, String relation, String segmentExpr) {
        return """
                SELECT %1$s, users, present,
                       coalesce(len(paid), 0) AS payers,
                       paid,
                       coalesce(list_sum(paid), 0) AS spend_sum,
                       CASE WHEN present > coalesce(len(nonzero), 0) THEN least(coalesce(nonzero[1], 0), 0)
                            ELSE nonzero[1] END AS spend_min,
                       CASE WHEN present > coalesce(len(nonzero), 0) THEN greatest(coalesce(nonzero[-1], 0), 0)
                            ELSE nonzero[-1] END AS spend_max,
                       paid[1] AS payer_min,
                       paid[CAST(floor(0.5 * (len(paid) - 1)) AS BIGINT) + 1] AS payer_p50,
                       paid[CAST(floor(0.9 * (len(paid) - 1)) AS BIGINT) + 1] AS payer_p90,
                       paid[CAST(floor(0.99 * (len(paid) - 1)) AS BIGINT) + 1] AS payer_p99
                FROM (SELECT *, list_filter(nonzero, lambda y: y > 0) AS paid
                      FROM (SELECT %1$s,
                                   count(*) AS users,
                                   count(spend) AS present,
                                   list_sort(list(spend) FILTER (WHERE spend <> 0)) AS nonzero
                            FROM (SELECT %2$s, CAST(%3$s AS DOUBLE) AS spend FROM %4$s)
                            GROUP BY %1$s))
                ORDER BY %1$s""".formatted(keys(segmentExpr), selected(armExpr, segmentExpr), spendColumn, relation);
    }

    /** The grouping keys: the arm, or the segment and the arm. */
    static String keys(String segmentExpr) {
        return segmentExpr == null ? "arm" : "segment, arm";
    }

    /** The key columns as read from the relation. */
    static String selected(String armExpr, String segmentExpr) {
        return (segmentExpr == null ? "" : segmentExpr + " AS segment, ") + armExpr + " AS arm";
    }

    static String conversionQuery(String armExpr, String convertedColumn, String relation, String segmentExpr) {
        return """
                SELECT %1$s,
                       count(*) AS users,
                       count(converted) AS present,
                       count_if(converted) AS payers
                FROM (SELECT %2$s, CAST(%3$s AS BOOLEAN) AS converted FROM %4$s)
                GROUP BY %1$s ORDER BY %1$s""".formatted(keys(segmentExpr), selected(armExpr, segmentExpr),
                convertedColumn, relation);
    }

    private static long count(Connection db, Source source, String condition) {
        try (Statement s = db.createStatement();
             ResultSet r = s.executeQuery("SELECT count(*) FROM " + source.relation + " WHERE " + condition)) {
            r.next();
            return r.getLong(1);
        } catch (SQLException e) {
            throw Sql.readError(source.name, e);
        }
    }

    /** A column's value, NaN when it is NULL (a quantile of an arm without payers). */
    private static double orNaN(ResultSet r, String column) throws SQLException {
        double v = r.getDouble(column);
        return r.wasNull() ? Double.NaN : v;
    }

    /** The users layout's warnings: a fit without spend, or blank spend cells read as 0. */

    // ----------------------------------------------------------------------------------------------------

    /** The engine type a CSV column is read as: numbers where the model needs numbers, text otherwise. */
static String typeOf(String column, DataSpec data) {
        if ("summary".equals(data.layout())) {
            if (column.equals(data.column(USERS, USERS)) || column.equals(data.column(PAYERS, PAYERS))
                    || column.equals(data.column("logSpendSum", LOG_SUM)) || column.equals(data.column("logSpendSqSum", LOG_SQ_SUM))) {
                return "DOUBLE";
            }
            return "VARCHAR";
        }
        if (column.equals(data.column(SPEND, SPEND))) {
            return "DOUBLE";
        }
        if (column.equals(data.column(CONVERTED, CONVERTED)) && !data.mapped(SPEND)) {
            return "BOOLEAN";
        }
        return "VARCHAR";
    }
}
