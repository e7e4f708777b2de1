package dev.cairn.models.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.sql.Array;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * The spend statistics of each arm per period of {@code data.columns.time} (a date, YYYY-MM-DD, or a day
 * number), from one grouped scan: {@code users} rows grouped by (time, arm) — users, payers and the payers'
 * spend, whose logs are summed exactly ({@link ExactSums}) so the sums do not depend on the engine's
 * threads — or {@code summary} rows summed per (time, arm) in increasing order of each column. The timeline
 * then runs cumulative sums over the periods.
 */
public final class TimelineData {
    /** Most distinct times a timeline shows. */
    public static final int MAX_PERIODS = 1000;

    private TimelineData() {
    }

    /**
     * One period: its time, and per arm (in the given order) {users, payers, S1, S2} of that period alone.
     *
     * @param time  the date text (YYYY-MM-DD) or the day number
     * @param stats per arm the period's sums
     */
    public record Period(Object time, double[][] stats) {
    }

    /**
     * Reads the periods.
     *
     * @param data    the spec's data part (layout users or summary, with columns.time)
     * @param baseDir the spec's folder
     * @param arms    the arms, in the order the fit has them
     * @return the periods in time order
     * @throws InputException naming the row or line of a missing or unreadable time
     */
    public static List<Period> read(DataSpec data, Path baseDir, List<String> arms) {
        String timeColumn = data.column("time", "time");
        Map<Key, double[]> cells = data.rows() != null ? inline(data, timeColumn) : engine(data, baseDir, timeColumn);
        return periods(cells, arms, data.rows() != null ? "inline rows" : data.path(), timeColumn);
    }

    /** A (time, arm) cell. */
    private record Key(String time, String arm) {
    }

    private static Map<Key, double[]> inline(DataSpec data, String timeColumn) {
        boolean summary = "summary".equals(data.layout());
        String arm = data.column(SpendDataReader.ARM, SpendDataReader.ARM);
        String spend = data.column(SpendDataReader.SPEND, SpendDataReader.SPEND);
        String converted = data.column(SpendDataReader.CONVERTED, SpendDataReader.CONVERTED);
        Map<Key, List<double[]>> rows = new TreeMap<>(KEY_ORDER);
        for (int i = 0; i < data.rows().size(); i++) {
            JsonNode r = data.rows().get(i);
            String time = RowRule.text(r.get(timeColumn));
            if (time == null || time.isEmpty()) {
                throw new InputException("spec: /data/rows/" + i + ", '" + timeColumn + "': no time; with data.columns.time "
                        + "every row needs a date (YYYY-MM-DD) or a day number");
            }
            Key key = new Key(time, RowRule.text(r.get(arm)));
            if (summary) {
                rows.computeIfAbsent(key, k -> new ArrayList<>()).add(new double[] {
                    RowRule.number(r.get(data.column(SpendDataReader.USERS, SpendDataReader.USERS))),
                    RowRule.number(r.get(data.column(SpendDataReader.PAYERS, SpendDataReader.PAYERS))),
                    orZero(RowRule.number(r.get(data.column("logSpendSum", SpendDataReader.LOG_SUM)))),
                    orZero(RowRule.number(r.get(data.column("logSpendSqSum", SpendDataReader.LOG_SQ_SUM))))});
            } else {
                Double s = r.has(spend) ? RowRule.number(r.get(spend)) : null;
                JsonNode c = r.get(converted);
                boolean paid = s != null ? s > 0 : c != null && !c.isNull() && (c.isBoolean() ? c.booleanValue() : c.intValue() == 1);
                rows.computeIfAbsent(key, k -> new ArrayList<>()).add(new double[] {1, paid ? 1 : 0, s != null && s > 0 ? s : 0});
            }
        }
        Map<Key, double[]> cells = new TreeMap<>(KEY_ORDER);
        rows.forEach((key, list) -> cells.put(key, summary ? sumSorted(list) : usersCell(list)));
        return cells;
    }

    private static double orZero(Double v) {
        return v == null ? 0 : v;
    }

    /** Users rows {1, paid, spend} of one cell: counts, and log sums over the payers' spend in increasing order. */
    private static double[] usersCell(List<double[]> rows) {
        double[] spends = rows.stream().filter(r -> r[2] > 0).mapToDouble(r -> r[2]).sorted().toArray();
        double payers = rows.stream().mapToDouble(r -> r[1]).sum();
        return logSums(rows.size(), payers, spends);
    }

    private static double[] logSums(double users, double payers, double[] spend) {
        ExactSums.PayerSums sums = new ExactSums.PayerSums();
        for (double y : spend) {
            sums.add(y);
        }
        return new double[] {users, payers, sums.logSum(), sums.logSqSum()};
    }

    /** Summary rows of one cell: each column summed in increasing order. */
    private static double[] sumSorted(List<double[]> rows) {
        double[] out = new double[4];
        for (int j = 0; j < 4; j++) {
            final int col = j;
            for (double v : rows.stream().mapToDouble(r -> r[col]).sorted().toArray()) {
                out[j] += v;
            }
        }
        return out;
    }

    private static Map<Key, double[]> engine(DataSpec data, Path baseDir, String timeColumn) {
        DataFile file = DataFile.of(data.path(), baseDir, "data.path");
        return DataFile.whole(() -> {
            try (Connection db = Engine.open(false, file)) {
                Source source = Source.file(db, file, c -> SpendDataReader.typeOf(c, data));
                String time = source.require(data, "time", "time");
                String t = "trim(CAST(" + Sql.identifier(time) + " AS VARCHAR))";
                source.check(db, new String[][] {{Sql.identifier(time) + " IS NULL OR " + t + " = ''", time,
                    "no time; with data.columns.time every row needs a date (YYYY-MM-DD) or a day number"}});
                String arm = "trim(CAST(" + Sql.identifier(source.require(data, SpendDataReader.ARM, SpendDataReader.ARM))
                        + " AS VARCHAR))";
                return "summary".equals(data.layout()) ? summaryCells(db, source, data, t, arm) : usersCells(db, source, data, t, arm);
            } catch (SQLException e) {
                throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
            }
        }, file);
    }

