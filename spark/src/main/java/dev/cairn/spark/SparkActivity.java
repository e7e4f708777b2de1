package dev.cairn.spark;

import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.collect_list;
import static org.apache.spark.sql.functions.count;
import static org.apache.spark.sql.functions.countDistinct;
import static org.apache.spark.sql.functions.datediff;
import static org.apache.spark.sql.functions.first;
import static org.apache.spark.sql.functions.length;
import static org.apache.spark.sql.functions.lit;
import static org.apache.spark.sql.functions.max;
import static org.apache.spark.sql.functions.substring;
import static org.apache.spark.sql.functions.trim;
import static org.apache.spark.sql.functions.when;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.models.InputException;
import dev.cairn.models.Limits;
import dev.cairn.models.spec.DataSpec;
import java.time.LocalDate;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;

/**
 * The {@code activity} layout on Spark: the same rules and counts as the embedded engine's (see the models'
 * {@code ActivityLayout}) — distinct users per cohort and arm, distinct active users per cohort, arm and day
 * since install, each user's last active day for survival curves, the cut-off and the censoring of young
 * cohorts — computed on the executors; the driver receives one row per cell and per (cell, day).
 */
final class SparkActivity {
    private SparkActivity() {
    }

    /** A date column: YYYY-MM-DD, or a date-time's first ten characters; null when it is neither. */
    private static Column date(String column) {
        Column t = trim(col(column).cast("string"));
        Column day = when(length(t).gt(10).and(substring(t, 11, 1).isin("T", " ")), substring(t, 1, 10)).otherwise(t);
        return when(day.rlike("^[0-9]{4}-[0-9]{2}-[0-9]{2}$"), day.try_cast("date"));
    }

    private static void refuse(Dataset<Row> df, Column bad, String column, String what, String name) {
        SparkSources.refuse(df, bad, column, what, name);
    }

