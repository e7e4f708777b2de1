package dev.cairn.models.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import dev.cairn.models.Limits;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.DayOfWeek;
import java.time.LocalDate;
import java.time.temporal.ChronoUnit;
import java.time.temporal.TemporalAdjusters;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * Retention straight from raw activity (layout {@code activity}: one row per user per active day — user, arm,
 * install date, active date), aggregated into the statistics of the {@code cohort-days} layout:
 * <ul>
 *   <li>cohort: the install date, or its week (Monday to Sunday) with {@code data.cohortPeriod: "week"},
 *       labelled by the date it starts;</li>
 *   <li>installs: the distinct users of the cohort and arm;</li>
 *   <li>day t: days from a user's install to the active date; active on day t (curve {@code activity}): the
 *       distinct users active that day; retained on day t (curve {@code survival}): the users whose last
 *       active day is t or later;</li>
 *   <li>censoring: with the cut-off {@code data.asOf} (default the latest active date), activity after it is
 *       not counted, and a cohort is observed on days 1..(asOf - its latest install date) — the days every
 *       member has reached — so young cohorts are censored as a cohort-days table would have them.</li>
 * </ul>
 * Rows are refused, with their line (or inline row), for an empty or unreadable date (YYYY-MM-DD; a
 * date-time counts as its date), activity before the install, a user in two arms, or a user with two install
 * dates. Files go through the embedded engine (the counting is SQL: distinct users per cell); inline rows are
 * counted in memory with the same rules and messages.
 */
final class ActivityLayout {
    private ActivityLayout() {
    }

    /** One user-day: its position (line or row index), user, arm, install and active dates. */
    private record Row(long position, String user, String arm, LocalDate install, LocalDate active) {
    }

    static CohortDays read(DataSpec data, Path baseDir, boolean survival) {
        if (data.rows() != null) {
            return inline(data, survival);
        }
        DataFile file = DataFile.of(data.path(), baseDir, "data.path");
        return DataFile.whole(() -> engine(data, file, survival), file);
    }

    private static String col(DataSpec data, String logical) {
        return data.column(logical, logical);
    }

    // ------------------------------------------------------------------------------------------------
    // in memory