    private static Map<Key, double[]> usersCells(Connection db, Source source, DataSpec data, String t, String arm)
            throws SQLException {
        String spend = source.optional(data, SpendDataReader.SPEND, SpendDataReader.SPEND);
        String paid;
        if (spend != null) {
            String s = Sql.identifier(spend);
            paid = "count(*) FILTER (WHERE " + s + " > 0), list(" + s + " ORDER BY " + s + ") FILTER (WHERE " + s + " > 0)";
        } else {
            String c = Sql.identifier(source.require(data, SpendDataReader.CONVERTED, SpendDataReader.CONVERTED));
            paid = "count(*) FILTER (WHERE " + c + "), NULL";
        }
        String sql = "SELECT " + t + ", " + arm + ", count(*), " + paid + " FROM " + source.relation + " GROUP BY 1, 2";
        Map<Key, double[]> cells = new TreeMap<>(KEY_ORDER);
        try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(sql)) {
            while (r.next()) {
                Array list = r.getArray(5);
                double[] spends = list == null ? new double[0]
                        : Arrays.stream((Object[]) list.getArray()).mapToDouble(v -> ((Number) v).doubleValue()).toArray();
                cells.put(new Key(r.getString(1), r.getString(2)), logSums(r.getLong(3), r.getLong(4), spends));
            }
        } catch (SQLException e) {
            throw Sql.readError(source.name, e);
        }
        return cells;
    }

    private static Map<Key, double[]> summaryCells(Connection db, Source source, DataSpec data, String t, String arm) {
        String[] columns = {source.require(data, SpendDataReader.USERS, SpendDataReader.USERS),
            source.require(data, SpendDataReader.PAYERS, SpendDataReader.PAYERS),
            source.optional(data, "logSpendSum", SpendDataReader.LOG_SUM),
            source.optional(data, "logSpendSqSum", SpendDataReader.LOG_SQ_SUM)};
        StringBuilder select = new StringBuilder("SELECT " + t + ", " + arm);
        for (String c : columns) {
            select.append(", ").append(c == null ? "0" : "coalesce(CAST(" + Sql.identifier(c) + " AS DOUBLE), 0)");
        }
        Map<Key, List<double[]>> rows = new TreeMap<>(KEY_ORDER);
        try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(select + " FROM " + source.relation)) {
            while (r.next()) {
                rows.computeIfAbsent(new Key(r.getString(1), r.getString(2)), k -> new ArrayList<>())
                        .add(new double[] {r.getDouble(3), r.getDouble(4), r.getDouble(5), r.getDouble(6)});
            }
        } catch (SQLException e) {
            throw Sql.readError(source.name, e);
        }
        Map<Key, double[]> cells = new TreeMap<>(KEY_ORDER);
        rows.forEach((key, list) -> cells.put(key, sumSorted(list)));
        return cells;
    }

    private static final java.util.Comparator<Key> KEY_ORDER =
            java.util.Comparator.comparing(Key::time).thenComparing(Key::arm);

    /**
     * Orders the times (dates or day numbers, not both; a date-time counts as its date) and lays the cells out
     * per period and arm, adding cells whose times name the same period, in the cells' fixed order.
     */
    private static List<Period> periods(Map<Key, double[]> cells, List<String> arms, String source, String column) {
        TreeMap<Comparable<?>, double[][]> periods = new TreeMap<>();
        Boolean dates = null;
        for (Map.Entry<Key, double[]> cell : cells.entrySet()) {
            String text = cell.getKey().time();
            Comparable<?> time = parse(text);
            if (time == null) {
                throw new InputException(source + ": column '" + column + "' (data.columns.time): '" + text
                        + "' is neither a date (YYYY-MM-DD) nor a day number");
            }
            boolean date = time instanceof java.time.LocalDate;
            if (dates != null && dates != date) {
                throw new InputException(source + ": column '" + column + "' (data.columns.time): mixes dates and day "
                        + "numbers ('" + text + "'); use one kind");
            }
            dates = date;
            int a = arms.indexOf(cell.getKey().arm());
            if (a < 0) {
                continue; // an arm the fit dropped cannot be; the main read has refused such rows
            }
            double[][] stats = periods.computeIfAbsent(time, k -> new double[arms.size()][4]);
            for (int j = 0; j < 4; j++) {
                stats[a][j] += cell.getValue()[j];
            }
            if (periods.size() > MAX_PERIODS) {
                throw new InputException(String.format(java.util.Locale.ROOT, "%s: column '%s' (data.columns.time) has "
                        + "more than the %,d distinct times a timeline shows; use a coarser time (a date or a day)",
                        source, column, MAX_PERIODS));
            }
        }
        List<Period> out = new ArrayList<>();
        periods.forEach((time, stats) -> out.add(new Period(time instanceof Long l ? (Object) l : time.toString(), stats)));
        return out;
    }

    /** A date (YYYY-MM-DD, or a date-time whose first ten characters are one), a day number, or null. */
    private static Comparable<?> parse(String text) {
        String day = text.length() > 10 && (text.charAt(10) == 'T' || text.charAt(10) == ' ') ? text.substring(0, 10) : text;
        try {
            return java.time.LocalDate.parse(day);
        } catch (java.time.format.DateTimeParseException e) {
            try {
                return Long.parseLong(text);
            } catch (NumberFormatException n) {
                return null;
            }
        }
    }
}
