package dev.cairn.models.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.function.Function;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.duckdb.DuckDBAppender;
import org.duckdb.DuckDBConnection;

/** A relation the queries read from, with its column names and how to point at a bad row. */
final class Source {
    private static final int SHOW_ROWS = 3;
    /** The header line as RFC 4180 CSV; blanks around a name are not part of it. */
    private static final CSVFormat HEADER_FORMAT = CSVFormat.RFC4180.builder().setIgnoreSurroundingSpaces(true).get();

    final String name;
    final String relation;
    final List<String> columns;
    final boolean csv;
    final String rowsPointer; // for inline rows: "/data/rows"
    final DataFile file; // null for inline rows

    private Source(String name, String relation, List<String> columns, boolean csv, String rowsPointer, DataFile file) {
        this.name = name;
        this.relation = relation;
        this.columns = columns;
        this.csv = csv;
        this.rowsPointer = rowsPointer;
        this.file = file;
    }

    /** A query text as the result records it: the file as the spec names it, not where it lies on this machine. */
    String shown(String sql) {
        return file == null ? sql : file.shown(sql);
    }

    static Source file(Connection db, DataFile file, Function<String, String> typeOf) throws SQLException {
        String name = file.written;
        String quoted = file.literal();
        if (file.parquet) {
            Map<String, String> found = new LinkedHashMap<>();
            try (Statement s = db.createStatement();
                 ResultSet r = s.executeQuery("DESCRIBE SELECT * FROM read_parquet(" + quoted + ")")) {
                while (r.next()) {
                    found.put(r.getString(1), r.getString(2));
                }
            } catch (SQLException e) {
                throw new InputException(name + ": not a readable Parquet file: "
                        + e.getMessage().lines().findFirst().orElse(""));
            }
            for (Map.Entry<String, String> e : found.entrySet()) {
                String wanted = typeOf.apply(e.getKey());
                if (!fits(wanted, e.getValue())) {
                    throw new InputException(name + ": column '" + e.getKey() + "' holds " + e.getValue()
                            + " values; expected " + (wanted.equals("DOUBLE") ? "numbers" : "true/false or 0/1"));
                }
            }
            return new Source(name, "read_parquet(" + quoted + ")", new ArrayList<>(found.keySet()), false, null, file);
        }
        List<String> header = header(file.real, name);
        Map<String, String> types = new LinkedHashMap<>();
        for (String c : header) {
            types.put(c, typeOf.apply(c));
        }
        StringBuilder cols = new StringBuilder("{");
        for (Map.Entry<String, String> e : types.entrySet()) {
            if (cols.length() > 1) {
                cols.append(", ");
            }
            cols.append(Sql.literal(e.getKey())).append(": ").append(Sql.literal(e.getValue()));
        }
        cols.append('}');
        String relation = "read_csv(" + quoted + ", auto_detect = false, header = true, delim = ',', quote = '\"', "
                + "escape = '\"', strict_mode = true, null_padding = false, columns = " + cols + ")";
        return new Source(name, relation, header, true, null, file);
    }

    /** Whether a Parquet column of {@code found} type may be read as {@code wanted} (VARCHAR takes anything). */
    private static boolean fits(String wanted, String found) {
        String t = found.toUpperCase(Locale.ROOT);
        boolean numeric = t.matches("(TINYINT|SMALLINT|INTEGER|BIGINT|HUGEINT|UTINYINT|USMALLINT|UINTEGER|UBIGINT"
                + "|UHUGEINT|FLOAT|DOUBLE|REAL)") || t.startsWith("DECIMAL");
        return switch (wanted) {
            case "DOUBLE" -> numeric;
            case "BOOLEAN" -> t.equals("BOOLEAN") || numeric;
            default -> true;
        };
    }