    private static CohortDays inline(DataSpec data, boolean survival) {
        Source source = Source.inlineColumns(data, c -> "VARCHAR");
        String userCol = source.require(data, "user", "user");
        String armCol = source.optional(data, "arm", "arm");
        String installCol = source.require(data, "installDate", "installDate");
        String activeCol = source.require(data, "activeDate", "activeDate");
        List<Row> rows = new ArrayList<>();
        for (int i = 0; i < data.rows().size(); i++) {
            JsonNode r = data.rows().get(i);
            String where = "spec: /data/rows/" + i;
            String user = RowRule.text(r.get(userCol));
            if (user == null || user.isEmpty()) {
                throw new InputException(where + ", '" + userCol + "': no user");
            }
            String arm = armCol == null ? CohortDays.SINGLE_ARM : RowRule.text(r.get(armCol));
            if (arm == null || arm.isEmpty()) {
                throw new InputException(where + ", '" + armCol + "': no arm");
            }
            LocalDate install = date(RowRule.text(r.get(installCol)), where + ", '" + installCol + "'");
            LocalDate active = date(RowRule.text(r.get(activeCol)), where + ", '" + activeCol + "'");
            if (active.isBefore(install)) {
                throw new InputException(where + ", '" + activeCol + "': active on " + active + ", before the install on "
                        + install);
            }
            rows.add(new Row(i, user, arm, install, active));
        }
        if (rows.isEmpty()) {
            throw new InputException(source.name + ": no data rows");
        }
        Map<String, Row> first = new HashMap<>();
        for (Row r : rows) {
            Row seen = first.putIfAbsent(r.user(), r);
            if (seen != null && !seen.arm().equals(r.arm())) {
                throw new InputException("spec: /data/rows/" + r.position() + ", '" + armCol + "': user " + r.user()
                        + " is in arm " + r.arm() + " here but in arm " + seen.arm() + " on row " + seen.position());
            }
            if (seen != null && !seen.install().equals(r.install())) {
                throw new InputException("spec: /data/rows/" + r.position() + ", '" + installCol + "': user " + r.user()
                        + " installed on " + r.install() + " here but on " + seen.install() + " on row " + seen.position());
            }
        }
        LocalDate asOf = asOf(data, rows.stream().map(Row::active).max(LocalDate::compareTo).orElseThrow());
        boolean week = "week".equals(data.cohortPeriod());
        // (cohort, arm) -> users -> last active day (by the cut-off); -1 when none after install
        Map<List<String>, Map<String, Integer>> last = new TreeMap<>(KEY);
        Map<List<String>, Map<Integer, Long>> activeCounts = new TreeMap<>(KEY);
        Map<List<String>, LocalDate> latestInstall = new TreeMap<>(KEY);
        Map<List<String>, java.util.Set<String>> seenDay = new HashMap<>();
        for (Row r : rows) {
            if (r.install().isAfter(asOf)) {
                continue; // not in the test yet by the cut-off
            }
            List<String> key = List.of(cohort(r.install(), week).toString(), r.arm());
            Map<String, Integer> users = last.computeIfAbsent(key, k -> new HashMap<>());
            users.putIfAbsent(r.user(), 0);
            latestInstall.merge(key, r.install(), (x, y) -> x.isAfter(y) ? x : y);
            if (r.active().isAfter(asOf)) {
                continue;
            }
            int t = (int) ChronoUnit.DAYS.between(r.install(), r.active());
            users.merge(r.user(), t, Math::max);
            if (t >= 1 && seenDay.computeIfAbsent(List.of(key.get(0), key.get(1), Integer.toString(t)), k -> new java.util.HashSet<>())
                    .add(r.user())) {
                activeCounts.computeIfAbsent(key, k -> new TreeMap<>()).merge(t, 1L, Long::sum);
            }
        }
        List<Cell> cells = new ArrayList<>();
        for (Map.Entry<List<String>, Map<String, Integer>> e : last.entrySet()) {
            Map<Integer, Long> lastDays = new TreeMap<>();
            e.getValue().values().forEach(t -> lastDays.merge(t, 1L, Long::sum));
            cells.add(new Cell(e.getKey().get(0), e.getKey().get(1), e.getValue().size(),
                    age(asOf, latestInstall.get(e.getKey())), activeCounts.getOrDefault(e.getKey(), Map.of()), lastDays));
        }
        return build(cells, source.name, rows.size(), survival, armCol);
    }

    private static final java.util.Comparator<List<String>> KEY = (x, y) -> {
        int c = x.get(0).compareTo(y.get(0));
        return c != 0 ? c : x.get(1).compareTo(y.get(1));
    };

    /** A date, YYYY-MM-DD, or a date-time whose first ten characters are one. */
    private static LocalDate date(String text, String where) {
        if (text == null || text.isEmpty()) {
            throw new InputException(where + ": no date");
        }
        String day = text.length() > 10 && (text.charAt(10) == 'T' || text.charAt(10) == ' ') ? text.substring(0, 10) : text;
        try {
            if (!day.matches("[0-9]{4}-[0-9]{2}-[0-9]{2}")) {
                throw new java.time.format.DateTimeParseException("pattern", day, 0);
            }
            return LocalDate.parse(day);
        } catch (java.time.format.DateTimeParseException e) {
            throw new InputException(where + ": '" + text + "' is not a date (YYYY-MM-DD)");
        }
    }

    private static LocalDate cohort(LocalDate install, boolean week) {
        return week ? install.with(TemporalAdjusters.previousOrSame(DayOfWeek.MONDAY)) : install;
    }

    private static LocalDate asOf(DataSpec data, LocalDate latestActive) {
        return data.asOf() != null ? date(data.asOf(), "/data/asOf") : latestActive;
    }

