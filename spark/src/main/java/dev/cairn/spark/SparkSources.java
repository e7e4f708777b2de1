package dev.cairn.spark;

import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.lit;

import dev.cairn.models.InputException;
import dev.cairn.models.data.ExactSums;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.api.java.UDF1;
import org.apache.spark.sql.types.DataTypes;

/**
 * Where the Spark engine's data come from and how it refuses them: the running session (with cairn's two
 * functions registered), a catalog table or a CSV or Parquet file — one CSV file read with its line numbers —
 * the columns a layout needs, and one-line refusals.
 */
final class SparkSources {
    private SparkSources() {
    }

    /** {@return the running session (the job's, or a test's)} */
    static SparkSession session() {
        SparkSession s = SparkSession.getActiveSession().getOrElse(() -> SparkSession.getDefaultSession().getOrElse(() -> null));
        if (s == null) {
            throw new InputException("/data/engine: 'spark' needs a running Spark session (run cairn's Spark job with "
                    + "spark-submit)");
        }
        s.udf().register(SparkStatistics.LOG_UNITS, (UDF1<Double, Long>) y -> y == null || !(y > 0) ? null : ExactSums.logUnits(y),
                DataTypes.LongType);
        s.udf().register(SparkStatistics.SPEND_UNITS, (UDF1<Double, Long>) y -> y == null || !(y > 0) ? null : ExactSums.spendUnits(y),
                DataTypes.LongType);
        return s;
    }

    /** The data's name in messages: the path as the spec writes it, or the table. */
    static String name(DataSpec data) {
        return data.table() != null ? "table " + data.table() : data.path();
    }

    /** Reads the data: a catalog table, or a CSV (header, every column as text) or Parquet file by extension. */
    static Dataset<Row> read(DataSpec data, Path baseDir) {
        SparkSession s = session();
        if (data.table() != null) {
            return s.table(data.table());
        }
        String path = data.path();
        String location = path.contains("://") || Path.of(path).isAbsolute() ? path : baseDir.resolve(path).toString();
        String lower = path.toLowerCase(Locale.ROOT);
        try {
            if (lower.endsWith(".parquet")) {
                return s.read().parquet(location);
            }
            if (lower.endsWith(".csv")) {
                if (!path.contains("://") && java.nio.file.Files.isRegularFile(Path.of(location))) {
                    return numberedCsv(s, location, path);
                }
                return s.read().option("header", true).option("inferSchema", false).option("mode", "FAILFAST").csv(location);
            }
        } catch (RuntimeException e) {
            throw new InputException(path + ": cannot be read by Spark (" + firstLine(e) + ")");
        }
        throw new InputException("data.path: " + path + ": expected a .csv or .parquet file (or data.table)");
    }

    /** The column that carries a CSV row's line in its file (the header is line 1). */
    static final String LINE = "cairn_line";

    /**
     * One CSV file with each row's line number, so that refusals name lines as the embedded engine's do: the
     * file read as text, numbered in file order, and each line after the header parsed as CSV (text columns).
     */
    private static Dataset<Row> numberedCsv(SparkSession s, String location, String path) {
        Dataset<Row> text = s.read().text(location);
        Row first = text.first();
        List<String> header;
        try (org.apache.commons.csv.CSVParser p = org.apache.commons.csv.CSVParser.parse(first.getString(0),
                org.apache.commons.csv.CSVFormat.RFC4180.builder().setIgnoreSurroundingSpaces(true).get())) {
            header = p.getRecords().get(0).toList();
        } catch (java.io.IOException | RuntimeException e) {
            throw new InputException(path + ": line 1: the header is not valid CSV (" + firstLine(e) + ")");
        }
        org.apache.spark.sql.types.StructType columns = new org.apache.spark.sql.types.StructType();
        for (String h : header) {
            columns = columns.add(h, DataTypes.StringType, true);
        }
        org.apache.spark.api.java.JavaRDD<Row> numbered = text.javaRDD().zipWithIndex().filter(t -> t._2() > 0)
                .map(t -> org.apache.spark.sql.RowFactory.create(t._1().getString(0), t._2() + 1));
        Dataset<Row> lines = s.createDataFrame(numbered, new org.apache.spark.sql.types.StructType()
                .add("value", DataTypes.StringType).add(LINE, DataTypes.LongType));
        List<Column> out = new ArrayList<>();
        for (String h : header) {
            out.add(col("r." + "`" + h.replace("`", "``") + "`").as(h));
        }
        out.add(col(LINE));
        return lines.select(org.apache.spark.sql.functions.from_csv(col("value"), lit(columns.toDDL()), Map.<String, String>of()).as("r"), col(LINE))
                .select(out.toArray(new Column[0]));
    }

    private static String firstLine(Throwable e) {
        String m = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        return m.lines().findFirst().orElse(m);
    }

    static String require(Dataset<Row> df, DataSpec data, String logical, String name) {
        String c = data.column(logical, logical);
        if (!Arrays.asList(df.columns()).contains(c)) {
            throw new InputException(name + ": missing column '" + c + "'" + (data.mapped(logical)
                    ? " (data.columns." + logical + ")" : " (or set data.columns." + logical + ")")
                    + "; columns found: '" + String.join("', '", df.columns()) + "'");
        }
        return c;
    }

    static String optional(Dataset<Row> df, DataSpec data, String logical, String name) {
        String c = data.column(logical, logical);
        if (Arrays.asList(df.columns()).contains(c)) {
            return c;
        }
        if (data.mapped(logical)) {
            require(df, data, logical, name);
        }
        return null;
    }

    /**
     * Refuses the data when some row matches: with the first lines, as the embedded engine names them, when the
     * rows carry their line (one CSV file); else how many, and the first few values as they read.
     */
    static void refuse(Dataset<Row> df, Column bad, String column, String what, String name) {
        long n = df.filter(bad).count();
        if (n > 0 && Arrays.asList(df.columns()).contains(LINE)) {
            List<String> lines = new ArrayList<>();
            for (Row r : df.filter(bad).select(col(LINE)).orderBy(col(LINE)).limit(3).collectAsList()) {
                lines.add(String.valueOf(r.getLong(0)));
            }
            throw new InputException(name + ": line" + (lines.size() == 1 ? " " : "s ") + String.join(", ", lines)
                    + (n > lines.size() ? " and " + (n - lines.size()) + " more" : "") + ", column '" + column + "': " + what);
        }
        if (n > 0) {
            List<String> shown = new ArrayList<>();
            for (Row r : df.filter(bad).limit(3).collectAsList()) {
                shown.add(r.mkString("|"));
            }
            throw new InputException(String.format(Locale.ROOT, "%s: %,d row%s, column '%s': %s (e.g. %s)", name, n,
                    n == 1 ? "" : "s", column, what, String.join("; ", shown)));
        }
    }
}
