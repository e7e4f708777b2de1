package dev.cairn.models.spec;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.databind.JsonNode;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Where the data are and how to read them: a file ({@code path}) or inline {@code rows}.
 *
 * <p>The summary layout's two log-spend columns may be mapped under their column names as well
 * ({@code log_spend_sum}, {@code log_spend_sq_sum}); the record holds them under the logical names
 * {@code logSpendSum} and {@code logSpendSqSum}, so the readers see one spelling.
 *
 * @param missingSpend {@code "zero"} reads a blank spend cell (users layout) as no purchase; {@code null} or
 *                     {@code "refuse"} refuses it
 * @param cohortPeriod activity layout: {@code "day"} (default) or {@code "week"} (Monday to Sunday) cohorts
 * @param asOf         activity layout: the cut-off date, YYYY-MM-DD (default: the latest active date)
 * @param engine       {@code "embedded"} (default) or {@code "spark"}: what computes the statistics
 * @param table        engine spark: a catalog table to read instead of a file
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record DataSpec(String path, String layout, Map<String, String> columns, List<JsonNode> rows,
                       String missingSpend, String cohortPeriod, String asOf, String engine, String table) {

    /** Column keys that may also be written as the column names they default to. */
    static final Map<String, String> ALIASES = Map.of("log_spend_sum", "logSpendSum",
            "log_spend_sq_sum", "logSpendSqSum");

    public DataSpec {
        if (columns != null && columns.keySet().stream().anyMatch(ALIASES::containsKey)) {
            Map<String, String> canonical = new LinkedHashMap<>();
            columns.forEach((k, v) -> canonical.put(ALIASES.getOrDefault(k, k), v));
            columns = Map.copyOf(canonical);
        }
    }

    public DataSpec(String path, String layout, Map<String, String> columns, List<JsonNode> rows) {
        this(path, layout, columns, rows, null, null, null, null, null);
    }

    public DataSpec(String path, String layout, Map<String, String> columns, List<JsonNode> rows, String missingSpend) {
        this(path, layout, columns, rows, missingSpend, null, null, null, null);
    }

    public DataSpec(String path, String layout, Map<String, String> columns, List<JsonNode> rows, String missingSpend,
                    String cohortPeriod, String asOf) {
        this(path, layout, columns, rows, missingSpend, cohortPeriod, asOf, null, null);
    }

    /**
     * The same data part with rows handed over in memory (an engine's table read whole).
     *
     * @param rows the rows
     * @return the copy, reading those rows
     */
    public DataSpec withRows(List<JsonNode> rows) {
        return new DataSpec(null, layout, columns, rows, missingSpend, cohortPeriod, asOf, null, null);
    }

    /**
     * The data column for a logical column, {@code columns.<name>} or the default name.
     *
     * @param logical     the logical column, e.g. "arm"
     * @param defaultName the name read when the spec maps none
     * @return the column's name in the data
     */
    public String column(String logical, String defaultName) {
        if (columns != null && columns.get(logical) != null) {
            return columns.get(logical);
        }
        return defaultName;
    }

    /**
     * Whether the spec maps a logical column to a name of its own.
     *
     * @param logical the logical column
     * @return true when {@code data.columns} names it
     */
    public boolean mapped(String logical) {
        return columns != null && columns.containsKey(logical);
    }

    /** {@return whether a blank spend cell is read as 0 ({@code data.missingSpend: "zero"})} */
    public boolean blankSpendIsZero() {
        return "zero".equals(missingSpend);
    }
}