    /** Days every member of a cohort has reached by the cut-off. */
    private static int age(LocalDate asOf, LocalDate latestInstall) {
        return (int) Math.max(0, ChronoUnit.DAYS.between(latestInstall, asOf));
    }

    // ------------------------------------------------------------------------------------------------
    // through the engine

    private static CohortDays engine(DataSpec data, DataFile file, boolean survival) {
        try (Connection db = Engine.open(false, file)) {
            Source source = Source.file(db, file, c -> "VARCHAR");
            String userCol = source.require(data, "user", "user");
            String armCol = source.optional(data, "arm", "arm");
            String installCol = source.require(data, "installDate", "installDate");
            String activeCol = source.require(data, "activeDate", "activeDate");
            String u = "trim(CAST(" + Sql.identifier(userCol) + " AS VARCHAR))";
            String a = armCol == null ? "'" + CohortDays.SINGLE_ARM + "'" : "trim(CAST(" + Sql.identifier(armCol) + " AS VARCHAR))";
            String i = dateExpr(installCol), d = dateExpr(activeCol);
            String text = "trim(CAST(%s AS VARCHAR))";
            List<String[]> rules = new ArrayList<>();
            rules.add(new String[] {u + " IS NULL OR " + u + " = ''", userCol, "no user"});
            if (armCol != null) {
                rules.add(new String[] {a + " IS NULL OR " + a + " = ''", armCol, "no arm"});
            }
            for (String c : new String[] {installCol, activeCol}) {
                String t = text.formatted(Sql.identifier(c));
                rules.add(new String[] {t + " IS NULL OR " + t + " = ''", c, "no date"});
                rules.add(new String[] {dateExpr(c) + " IS NULL", c, "not a date (YYYY-MM-DD)"});
            }
            rules.add(new String[] {d + " < " + i, activeCol, "active before the install"});
            source.check(db, rules.toArray(new String[0][]));
            String rowsSql = "(SELECT " + u + " AS u, " + a + " AS a, " + i + " AS i, " + d + " AS d FROM " + source.relation + ")";
            String[][] perUser = {{"count(DISTINCT a) > 1", armCol, "in two arms"},
                {"count(DISTINCT i) > 1", installCol, "with two install dates"}};
            for (String[] rule : perUser) {
                if (rule[1] == null) {
                    continue;
                }
                try (Statement s = db.createStatement(); ResultSet r = s.executeQuery("SELECT u FROM " + rowsSql
                        + " GROUP BY u HAVING " + rule[0] + " ORDER BY u LIMIT 1")) {
                    if (r.next()) {
                        String condition = u + " = '" + r.getString(1).replace("'", "''") + "'";
                        throw source.bad(db, condition, rule[1], rowsWhere(db, source, condition),
                                "user " + r.getString(1) + " appears " + rule[2] + " (every row of a user must agree)");
                    }
                }
            }
            LocalDate asOf;
            long rows;
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery("SELECT max(d), count(*) FROM " + rowsSql)) {
                r.next();
                asOf = asOf(data, r.getObject(1, LocalDate.class));
                rows = r.getLong(2);
            }
            if (rows == 0) {
                throw new InputException(source.name + ": no data rows after the header");
            }
            String cohort = "week".equals(data.cohortPeriod()) ? "date_trunc('week', i)::DATE" : "i";
            String cut = "DATE '" + asOf + "'";
            Map<List<String>, Cell> cells = new TreeMap<>(KEY);
            // per user: cohort, arm, install, last active day by the cut-off (-1: none after the install)
            String users = "(SELECT u, any_value(a) AS a, any_value(i) AS i, coalesce(max(datediff('day', i, d)) "
                    + "FILTER (WHERE d <= " + cut + "), 0) AS last FROM " + rowsSql + " WHERE i <= " + cut + " GROUP BY u)";
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery("SELECT CAST(" + cohort + " AS VARCHAR) AS c, a, "
                    + "count(*), max(i), list(last) FROM " + users + " GROUP BY ALL")) {
                while (r.next()) {
                    Map<Integer, Long> lastDays = new TreeMap<>();
                    for (Object v : (Object[]) r.getArray(5).getArray()) {
                        lastDays.merge(((Number) v).intValue(), 1L, Long::sum);
                    }
                    List<String> key = List.of(r.getString(1), r.getString(2));
                    cells.put(key, new Cell(key.get(0), key.get(1), r.getLong(3), age(asOf, r.getObject(4, LocalDate.class)),
                            new TreeMap<>(), lastDays));
                }
            }
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery("SELECT CAST(" + cohort + " AS VARCHAR), a, "
                    + "datediff('day', i, d) AS t, count(DISTINCT u) FROM " + rowsSql + " WHERE d > i AND d <= " + cut
                    + " GROUP BY ALL")) {
                while (r.next()) {
                    cells.get(List.of(r.getString(1), r.getString(2))).active().put(r.getInt(3), r.getLong(4));
                }
            }
            return build(new ArrayList<>(cells.values()), source.name, rows, survival, armCol);
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }

    /** A date column as DATE: YYYY-MM-DD, or a date-time's first ten characters; NULL when it is neither. */
    private static String dateExpr(String column) {
        String t = "trim(CAST(" + Sql.identifier(column) + " AS VARCHAR))";
        String day = "CASE WHEN length(" + t + ") > 10 AND substr(" + t + ", 11, 1) IN ('T', ' ') THEN substr(" + t
                + ", 1, 10) ELSE " + t + " END";
        return "(CASE WHEN regexp_full_match(" + day + ", '[0-9]{4}-[0-9]{2}-[0-9]{2}') THEN TRY_CAST(" + day
                + " AS DATE) END)";
    }

    private static long rowsWhere(Connection db, Source source, String condition) throws SQLException {
        try (Statement s = db.createStatement(); ResultSet r = s.executeQuery("SELECT count(*) FROM " + source.relation
                + " WHERE " + condition)) {
            r.next();
            return r.getLong(1);
        }
    }

    // ------------------------------------------------------------------------------------------------
    // both paths

    /**
     * One (cohort, arm) cell: installs, the days observed (1..age), active users per day (absent: 0) and the
     * users per last active day.
     */
    private record Cell(String cohort, String arm, long installs, int age, Map<Integer, Long> active,
                        Map<Integer, Long> lastDays) {
    }

    private static CohortDays build(List<Cell> cells, String source, long rows, boolean survival, String armCol) {
        TreeSet<String> cohortSet = new TreeSet<>(), armSet = new TreeSet<>();
        for (Cell c : cells) {
            cohortSet.add(c.cohort());
            armSet.add(c.arm());
        }
        Limits.names(source, "cohort", cohortSet, Limits.COHORTS, "cohort");
        Limits.names(source, "arm", armSet, Limits.ARMS, armCol == null ? "arm" : armCol);
        List<String> cohorts = new ArrayList<>(cohortSet), arms = new ArrayList<>(armSet);
        long[][] installs = new long[cohorts.size()][arms.size()];
        List<List<Map<Integer, Long>>> active = new ArrayList<>();
        for (int c = 0; c < cohorts.size(); c++) {
            List<Map<Integer, Long>> perArm = new ArrayList<>();
            for (int k = 0; k < arms.size(); k++) {
                perArm.add(new TreeMap<>());
            }
            active.add(perArm);
        }
        for (Cell cell : cells) {
            int c = cohorts.indexOf(cell.cohort()), k = arms.indexOf(cell.arm());
            installs[c][k] = cell.installs();
            int age = Math.min(cell.age(), Limits.DAY);
            TreeMap<Integer, Long> observed = (TreeMap<Integer, Long>) active.get(c).get(k);
            long retained = cell.installs();
            for (int t = 1; t <= age; t++) {
                if (survival) {
                    retained -= cell.lastDays().getOrDefault(t - 1, 0L);
                    observed.put(t, retained);
                } else {
                    observed.put(t, cell.active().getOrDefault(t, 0L));
                }
            }
        }
        return new CohortDays(cohorts, arms, installs, active, source, rows);
    }
}
