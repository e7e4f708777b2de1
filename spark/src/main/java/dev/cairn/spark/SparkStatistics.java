package dev.cairn.spark;

import static org.apache.spark.sql.functions.callUDF;
import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.count;
import static org.apache.spark.sql.functions.countDistinct;
import static org.apache.spark.sql.functions.floor;
import static org.apache.spark.sql.functions.lit;
import static org.apache.spark.sql.functions.max;
import static org.apache.spark.sql.functions.row_number;
import static org.apache.spark.sql.functions.sum;
import static org.apache.spark.sql.functions.trim;
import static org.apache.spark.sql.functions.when;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.models.InputException;
import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.ExactSums;
import dev.cairn.models.data.SpendDataReader;
import dev.cairn.models.data.StatisticsEngine;
import dev.cairn.models.spec.DataSpec;
import java.math.BigDecimal;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.expressions.Window;

/**
 * The data's statistics computed by Spark (DataFrame API), from a CSV or Parquet file or a catalog table.
 *
 * <p>The {@code users} layout is aggregated on the executors per cell (arm, or segment and arm): users,
 * payers, and the payers' log spend, its square and spend as exact integer sums of quanta
 * ({@link ExactSums}: each term computed by the same Java function the embedded engine uses, summed as
 * DECIMAL(38, 0), which Spark adds exactly), so partitions added in any order give the embedded engine's
 * bits; the payers' 50th/90th/99th order statistics (for the predictive checks) are picked exactly by rank
 * within each cell. Only per-cell rows reach the driver. Small tables (summary, estimates, cohort-days) are
 * read whole and checked by the same in-memory readers as inline rows; the {@code activity} layout is
 * counted on the executors (distinct users per cohort, arm and day) into cohort-days rows.
 */
public final class SparkStatistics implements StatisticsEngine {
    static final String LOG_UNITS = "cairn_log_units";
    static final String SPEND_UNITS = "cairn_spend_units";

    @Override
    public String name() {
        return "spark";
    }

    @Override
    public UsersStatistics users(DataSpec data, Path baseDir, boolean strict, boolean segmented) {
        String name = SparkSources.name(data);
        Dataset<Row> raw = SparkSources.read(data, baseDir);
        String armCol = SparkSources.require(raw, data, "arm", name);
        String segCol = segmented ? SparkSources.require(raw, data, "segment", name) : null;
        String spendCol = SparkSources.optional(raw, data, "spend", name);
        String convertedCol = spendCol == null ? SparkSources.optional(raw, data, "converted", name) : null;
        if (spendCol == null && convertedCol == null) {
            throw new InputException(name + ": needs a spend column ('" + data.column("spend", "spend")
                    + "', set data.columns.spend) or a 0/1 conversion column ('" + data.column("converted", "converted")
                    + "', set data.columns.converted); columns found: '" + String.join("', '", raw.columns()) + "'");
        }
        List<Column> keys = new ArrayList<>();
        List<Column> selected = new ArrayList<>();
        if (segCol != null) {
            selected.add(trim(col(segCol).cast("string")).as("segment"));
            keys.add(col("segment"));
        }
        selected.add(trim(col(armCol).cast("string")).as("arm"));
        keys.add(col("arm"));
        String valueCol = spendCol != null ? spendCol : convertedCol;
        selected.add(spendCol != null ? col(valueCol).try_cast("double").as("v") : col(valueCol).cast("string").as("v"));
        selected.add(col(valueCol).cast("string").as("raw"));
        if (Arrays.asList(raw.columns()).contains(SparkSources.LINE)) {
            selected.add(col(SparkSources.LINE));
        }
        Dataset<Row> df = raw.select(selected.toArray(new Column[0]));
        boolean blankIsZero = spendCol != null && data.blankSpendIsZero();
        Column blank = col("raw").isNull().or(trim(col("raw")).equalTo(""));
        Column v = col("v");
        // every rule in one pass over the data; only a broken rule costs a second look (for its lines)
        List<Object[]> rules = new ArrayList<>();
        rules.add(new Object[] {col("arm").isNull().or(col("arm").equalTo("")), armCol, "arm is empty"});
        if (segCol != null) {
            rules.add(new Object[] {col("segment").isNull().or(col("segment").equalTo("")), segCol, "segment is empty"});
        }
        if (!blankIsZero) {
            rules.add(new Object[] {blank, valueCol, spendCol == null ? "value is empty"
                    : "spend is empty (if a blank means the user did not pay, set data.missingSpend to \"zero\")"});
        }
        if (spendCol != null) {
            double small = SpendDataReader.SMALLEST_SPEND, large = SpendDataReader.LARGEST_SPEND;
            rules.add(new Object[] {blank.unary_$bang().and(v.isNull()), valueCol, "spend must be a number"});
            rules.add(new Object[] {v.isNaN().or(v.equalTo(Double.POSITIVE_INFINITY)).or(v.equalTo(Double.NEGATIVE_INFINITY)),
                valueCol, "spend must be a finite number (NaN or infinity found)"});
            rules.add(new Object[] {v.lt(0), valueCol, "spend must be >= 0 (0 for users who did not pay)"});
            rules.add(new Object[] {v.gt(0).and(v.lt(small).or(v.gt(large))), valueCol, "a positive spend must lie between "
                + small + " and " + large + " (the model works with log spend and its square; rescale the currency unit)"});
        } else {
            rules.add(new Object[] {v.isNotNull().and(v.isin("0", "1", "true", "false", "TRUE", "FALSE", "True", "False")
                    .unary_$bang()), valueCol, "expected true/false or 1/0"});
        }
        List<Column> counts = new ArrayList<>();
        for (Object[] rule : rules) {
            counts.add(count(when((Column) rule[0], 1)));
        }
        counts.add(count(when(blank, 1)));
        Row broken = df.agg(counts.get(0), counts.subList(1, counts.size()).toArray(new Column[0])).first();
        for (int i = 0; i < rules.size(); i++) {
            if (broken.getLong(i) > 0) {
                SparkSources.refuse(df, (Column) rules.get(i)[0], (String) rules.get(i)[1], (String) rules.get(i)[2], name);
            }
        }
        long blanks = blankIsZero ? broken.getLong(rules.size()) : 0;
        Map<List<String>, ArmStats> cells = spendCol != null ? spendCells(df, keys, segCol != null)
                : conversionCells(df, keys, segCol != null);
        List<String> segments = new ArrayList<>();
        List<ArmStats> stats = new ArrayList<>();
        long rows = 0;
        for (Map.Entry<List<String>, ArmStats> e : cells.entrySet()) {
            segments.add(segCol == null ? null : e.getKey().get(0));
            stats.add(e.getValue());
            rows += e.getValue().users();
        }
        if (rows == 0) {
            throw new InputException(name + ": no data rows");
        }
        List<String> warnings = dev.cairn.models.data.UsersWarnings.usersWarnings(name, data, spendCol, blanks);
        String user = data.mapped("user") ? SparkSources.require(raw, data, "user", name) : null;
        if (user != null) {
            Row r = raw.agg(count(lit(1)), countDistinct(col(user))).first();
            dev.cairn.models.data.UsersWarnings.duplicateUsers(name, user, r.getLong(0) - r.getLong(1), strict, warnings);
        }
        return new UsersStatistics(segments, stats, spendCol != null, name, rows, warnings);
    }