    /** The header's column names, parsed as RFC 4180 CSV (the engine reads the data; this only names the columns). */
    private static List<String> header(Path file, String name) {
        CSVRecord first;
        try (BufferedReader r = new BufferedReader(new java.io.InputStreamReader(Files.newInputStream(file),
                StandardCharsets.UTF_8.newDecoder()))) {
            r.mark(1);
            if (r.read() != '\uFEFF') {
                r.reset();
            }
            CSVParser parser = CSVParser.builder().setReader(r).setFormat(HEADER_FORMAT).get();
            var records = parser.iterator();
            first = records.hasNext() ? records.next() : null;
        } catch (CharacterCodingException e) {
            throw new InputException(name + ": not UTF-8 text");
        } catch (java.io.UncheckedIOException e) {
            if (e.getCause() instanceof CharacterCodingException) {
                throw new InputException(name + ": not UTF-8 text");
            }
            throw new InputException(name + ": line 1: the header is not valid CSV (" + e.getCause().getMessage() + ")");
        } catch (IOException e) {
            throw new InputException(name + ": cannot be read (" + e.getMessage() + ")");
        }
        if (first == null || (first.size() == 1 && first.get(0).isEmpty())) {
            throw new InputException(name + ": empty file, expected a header line and data rows");
        }
        List<String> columns = new ArrayList<>();
        Set<String> seen = new LinkedHashSet<>();
        for (String c : first) {
            if (c.isEmpty()) {
                throw new InputException(name + ": line 1: column " + (columns.size() + 1) + " has no name");
            }
            if (!seen.add(c)) {
                throw new InputException(name + ": line 1: column '" + c + "' appears twice");
            }
            columns.add(c);
        }
        return columns;
    }

    /** Refuses an inline value of the wrong type for its column's engine type (null and absent pass). */
    private static void checkValue(JsonNode v, String type, String where) {
        if (v == null || v.isNull()) {
            return;
        }
        if (type.equals("DOUBLE") && !v.isNumber()) {
            throw new InputException("spec: " + where + ": expected a number, found " + v);
        }
        if (type.equals("BOOLEAN") && !(v.isBoolean() || (v.isIntegralNumber() && (v.intValue() == 0 || v.intValue() == 1)))) {
            throw new InputException("spec: " + where + ": expected true/false or 1/0, found " + v);
        }
        if (type.equals("VARCHAR") && !v.isValueNode()) {
            throw new InputException("spec: " + where + ": expected a text or number, found " + v);
        }
    }

    /** Every column of the inline rows, in order of first appearance, with the engine type it is read as. */
    private static Map<String, String> columnTypes(List<JsonNode> rows, Function<String, String> typeOf) {
        Map<String, String> types = new LinkedHashMap<>();
        for (JsonNode row : rows) {
            row.fieldNames().forEachRemaining(f -> types.computeIfAbsent(f, typeOf));
        }
        return types;
    }

    /**
     * Inline rows read without the engine: their columns in order of first appearance and every value checked
     * against its column's type, as {@link #inline} checks them; there is no relation to query.
     */
    static Source inlineColumns(DataSpec data, Function<String, String> typeOf) {
        List<JsonNode> rows = data.rows();
        Map<String, String> types = columnTypes(rows, typeOf);
        List<String> columns = new ArrayList<>(types.keySet());
        for (int i = 0; i < rows.size(); i++) {
            for (Map.Entry<String, String> e : types.entrySet()) {
                checkValue(rows.get(i).get(e.getKey()), e.getValue(), "/data/rows/" + i + "/" + e.getKey());
            }
        }
        return new Source("inline rows", null, columns, false, "/data/rows", null);
    }

    /** Inline rows become a temporary table; each JSON value must have the type its column needs. */
    static Source inline(Connection db, DataSpec data, Function<String, String> typeOf) throws SQLException {
        List<JsonNode> rows = data.rows();
        Map<String, String> types = columnTypes(rows, typeOf);
        List<String> columns = new ArrayList<>(types.keySet());
        // A table of this engine's own in-memory database, filled through the engine's appender (a batch
        // of prepared inserts runs row by row: seconds for the largest inline table).
        StringBuilder ddl = new StringBuilder("CREATE TABLE inline_rows (");
        int k = 0;
        for (Map.Entry<String, String> e : types.entrySet()) {
            ddl.append(k == 0 ? "" : ", ").append(Sql.identifier(e.getKey())).append(' ').append(e.getValue());
            k++;
        }
        ddl.append(", row_index BIGINT)");
        try (Statement s = db.createStatement()) {
            s.execute(ddl.toString());
        }
        try (DuckDBAppender append = db.unwrap(DuckDBConnection.class).createAppender(DuckDBConnection.DEFAULT_SCHEMA,
                "inline_rows")) {
            for (int i = 0; i < rows.size(); i++) {
                JsonNode row = rows.get(i);
                append.beginRow();
                for (Map.Entry<String, String> e : types.entrySet()) {
                    JsonNode v = row.get(e.getKey());
                    String where = "/data/rows/" + i + "/" + e.getKey();
                    checkValue(v, e.getValue(), where);
                    if (v == null || v.isNull()) {
                        append.appendNull();
                    } else if (e.getValue().equals("DOUBLE")) {
                        append.append(v.doubleValue());
                    } else if (e.getValue().equals("BOOLEAN")) {
                        append.append(v.isBoolean() ? v.booleanValue() : v.intValue() == 1);
                    } else {
                        append.append(v.asText());
                    }
                }
                append.append((long) i);
                append.endRow();
            }
        }
        return new Source("inline rows", "inline_rows", columns, false, "/data/rows", null);
    }

