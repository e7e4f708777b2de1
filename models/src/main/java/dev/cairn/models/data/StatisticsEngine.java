package dev.cairn.models.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.util.List;
import java.util.ServiceLoader;

/**
 * An engine other than the embedded one that computes the data's statistics ({@code data.engine}), found
 * through {@link ServiceLoader} by its name. Everything after the statistics is the same code path: the
 * engine hands over per-cell statistics of the {@code users} layout (exact sums, {@link ExactSums}), the
 * activity layout as cohort-days rows, and the small tables of the other layouts whole, which the in-memory
 * readers then check and sum as they do inline rows.
 */
public interface StatisticsEngine {
    /** {@return the name {@code data.engine} selects it by} */
    String name();

    /**
     * The {@code users} layout's statistics per cell.
     *
     * @param data      the spec's data part
     * @param baseDir   the spec's folder
     * @param strict    whether warnings are errors
     * @param segmented whether cells are (segment, arm) rather than arm
     * @return the cells
     * @throws InputException one line naming the data and what is wrong
     */
    UsersStatistics users(DataSpec data, Path baseDir, boolean strict, boolean segmented);

    /**
     * A small table read whole (layouts summary, estimates, cohort-days), each row as a JSON object of its
     * columns with the values as read (text from CSV, typed values otherwise; {@link #typed} then casts the
     * layout's numeric columns), in the table's order where it has one.
     *
     * @param data    the spec's data part
     * @param baseDir the spec's folder
     * @return the rows
     * @throws InputException when the table cannot be read
     */
    List<JsonNode> rows(DataSpec data, Path baseDir);

    /**
     * The {@code activity} layout aggregated into {@code cohort-days} rows (cohort, arm, day, installs,
     * active), every observed day present, as {@link ActivityLayout} defines them.
     *
     * @param data     the spec's data part
     * @param baseDir  the spec's folder
     * @param survival whether "active" is still-retained
     * @return the rows
     * @throws InputException one line naming the data and what is wrong
     */
    List<JsonNode> activity(DataSpec data, Path baseDir, boolean survival);

    /**
     * The users layout's cells.
     *
     * @param segments per cell its segment (null entries when not segmented)
     * @param cells    per cell its statistics
     * @param hasSpend whether spend was read (else conversions)
     * @param source   the data's name for messages
     * @param rows     rows read
     * @param warnings what the reader noticed
     */
    record UsersStatistics(List<String> segments, List<ArmStats> cells, boolean hasSpend, String source, long rows,
                           List<String> warnings) {
    }

    /**
     * The engine a spec names.
     *
     * @param name {@code data.engine}
     * @return the engine
     * @throws InputException when no engine of that name is on the class path
     */
    static StatisticsEngine named(String name) {
        for (StatisticsEngine e : ServiceLoader.load(StatisticsEngine.class)) {
            if (e.name().equals(name)) {
                return e;
            }
        }
        throw new InputException("/data/engine: '" + name + "' is not available here: the statistics on Spark are "
                + "computed by cairn's Spark job (spark/target/cairn-spark-job.jar, run with spark-submit); the "
                + "command line and the service use the embedded engine");
    }

    /**
     * An engine's rows with the layout's numeric columns as numbers, as the embedded engine casts them: text
     * that reads as a number becomes one, a blank becomes null, and other text stays (for the reader to refuse
     * with its message); every other column keeps its value, so text such as an arm "007" is not changed.
     *
     * @param rows   the rows as the engine read them (text from CSV, typed values from Parquet or a table)
     * @param typeOf a column's engine type ("DOUBLE" for numbers)
     * @return the rows, numeric columns converted
     */
    static List<JsonNode> typed(List<JsonNode> rows, java.util.function.Function<String, String> typeOf) {
        List<JsonNode> out = new java.util.ArrayList<>(rows.size());
        for (JsonNode row : rows) {
            com.fasterxml.jackson.databind.node.ObjectNode o = row.deepCopy();
            for (java.util.Iterator<String> it = row.fieldNames(); it.hasNext(); ) {
                String c = it.next();
                JsonNode v = row.get(c);
                if (v.isTextual() && "DOUBLE".equals(typeOf.apply(c))) {
                    String t = v.asText().strip();
                    try {
                        o.set(c, t.isEmpty() ? com.fasterxml.jackson.databind.node.NullNode.getInstance()
                                : com.fasterxml.jackson.databind.node.DoubleNode.valueOf(Double.parseDouble(t)));
                    } catch (NumberFormatException e) {
                        // stays text: the reader refuses it as not a number
                    }
                }
            }
            out.add(o);
        }
        return out;
    }

    /**
     * Runs an in-memory reader on rows an engine read, naming the data (not the spec) in its messages.
     *
     * @param data the spec's data part
     * @param read the reader
     * @param <T>  what it reads
     * @return what it read
     * @throws InputException the reader's message, with "spec: /data/rows/N" as "DATA (read by ENGINE): row N"
     */
    static <T> T fromRows(DataSpec data, java.util.function.Supplier<T> read) {
        try {
            return read.get();
        } catch (InputException e) {
            String m = e.getMessage();
            boolean lines = data.path() != null && data.path().toLowerCase(java.util.Locale.ROOT).endsWith(".csv")
                    && !data.path().contains("://");
            if (lines) { // one CSV file, handed over in file order: row i is line i + 2, named as the embedded engine names it
                java.util.regex.Matcher rule = java.util.regex.Pattern.compile(
                        "^spec: ((?:/data/rows/\\d+(?:, )?)+)( and \\d+ more)?, '([^']*)': (.*)$", java.util.regex.Pattern.DOTALL).matcher(m);
                java.util.regex.Matcher cell = java.util.regex.Pattern.compile(
                        "^spec: /data/rows/(\\d+)/([^:]+): (.*)$", java.util.regex.Pattern.DOTALL).matcher(m);
                if (rule.matches()) {
                    List<String> at = new java.util.ArrayList<>();
                    java.util.regex.Matcher n = java.util.regex.Pattern.compile("/data/rows/(\\d+)").matcher(rule.group(1));
                    while (n.find()) {
                        at.add(String.valueOf(Long.parseLong(n.group(1)) + 2));
                    }
                    throw new InputException(data.path() + ": line" + (at.size() == 1 ? " " : "s ") + String.join(", ", at)
                            + (rule.group(2) == null ? "" : rule.group(2)) + ", column '" + rule.group(3) + "': " + rule.group(4));
                }
                if (cell.matches()) {
                    throw new InputException(data.path() + ": line " + (Long.parseLong(cell.group(1)) + 2) + ", column '"
                            + cell.group(2) + "': " + cell.group(3));
                }
            }
            String where = (data.table() != null ? "table " + data.table() : data.path()) + " (read by " + data.engine() + ")";
            throw new InputException(m.replace("spec: /data/rows/", where + ": row ").replace("inline rows", where));
        }
    }

    /**
     * Whether the spec asks for an engine other than the embedded one.
     *
     * @param data the spec's data part
     * @return true for a named other engine
     */
    static boolean external(DataSpec data) {
        return data.engine() != null && !"embedded".equals(data.engine());
    }
}