    /** Cells sorted as the embedded engine orders them: by segment, then arm. */
    private static java.util.TreeMap<List<String>, ArmStats> sortedCells() {
        return new java.util.TreeMap<>((x, y) -> {
            for (int i = 0; i < x.size(); i++) {
                int c = x.get(i).compareTo(y.get(i));
                if (c != 0) {
                    return c;
                }
            }
            return 0;
        });
    }

    private static List<String> key(Row r, boolean segmented) {
        return segmented ? List.of(r.getString(r.fieldIndex("segment")), r.getString(r.fieldIndex("arm")))
                : List.of(r.getString(r.fieldIndex("arm")));
    }

    private static Map<List<String>, ArmStats> spendCells(Dataset<Row> df, List<Column> keys, boolean segmented) {
        Column paid = col("v").gt(0);
        Column l = callUDF(LOG_UNITS, col("v")).cast("decimal(38,0)");
        Dataset<Row> agg = df.groupBy(keys.toArray(new Column[0])).agg(
                count(lit(1)).as("users"),
                count(when(paid, 1)).as("payers"),
                sum(when(paid, l)).as("l1"),
                sum(when(paid, l.multiply(l))).as("l2"),
                sum(when(paid, callUDF(SPEND_UNITS, col("v")).cast("decimal(38,0)"))).as("s"),
                max(col("v")).as("max"));
        // order statistics of payer spend: the k-th smallest, k = floor(q (m - 1)) + 1, by rank within the cell
        Dataset<Row> payers = df.filter(paid).withColumn("rank",
                row_number().over(Window.partitionBy(keys.toArray(new Column[0])).orderBy(col("v"))));
        Dataset<Row> counted = payers.join(agg.select(concat(keys, "payers")), keyNames(segmented));
        Map<List<String>, double[]> orders = new HashMap<>();
        double[] qs = {0.5, 0.9, 0.99};
        Column wanted = lit(false);
        for (double q : qs) {
            wanted = wanted.or(col("rank").equalTo(floor(lit(q).multiply(col("payers").minus(1))).plus(1)));
        }
        for (Row r : counted.filter(wanted).collectAsList()) {
            long m = r.getLong(r.fieldIndex("payers"));
            int rank = r.getInt(r.fieldIndex("rank"));
            double[] o = orders.computeIfAbsent(key(r, segmented), k -> new double[] {Double.NaN, Double.NaN, Double.NaN});
            for (int i = 0; i < qs.length; i++) {
                if (rank == (long) Math.floor(qs[i] * (m - 1)) + 1) {
                    o[i] = r.getDouble(r.fieldIndex("v"));
                }
            }
        }
        Map<List<String>, ArmStats> cells = sortedCells();
        for (Row r : agg.collectAsList()) {
            List<String> key = key(r, segmented);
            double[] o = orders.getOrDefault(key, new double[] {Double.NaN, Double.NaN, Double.NaN});
            double max = r.isNullAt(r.fieldIndex("max")) ? Double.NaN : r.getDouble(r.fieldIndex("max"));
            cells.put(key, new ArmStats(key.get(key.size() - 1), r.getLong(r.fieldIndex("users")),
                    r.getLong(r.fieldIndex("payers")), units(r, "l1", ExactSums.LOG_SCALE),
                    units(r, "l2", ExactSums.LOG_SCALE * ExactSums.LOG_SCALE), units(r, "s", ExactSums.SPEND_SCALE),
                    o[0], o[1], o[2], max));
        }
        return cells;
    }