    static List<JsonNode> rows(Dataset<Row> raw, DataSpec data, String name, boolean survival) {
        String userCol = data.column("user", "user"), installCol = data.column("installDate", "installDate");
        String activeCol = data.column("activeDate", "activeDate");
        String armCol = java.util.Arrays.asList(raw.columns()).contains(data.column("arm", "arm")) ? data.column("arm", "arm")
                : null;
        for (String c : armCol == null ? new String[] {userCol, installCol, activeCol} : new String[] {userCol, armCol,
            installCol, activeCol}) {
            if (!java.util.Arrays.asList(raw.columns()).contains(c)) {
                throw new InputException(name + ": missing column '" + c + "'; columns found: '"
                        + String.join("', '", raw.columns()) + "'");
            }
        }
        refuse(raw, trim(col(userCol).cast("string")).isNull().or(trim(col(userCol).cast("string")).equalTo("")), userCol,
                "no user", name);
        for (String c : new String[] {installCol, activeCol}) {
            Column t = trim(col(c).cast("string"));
            refuse(raw, t.isNull().or(t.equalTo("")), c, "no date", name);
            refuse(raw, date(c).isNull(), c, "not a date (YYYY-MM-DD)", name);
        }
        boolean lines = java.util.Arrays.asList(raw.columns()).contains(SparkSources.LINE);
        Dataset<Row> df = raw.select(trim(col(userCol).cast("string")).as("u"),
                (armCol == null ? lit("all") : trim(col(armCol).cast("string"))).as("a"),
                date(installCol).as("i"), date(activeCol).as("d"), lines ? col(SparkSources.LINE) : lit(0L).as("no_line"));
        refuse(df, col("d").lt(col("i")), activeCol, "active before the install", name);
        Dataset<Row> users = df.groupBy("u").agg(countDistinct(col("a")).as("arms"), countDistinct(col("i")).as("installs"));
        String[][] userRules = {{"arms", armCol == null ? "arm" : armCol, "in two arms"}, {"installs", installCol,
            "with two install dates"}};
        for (String[] rule : userRules) {
            List<Row> bad = users.filter(col(rule[0]).gt(1)).select("u").orderBy("u").limit(1).collectAsList();
            if (!bad.isEmpty()) {
                String user = bad.get(0).getString(0);
                refuse(df, col("u").equalTo(user), rule[1], "user " + user + " appears " + rule[2]
                        + " (every row of a user must agree)", name);
            }
        }
        LocalDate asOf = data.asOf() != null ? LocalDate.parse(data.asOf())
                : df.agg(max(col("d"))).first().getDate(0).toLocalDate();
        Column cut = lit(java.sql.Date.valueOf(asOf));
        boolean week = "week".equals(data.cohortPeriod());
        Column cohort = week ? org.apache.spark.sql.functions.date_trunc("week", col("i")).cast("date") : col("i");
        Dataset<Row> in = df.filter(col("i").leq(cut)).withColumn("c", cohort);
        // per user: cohort, arm, install, last active day by the cut-off
        Dataset<Row> perUser = in.groupBy("u").agg(first(col("c")).as("c"), first(col("a")).as("a"),
                first(col("i")).as("i"), max(when(col("d").leq(cut), datediff(col("d"), col("i")))).as("last"));
        Map<List<String>, long[]> cells = new TreeMap<>(KEY);
        Map<List<String>, Map<Integer, Long>> lastDays = new HashMap<>();
        for (Row r : perUser.groupBy("c", "a", "last").agg(count(lit(1)).as("n"), max(col("i")).as("latest"))
                .collectAsList()) {
            List<String> key = List.of(r.getDate(0).toLocalDate().toString(), r.getString(1));
            int last = r.isNullAt(2) ? 0 : r.getInt(2);
            long[] cell = cells.computeIfAbsent(key, k -> new long[] {0, Long.MIN_VALUE});
            cell[0] += r.getLong(3);
            cell[1] = Math.max(cell[1], r.getDate(4).toLocalDate().toEpochDay());
            lastDays.computeIfAbsent(key, k -> new TreeMap<>()).merge(last, r.getLong(3), Long::sum);
        }
        Map<List<String>, Map<Integer, Long>> active = new HashMap<>();
        for (Row r : in.filter(col("d").gt(col("i")).and(col("d").leq(cut)))
                .groupBy(col("c"), col("a"), datediff(col("d"), col("i")).as("t")).agg(countDistinct(col("u")))
                .collectAsList()) {
            active.computeIfAbsent(List.of(r.getDate(0).toLocalDate().toString(), r.getString(1)), k -> new HashMap<>())
                    .put(r.getInt(2), r.getLong(3));
        }
        List<JsonNode> out = new ArrayList<>();
        for (Map.Entry<List<String>, long[]> e : cells.entrySet()) {
            long installs = e.getValue()[0];
            int age = (int) Math.min(Limits.DAY, Math.max(0, ChronoUnit.DAYS.between(LocalDate.ofEpochDay(e.getValue()[1]), asOf)));
            long retained = installs;
            out.add(row(e.getKey(), 0, installs, installs));
            for (int t = 1; t <= age; t++) {
                long value;
                if (survival) {
                    retained -= lastDays.get(e.getKey()).getOrDefault(t - 1, 0L);
                    value = retained;
                } else {
                    value = active.getOrDefault(e.getKey(), Map.of()).getOrDefault(t, 0L);
                }
                out.add(row(e.getKey(), t, installs, value));
            }
        }
        if (out.isEmpty()) {
            throw new InputException(name + ": no data rows");
        }
        return out;
    }

    private static final java.util.Comparator<List<String>> KEY = (x, y) -> {
        int c = x.get(0).compareTo(y.get(0));
        return c != 0 ? c : x.get(1).compareTo(y.get(1));
    };

    private static JsonNode row(List<String> key, int day, long installs, long active) {
        ObjectNode o = JsonNodeFactory.instance.objectNode();
        o.put("cohort", key.get(0));
        o.put("arm", key.get(1));
        o.put("day", day);
        o.put("installs", installs);
        o.put("active", active);
        return o;
    }
}