    /** The columns as a message lists them, each quoted, since a name may hold a comma. */
    String found() {
        return "'" + String.join("', '", columns) + "'";
    }

    String require(DataSpec data, String logical, String defaultName) {
        String c = data.column(logical, defaultName);
        if (!columns.contains(c)) {
            throw new InputException(name + ": missing column '" + c + "'"
                    + (data.mapped(logical) ? " (data.columns." + logical + ")" : " (or set data.columns." + logical + ")")
                    + "; columns found: " + found());
        }
        return c;
    }

    /** The column when present; a column mapped in the spec but absent is an error. */
    String optional(DataSpec data, String logical, String defaultName) {
        String c = data.column(logical, defaultName);
        if (columns.contains(c)) {
            return c;
        }
        if (data.mapped(logical)) {
            throw new InputException(name + ": missing column '" + c + "' (data.columns." + logical
                    + "); columns found: " + found());
        }
        return null;
    }

    String optionalMapped(DataSpec data, String logical) {
        return data.mapped(logical) ? optional(data, logical, logical) : null;
    }

    /**
     * Refuses the data at the first rule that some row breaks: each rule is {SQL condition that marks a bad
     * row, column to name, what is wrong}.
     */
    void check(Connection db, String[][] rules) {
        for (String[] rule : rules) {
            long count;
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(
                    "SELECT count(*) FROM " + relation + " WHERE " + rule[0])) {
                r.next();
                count = r.getLong(1);
            } catch (SQLException e) {
                throw Sql.readError(name, e);
            }
            if (count > 0) {
                throw bad(db, rule[0], rule[1], count, rule[2]);
            }
        }
    }

    /**
     * The error for rows matching {@code condition}: counts them and names the first few by line (files;
     * the header is line 1) or by JSON pointer (inline rows).
     */
    InputException bad(Connection db, String condition, String column, long count, String what) {
        List<String> where = new ArrayList<>();
        String position = rowsPointer != null ? "row_index" : "row_number() OVER ()";
        String sql = "SELECT position FROM (SELECT " + position + " AS position, * FROM " + relation
                + ") WHERE " + condition + " ORDER BY position LIMIT " + SHOW_ROWS;
        // Inline rows carry their index; a file's rows are numbered by a one-thread engine so that
        // row_number() follows the file (this path only runs on bad data).
        try (Connection own = rowsPointer != null ? null : Engine.open(true, file);
             Statement s = (own != null ? own : db).createStatement(); ResultSet r = s.executeQuery(sql)) {
            while (r.next()) {
                long p = r.getLong(1);
                where.add(rowsPointer != null ? rowsPointer + "/" + p : String.valueOf(csv ? p + 1 : p));
            }
        } catch (SQLException e) {
            // Fall back to the count alone.
        }
        String place;
        if (rowsPointer != null) {
            place = "spec: " + String.join(", ", where) + (count > where.size() ? " and " + (count - where.size()) + " more" : "");
            return new InputException(place + ", '" + column + "': " + what);
        }
        String label = csv ? "line" : "row";
        place = name + ": " + label + (where.size() == 1 ? " " : "s ") + String.join(", ", where)
                + (count > where.size() ? " and " + (count - where.size()) + " more" : "");
        return new InputException(place + ", column '" + column + "': " + what);
    }
}