    private static Column[] concat(List<Column> keys, String extra) {
        List<Column> all = new ArrayList<>(keys);
        all.add(col(extra));
        return all.toArray(new Column[0]);
    }

    private static scala.collection.immutable.Seq<String> keyNames(boolean segmented) {
        List<String> names = segmented ? List.of("segment", "arm") : List.of("arm");
        return scala.jdk.javaapi.CollectionConverters.asScala(names).toList();
    }

    /** An exact DECIMAL(38, 0) sum of quanta as the double {@link ExactSums} gives for it (0 when null). */
    private static double units(Row r, String column, double scale) {
        int i = r.fieldIndex(column);
        BigDecimal d = r.isNullAt(i) ? BigDecimal.ZERO : r.getDecimal(i);
        return ExactSums.value(d.toBigIntegerExact(), scale);
    }

    private static Map<List<String>, ArmStats> conversionCells(Dataset<Row> df, List<Column> keys, boolean segmented) {
        Column yes = col("v").isin("1", "true", "TRUE", "True");
        Map<List<String>, ArmStats> cells = sortedCells();
        for (Row r : df.groupBy(keys.toArray(new Column[0])).agg(count(lit(1)).as("users"), count(when(yes, 1)).as("payers"))
                .collectAsList()) {
            List<String> key = key(r, segmented);
            cells.put(key, ArmStats.conversions(key.get(key.size() - 1), r.getLong(r.fieldIndex("users")),
                    r.getLong(r.fieldIndex("payers"))));
        }
        return cells;
    }

    @Override
    public List<JsonNode> rows(DataSpec data, Path baseDir) {
        Dataset<Row> df = SparkSources.read(data, baseDir);
        if (Arrays.asList(df.columns()).contains(SparkSources.LINE)) {
            df = df.orderBy(col(SparkSources.LINE)).drop(SparkSources.LINE); // in file order: row i is line i + 2
        }
        long n = df.count();
        if (n > dev.cairn.models.Limits.INLINE_ROWS) {
            throw new InputException(String.format(Locale.ROOT, "%s: %,d rows; a %s table is read whole and may have at "
                    + "most %,d", SparkSources.name(data), n, data.layout(), dev.cairn.models.Limits.INLINE_ROWS));
        }
        String[] columns = df.columns();
        List<JsonNode> out = new ArrayList<>();
        for (Row r : df.collectAsList()) {
            ObjectNode o = JsonNodeFactory.instance.objectNode();
            for (int i = 0; i < columns.length; i++) {
                o.set(columns[i], value(r.get(i)));
            }
            out.add(o);
        }
        return out;
    }

    /** A cell as read: numbers and booleans as such, anything else as its text (the models type the columns). */
    static JsonNode value(Object v) {
        JsonNodeFactory f = JsonNodeFactory.instance;
        if (v == null) {
            return f.nullNode();
        }
        if (v instanceof Number n) {
            return n instanceof Long || n instanceof Integer || n instanceof Short ? f.numberNode(n.longValue())
                    : f.numberNode(n.doubleValue());
        }
        if (v instanceof Boolean b) {
            return f.booleanNode(b);
        }
        return f.textNode(v.toString());
    }

    @Override
    public List<JsonNode> activity(DataSpec data, Path baseDir, boolean survival) {
        return SparkActivity.rows(SparkSources.read(data, baseDir), data, SparkSources.name(data), survival);
    }
}
