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
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * Retention counts (layout {@code cohort-days}: cohort, [arm], day, installs, active): for each install
 * cohort and arm, the installs and, for each observed day t >= 1, how many were active (or, for survival
 * curves, still retained) on day t. Cohorts sort by label (ISO dates sort correctly); day 0 rows are the
 * install day and are checked but not modelled.
 */
public record CohortDays(List<String> cohorts, List<String> arms, long[][] installs, List<List<Map<Integer, Long>>> active,
                         String source, long rows) {

    /** The arm used when the data have no arm column. */
    public static final String SINGLE_ARM = "all";

    /**
     * Installs of cohort c in arm k (0 when that cohort has no users in the arm).
     *
     * @param c the cohort's index, in time order
     * @param k the arm's index
     * @return the installs
     */
    public long installs(int c, int k) {
        return installs[c][k];
    }

    /**
     * Observed day -> active count for cohort c, arm k (empty when not observed), in day order.
     *
     * @param c the cohort's index
     * @param k the arm's index
     * @return the observations
     */
    public Map<Integer, Long> observed(int c, int k) {
        return active.get(c).get(k);
    }

    /**
     * The last day observed for cohort c in arm k: the cohort's age at the cut-off.
     *
     * @param c the cohort's index
     * @param k the arm's index
     * @return the day, 0 when none is observed
     */
    public int lastObservedDay(int c, int k) {
        Map<Integer, Long> m = observed(c, k);
        return m.isEmpty() ? 0 : ((TreeMap<Integer, Long>) m).lastKey();
    }

    /**
     * Reads a cohort-days table (a file through the SQL engine, or inline rows in memory), or raw activity
     * (layout {@code activity}, aggregated by {@link ActivityLayout}); bad rows are refused with their place.
     *
     * @param data     the spec's data part
     * @param baseDir  the folder relative paths resolve against
     * @param survival whether the counts are still-retained (they must not rise with the day)
     * @return the cohorts, arms and observations
     * @throws InputException one line naming the file, row or column
     */
    public static CohortDays read(DataSpec data, Path baseDir, boolean survival) {
        if (StatisticsEngine.external(data)) {
            StatisticsEngine engine = StatisticsEngine.named(data.engine());
            List<com.fasterxml.jackson.databind.JsonNode> rows = "activity".equals(data.layout())
                    ? engine.activity(data, baseDir, survival) : StatisticsEngine.typed(engine.rows(data, baseDir), types(data));
            return StatisticsEngine.fromRows(data, () -> readInline(new DataSpec(null, "cohort-days",
                    "activity".equals(data.layout()) ? null : data.columns(), rows), survival));
        }
        if ("activity".equals(data.layout())) {
            return ActivityLayout.read(data, baseDir, survival);
        }
        if (data.rows() != null) {
            return readInline(data, survival);
        }
        DataFile file = DataFile.of(data.path(), baseDir, "data.path");
        return DataFile.whole(() -> read(data, file, survival), file);
    }

    /** Inline rows through the SQL engine, as files are read (the parity test's other side). */
    static CohortDays throughEngine(DataSpec data, boolean survival) {
        return read(data, (DataFile) null, survival);
    }

    private static java.util.function.Function<String, String> types(DataSpec data) {
        String dayCol = data.column("day", "day");
        String installsCol = data.column("installs", "installs");
        String activeCol = data.column("active", "active");
        return c -> c.equals(dayCol) || c.equals(installsCol) || c.equals(activeCol) ? "DOUBLE" : "VARCHAR";
    }

    /**
     * The same table from inline rows without the SQL engine: the same column checks, then the same row checks
     * (they are made in Java on either path), in the spec's row order.
     */
    static CohortDays readInline(DataSpec data, boolean survival) {
        Source source = Source.inlineColumns(data, types(data));
        String cohort = source.require(data, "cohort", "cohort");
        String day = source.require(data, "day", "day");
        String inst = source.require(data, "installs", "installs");
        String act = source.require(data, "active", "active");
        String arm = source.optional(data, "arm", "arm");
        List<Object[]> rows = new ArrayList<>(data.rows().size());
        long position = 0;
        for (com.fasterxml.jackson.databind.JsonNode r : data.rows()) {
            rows.add(new Object[] {position++, RowRule.text(r.get(cohort)), arm == null ? null : RowRule.text(r.get(arm)),
                RowRule.number(r.get(day)), RowRule.number(r.get(inst)), RowRule.number(r.get(act))});
        }
        if (rows.isEmpty()) {
            throw new InputException(source.name + ": no data rows");
        }
        return build(rows, source, cohort, arm, day, inst, act, survival);
    }

    private static CohortDays read(DataSpec data, DataFile file, boolean survival) {
        try (Connection db = Engine.open(true, file)) { // one thread: rows numbered in file order; tables are small
            java.util.function.Function<String, String> types = types(data);
            Source source = file == null ? Source.inline(db, data, types) : Source.file(db, file, types);
            String cohort = source.require(data, "cohort", "cohort");
            String day = source.require(data, "day", "day");
            String inst = source.require(data, "installs", "installs");
            String act = source.require(data, "active", "active");
            String arm = source.optional(data, "arm", "arm");
            String position = source.rowsPointer != null ? "row_index" : "row_number() OVER ()";
            String sql = "SELECT " + position + ", trim(CAST(" + Sql.identifier(cohort) + " AS VARCHAR)), "
                    + (arm == null ? "NULL" : "trim(CAST(" + Sql.identifier(arm) + " AS VARCHAR))") + ", CAST("
                    + Sql.identifier(day) + " AS DOUBLE), CAST(" + Sql.identifier(inst) + " AS DOUBLE), CAST("
                    + Sql.identifier(act) + " AS DOUBLE) FROM " + source.relation + " ORDER BY 1";
            List<Object[]> rows = new ArrayList<>();
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(sql)) {
                while (r.next()) {
                    rows.add(new Object[] {r.getLong(1), r.getString(2), r.getString(3), num(r, 4), num(r, 5), num(r, 6)});
                }
            } catch (SQLException e) {
                throw Sql.readError(source.name, e);
            }
            if (rows.isEmpty()) {
                throw new InputException(source.name + ": no data rows" + (source.csv ? " after the header" : ""));
            }
            return build(rows, source, cohort, arm, day, inst, act, survival);
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }

    private static Double num(ResultSet r, int i) throws SQLException {
        double v = r.getDouble(i);
        return r.wasNull() ? null : v;
    }

    private static String where(Source source, long position, String column) {
        if (source.rowsPointer != null) {
            return "spec: " + source.rowsPointer + "/" + position + "/" + column;
        }
        return source.name + ": " + (source.csv ? "line " + (position + 1) : "row " + position) + ", column '" + column + "'";
    }

    private static long count(Source source, long position, String column, Double v, boolean allowZero) {
        if (v == null || !Double.isFinite(v)) {
            throw new InputException(where(source, position, column) + ": a whole number is needed");
        }
        if (v < 0 || (!allowZero && v == 0)) {
            throw new InputException(where(source, position, column) + ": must be " + (allowZero ? ">= 0" : "> 0")
                    + ", was " + fmt(v));
        }
        if (v != Math.floor(v)) {
            throw new InputException(where(source, position, column) + ": must be a whole number, was " + fmt(v));
        }
        return (long) (double) v;
    }

    private static String fmt(double v) {
        return v == Math.floor(v) && Math.abs(v) < 1e15 ? String.valueOf((long) v) : String.valueOf(v);
    }

    private static CohortDays build(List<Object[]> rows, Source source, String cohortCol, String armCol, String dayCol,
                                    String installsCol, String activeCol, boolean survival) {
        TreeSet<String> cohortSet = new TreeSet<>();
        TreeSet<String> armSet = new TreeSet<>();
        // (cohort, arm) -> installs and first line; (cohort, arm) -> day -> {active, line}
        Map<String, long[]> installs = new HashMap<>();
        Map<String, TreeMap<Integer, long[]>> days = new HashMap<>();
        for (Object[] row : rows) {
            long pos = (Long) row[0];
            String cohort = (String) row[1];
            String arm = armCol == null ? SINGLE_ARM : (String) row[2];
            if (cohort == null || cohort.isEmpty()) {
                throw new InputException(where(source, pos, cohortCol) + ": cohort is empty");
            }
            if (arm == null || arm.isEmpty()) {
                throw new InputException(where(source, pos, armCol) + ": arm is empty");
            }
            long day = count(source, pos, dayCol, (Double) row[3], true);
            if (day > Limits.DAY) {
                throw new InputException(where(source, pos, dayCol) + ": day " + day + " since install is past the "
                        + Limits.DAY + " days cairn fits");
            }
            long n = count(source, pos, installsCol, (Double) row[4], false);
            long a = count(source, pos, activeCol, (Double) row[5], true);
            if (a > n) {
                throw new InputException(where(source, pos, activeCol) + ": active (" + a + ") exceeds installs (" + n + ")");
            }
            String key = cohort + "\u0000" + arm;
            long[] known = installs.get(key);
            if (known == null) {
                installs.put(key, new long[] {n, pos});
            } else if (known[0] != n) {
                throw new InputException(where(source, pos, installsCol) + ": installs of cohort " + cohort
                        + (armCol == null ? "" : ", arm " + arm) + " is " + n + " here but " + known[0] + " on an earlier row");
            }
            TreeMap<Integer, long[]> byDay = days.computeIfAbsent(key, k -> new TreeMap<>());
            if (byDay.containsKey((int) day)) {
                throw new InputException(where(source, pos, dayCol) + ": day " + day + " of cohort " + cohort
                        + (armCol == null ? "" : ", arm " + arm) + " is listed twice");
            }
            byDay.put((int) day, new long[] {a, pos});
            cohortSet.add(cohort);
            armSet.add(arm);
        }
        if (survival) {
            for (Map.Entry<String, TreeMap<Integer, long[]>> e : days.entrySet()) {
                long previous = installs.get(e.getKey())[0];
                for (Map.Entry<Integer, long[]> d : e.getValue().entrySet()) {
                    if (d.getValue()[0] > previous) {
                        throw new InputException(where(source, d.getValue()[1], activeCol) + ": a survival curve cannot "
                                + "rise: " + d.getValue()[0] + " retained on day " + d.getKey() + " after " + previous
                                + " earlier (use \"curve\": \"activity\" for day-N activity)");
                    }
                    previous = d.getValue()[0];
                }
            }
        }
        Limits.names(source.name, "cohort", cohortSet, Limits.COHORTS, cohortCol);
        Limits.names(source.name, "arm", armSet, Limits.ARMS, armCol);
        List<String> cohorts = new ArrayList<>(cohortSet);
        List<String> arms = new ArrayList<>(armSet);
        long[][] n = new long[cohorts.size()][arms.size()];
        List<List<Map<Integer, Long>>> active = new ArrayList<>();
        for (int c = 0; c < cohorts.size(); c++) {
            List<Map<Integer, Long>> perArm = new ArrayList<>();
            for (int k = 0; k < arms.size(); k++) {
                String key = cohorts.get(c) + "\u0000" + arms.get(k);
                TreeMap<Integer, Long> observed = new TreeMap<>();
                if (installs.containsKey(key)) {
                    n[c][k] = installs.get(key)[0];
                    days.get(key).forEach((d, v) -> {
                        if (d >= 1) {
                            observed.put(d, v[0]);
                        }
                    });
                }
                perArm.add(observed);
            }
            active.add(perArm);
        }
        return new CohortDays(cohorts, arms, n, active, source.name, rows.size());
    }
}
