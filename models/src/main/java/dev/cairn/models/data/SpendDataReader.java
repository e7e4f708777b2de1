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
import java.sql.DriverManager;
import java.sql.PreparedStatement;
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

/**
 * Builds the spend model's sufficient statistics with the embedded SQL engine (DuckDB): one aggregation
 * query per layout over a CSV file, a Parquet file or inline rows. Bad data are refused with the file,
 * line and column, never dropped.
 *
 * <p>The {@code users} layout query is {@link #usersQuery}: one scan, grouped by arm, counting users and
 * payers and summing log spend and its square over payers, with the observed statistics the predictive
 * checks need and the checks for bad values riding along.
 * ({@code ln} is guarded by CASE because the engine evaluates it even for rows a FILTER excludes.)
 */
public final class SpendDataReader {
    static final String ARM = "arm";
    static final String SPEND = "spend";
    static final String CONVERTED = "converted";
    static final String USERS = "users";
    static final String PAYERS = "payers";
    static final String LOG_SUM = "log_spend_sum";
    static final String LOG_SQ_SUM = "log_spend_sq_sum";
    private static final int SHOW_ROWS = 3;

    private SpendDataReader() {
    }

    /**
     * Reads the data of a spend spec.
     *
     * @param data    the spec's data part
     * @param baseDir folder that relative paths are resolved against (the spec's folder)
     * @param strict  whether warnings (duplicate user ids) are errors
     */
    public static SpendData read(DataSpec data, Path baseDir, boolean strict) {
        try (Connection db = DriverManager.getConnection("jdbc:duckdb:")) {
            try (Statement s = db.createStatement()) {
                s.execute("SET preserve_insertion_order = true");
            }
            Source source = data.rows() != null ? Source.inline(db, data) : Source.file(db, data, baseDir);
            return "summary".equals(data.layout()) ? summary(db, source, data) : users(db, source, data, strict);
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }

    // ----------------------------------------------------------------------------------------------------
    // users layout

    private static SpendData users(Connection db, Source source, DataSpec data, boolean strict) throws SQLException {
        String arm = source.require(data, ARM, ARM);
        String spend = source.optional(data, SPEND, SPEND);
        String converted = spend == null ? source.optional(data, CONVERTED, CONVERTED) : null;
        if (spend == null && converted == null) {
            throw new InputException(source.name + ": needs a spend column ('" + data.column(SPEND, SPEND)
                    + "', set data.columns.spend) or a 0/1 conversion column ('" + data.column(CONVERTED, CONVERTED)
                    + "', set data.columns.converted); columns found: " + String.join(", ", source.columns));
        }
        // Arms are grouped as written; only if some value carries surrounding blanks is the query run again
        // with trim(), so " B " and "B" count as one arm without paying for trim() on every row.
        List<ArmStats> arms = null;
        String query = null;
        long rows = 0;
        for (boolean trim : new boolean[] {false, true}) {
            String armExpr = trim ? "trim(CAST(" + Sql.identifier(arm) + " AS VARCHAR))"
                    : "CAST(" + Sql.identifier(arm) + " AS VARCHAR)";
            query = spend != null ? usersQuery(armExpr, Sql.identifier(spend), source.relation)
                    : conversionQuery(armExpr, Sql.identifier(converted), source.relation);
            arms = new ArrayList<>();
            rows = 0;
            boolean untrimmed = false;
            long missing = 0, emptyArms = 0, negative = 0;
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
                    untrimmed |= !name.equals(name.strip());
                    if (spend != null) {
                        double sum = r.getDouble("spend_sum");
                        double min = r.getDouble("spend_min");
                        double max = r.getDouble("spend_max");
                        notFinite |= r.getLong("present") > 0 && (!Double.isFinite(sum) || !Double.isFinite(max)
                                || !Double.isFinite(min));
                        negative += min < 0 ? 1 : 0;
                        double[] q = quantiles(r.getArray("payer_quantiles"));
                        arms.add(new ArmStats(name, users, r.getLong("payers"), r.getDouble("log_spend_sum"),
                                r.getDouble("log_spend_sq_sum"), sum, q[0], q[1], q[2], max));
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
            if (missing > 0) {
                throw source.bad(db, cast + " IS NULL", valueColumn, missing, "value is empty");
            }
            if (notFinite) {
                throw source.bad(db, "isnan(" + cast + ") OR isinf(" + cast + ")", valueColumn,
                        count(db, source, "isnan(" + cast + ") OR isinf(" + cast + ")"),
                        "spend must be a finite number (NaN or infinity found)");
            }
            if (negative > 0) {
                throw source.bad(db, cast + " < 0", valueColumn, count(db, source, cast + " < 0"),
                        "spend must be >= 0 (0 for users who did not pay)");
            }
            if (!untrimmed) {
                break;
            }
        }
        List<String> warnings = new ArrayList<>();
        String user = source.optionalMapped(data, "user");
        if (user != null) {
            long duplicates;
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(
                    "SELECT count(*) - count(DISTINCT " + Sql.identifier(user) + ") FROM " + source.relation)) {
                r.next();
                duplicates = r.getLong(1);
            }
            if (duplicates > 0) {
                String message = source.name + ", column '" + user + "': " + duplicates + " duplicate user id"
                        + (duplicates == 1 ? "" : "s") + " (each row is counted as one user)";
                if (strict) {
                    throw new InputException(message + "; refused because the spec is strict");
                }
                warnings.add(message);
            }
        }
        return new SpendData(arms, spend != null, source.name, rows, warnings, query);
    }

    /**
     * The users-layout query: one scan, per arm. Validation rides along: count(spend) below count(*) means
     * empty cells, a negative minimum means negative spend, a non-finite sum or extreme means NaN or infinity.
     */
    static String usersQuery(String armExpr, String spendColumn, String relation) {
        return """
                SELECT arm,
                       count(*) AS users,
                       count(spend) AS present,
                       count_if(spend > 0) AS payers,
                       sum(CASE WHEN spend > 0 THEN ln(spend) ELSE 0 END) AS log_spend_sum,
                       sum(CASE WHEN spend > 0 THEN ln(spend) ^ 2 ELSE 0 END) AS log_spend_sq_sum,
                       sum(spend) AS spend_sum,
                       min(spend) AS spend_min,
                       max(spend) AS spend_max,
                       quantile_disc(CASE WHEN spend > 0 THEN spend END, [0.5, 0.9, 0.99]) AS payer_quantiles
                FROM (SELECT %s AS arm, CAST(%s AS DOUBLE) AS spend FROM %s)
                GROUP BY arm ORDER BY arm""".formatted(armExpr, spendColumn, relation);
    }

    static String conversionQuery(String armExpr, String convertedColumn, String relation) {
        return """
                SELECT arm,
                       count(*) AS users,
                       count(converted) AS present,
                       count_if(converted) AS payers
                FROM (SELECT %s AS arm, CAST(%s AS BOOLEAN) AS converted FROM %s)
                GROUP BY arm ORDER BY arm""".formatted(armExpr, convertedColumn, relation);
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

    private static double[] quantiles(java.sql.Array array) throws SQLException {
        double[] out = {Double.NaN, Double.NaN, Double.NaN};
        if (array == null) {
            return out;
        }
        Object[] values = (Object[]) array.getArray();
        for (int i = 0; i < Math.min(3, values.length); i++) {
            out[i] = values[i] == null ? Double.NaN : ((Number) values[i]).doubleValue();
        }
        return out;
    }

    // ----------------------------------------------------------------------------------------------------
    // summary layout

    private static SpendData summary(Connection db, Source source, DataSpec data) throws SQLException {
        String arm = source.require(data, ARM, ARM);
        String users = source.require(data, USERS, USERS);
        String payers = source.require(data, PAYERS, PAYERS);
        String s1 = source.optional(data, "logSpendSum", LOG_SUM);
        String s2 = source.optional(data, "logSpendSqSum", LOG_SQ_SUM);
        if ((s1 == null) != (s2 == null)) {
            throw new InputException(source.name + ": give both '" + data.column("logSpendSum", LOG_SUM) + "' and '"
                    + data.column("logSpendSqSum", LOG_SQ_SUM) + "' for spend, or neither for conversions only");
        }
        boolean hasSpend = s1 != null;
        String armExpr = "trim(CAST(" + Sql.identifier(arm) + " AS VARCHAR))";
        // Counts are read as numbers and checked to be whole, so 100.5 users is refused rather than rounded.
        String n = "CAST(" + Sql.identifier(users) + " AS DOUBLE)";
        String m = "CAST(" + Sql.identifier(payers) + " AS DOUBLE)";
        String a = hasSpend ? "CAST(" + Sql.identifier(s1) + " AS DOUBLE)" : "0.0";
        String b = hasSpend ? "CAST(" + Sql.identifier(s2) + " AS DOUBLE)" : "0.0";
        // Row checks first: summary tables are small, and a bad row must be named, not summed away.
        String[][] rules = {
            {armExpr + " IS NULL OR " + armExpr + " = ''", arm, "arm is empty"},
            {n + " IS NULL OR " + m + " IS NULL", users + "/" + payers, "users and payers must be given"},
            {"isnan(" + n + ") OR isinf(" + n + ") OR " + n + " <> floor(" + n + ")", users,
                "users must be a whole number"},
            {"isnan(" + m + ") OR isinf(" + m + ") OR " + m + " <> floor(" + m + ")", payers,
                "payers must be a whole number"},
            {n + " < 0 OR " + m + " < 0", users + "/" + payers, "users and payers must be >= 0"},
            {m + " > " + n, payers, "payers must not exceed users"},
            {hasSpend ? "(" + m + " > 0 AND (" + a + " IS NULL OR " + b + " IS NULL))" : "false",
                data.column("logSpendSum", LOG_SUM), "log-spend sums are needed where payers > 0"},
            {hasSpend ? "isnan(" + a + ") OR isinf(" + a + ") OR isnan(" + b + ") OR isinf(" + b + ")" : "false",
                data.column("logSpendSum", LOG_SUM), "log-spend sums must be finite numbers"},
            {hasSpend ? "(" + m + " > 0 AND " + b + " < " + a + " * " + a + " / " + m + " - 1e-9 * abs(" + b + "))" : "false",
                data.column("logSpendSqSum", LOG_SQ_SUM),
                "log_spend_sq_sum is smaller than log_spend_sum^2 / payers, which no data can give"},
            {hasSpend ? "(" + m + " = 0 AND (coalesce(" + a + ", 0) <> 0 OR coalesce(" + b + ", 0) <> 0))" : "false",
                data.column("logSpendSum", LOG_SUM), "log-spend sums must be 0 where payers = 0"},
        };
        try {
            for (String[] rule : rules) {
                long count;
                try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(
                        "SELECT count(*) FROM " + source.relation + " WHERE " + rule[0])) {
                    r.next();
                    count = r.getLong(1);
                }
                if (count > 0) {
                    throw source.bad(db, rule[0], rule[1], count, rule[2]);
                }
            }
        } catch (SQLException e) {
            throw Sql.readError(source.name, e);
        }
        String query = """
                SELECT arm,
                       sum(users) AS users,
                       sum(payers) AS payers,
                       sum(log_spend_sum) AS log_spend_sum,
                       sum(log_spend_sq_sum) AS log_spend_sq_sum
                FROM (SELECT %s AS arm, CAST(%s AS BIGINT) AS users, CAST(%s AS BIGINT) AS payers,
                             coalesce(%s, 0.0) AS log_spend_sum,
                             coalesce(%s, 0.0) AS log_spend_sq_sum FROM %s)
                GROUP BY arm ORDER BY arm""".formatted(armExpr, n, m, a, b, source.relation);
        List<ArmStats> arms = new ArrayList<>();
        long rows = 0;
        try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(query)) {
            while (r.next()) {
                rows++;
                String name = r.getString("arm");
                arms.add(hasSpend
                        ? ArmStats.summary(name, r.getLong("users"), r.getLong("payers"), r.getDouble("log_spend_sum"),
                                r.getDouble("log_spend_sq_sum"))
                        : ArmStats.conversions(name, r.getLong("users"), r.getLong("payers")));
            }
        } catch (SQLException e) {
            throw Sql.readError(source.name, e);
        }
        if (rows == 0) {
            throw new InputException(source.name + ": no data rows" + (source.csv ? " after the header" : ""));
        }
        return new SpendData(arms, hasSpend, source.name, rows, List.of(), query);
    }

    // ----------------------------------------------------------------------------------------------------

    /** A relation the queries read from, with its column names and how to point at a bad row. */
    private static final class Source {
        final String name;
        final String relation;
        final List<String> columns;
        final boolean csv;
        final String rowsPointer; // for inline rows: "/data/rows"

        private Source(String name, String relation, List<String> columns, boolean csv, String rowsPointer) {
            this.name = name;
            this.relation = relation;
            this.columns = columns;
            this.csv = csv;
            this.rowsPointer = rowsPointer;
        }

        static Source file(Connection db, DataSpec data, Path baseDir) throws SQLException {
            Path file = baseDir.resolve(data.path()).normalize();
            String name = data.path();
            if (!Files.exists(file)) {
                throw new InputException(name + ": no such file (data.path, resolved to " + file + ")");
            }
            if (Files.isDirectory(file)) {
                throw new InputException(name + ": is a folder, expected a CSV or Parquet file (data.path)");
            }
            String lower = file.getFileName().toString().toLowerCase(Locale.ROOT);
            String quoted = Sql.literal(file.toString());
            if (lower.endsWith(".parquet") || lower.endsWith(".pq")) {
                List<String> columns = new ArrayList<>();
                try (Statement s = db.createStatement();
                     ResultSet r = s.executeQuery("DESCRIBE SELECT * FROM read_parquet(" + quoted + ")")) {
                    while (r.next()) {
                        columns.add(r.getString(1));
                    }
                } catch (SQLException e) {
                    throw new InputException(name + ": not a readable Parquet file: "
                            + e.getMessage().lines().findFirst().orElse(""));
                }
                return new Source(name, "read_parquet(" + quoted + ")", columns, false, null);
            }
            if (!lower.endsWith(".csv")) {
                throw new InputException(name + ": data.path must end in .csv or .parquet");
            }
            List<String> header = header(file, name);
            Map<String, String> types = new LinkedHashMap<>();
            for (String c : header) {
                types.put(c, typeOf(c, data));
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
            return new Source(name, relation, header, true, null);
        }

        /** The header line's column names (the engine reads the data; this only names the columns). */
        private static List<String> header(Path file, String name) {
            String line;
            try (BufferedReader r = new BufferedReader(new java.io.InputStreamReader(Files.newInputStream(file),
                    StandardCharsets.UTF_8.newDecoder()))) {
                line = r.readLine();
            } catch (CharacterCodingException e) {
                throw new InputException(name + ": not UTF-8 text");
            } catch (IOException e) {
                throw new InputException(name + ": cannot be read (" + e.getMessage() + ")");
            }
            if (line == null || line.isBlank()) {
                throw new InputException(name + ": empty file, expected a header line and data rows");
            }
            if (line.startsWith("\uFEFF")) {
                line = line.substring(1);
            }
            List<String> columns = new ArrayList<>();
            Set<String> seen = new LinkedHashSet<>();
            for (String cell : line.split(",", -1)) {
                String c = cell.trim();
                if (c.length() >= 2 && c.startsWith("\"") && c.endsWith("\"")) {
                    c = c.substring(1, c.length() - 1).replace("\"\"", "\"");
                }
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

        /** The engine type a CSV column is read as: numbers where the model needs numbers, text otherwise. */
        private static String typeOf(String column, DataSpec data) {
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

        /** Inline rows become a temporary table; each JSON value must have the type its column needs. */
        static Source inline(Connection db, DataSpec data) throws SQLException {
            List<JsonNode> rows = data.rows();
            List<String> columns = new ArrayList<>();
            for (JsonNode row : rows) {
                row.fieldNames().forEachRemaining(f -> {
                    if (!columns.contains(f)) {
                        columns.add(f);
                    }
                });
            }
            Map<String, String> types = new LinkedHashMap<>();
            for (String c : columns) {
                types.put(c, typeOf(c, data));
            }
            StringBuilder ddl = new StringBuilder("CREATE TEMP TABLE inline_rows (");
            StringBuilder marks = new StringBuilder();
            int k = 0;
            for (Map.Entry<String, String> e : types.entrySet()) {
                ddl.append(k == 0 ? "" : ", ").append(Sql.identifier(e.getKey())).append(' ').append(e.getValue());
                marks.append(k == 0 ? "?" : ", ?");
                k++;
            }
            ddl.append(", row_index BIGINT)");
            try (Statement s = db.createStatement()) {
                s.execute(ddl.toString());
            }
            try (PreparedStatement insert = db.prepareStatement("INSERT INTO inline_rows VALUES (" + marks + ", ?)")) {
                for (int i = 0; i < rows.size(); i++) {
                    JsonNode row = rows.get(i);
                    int j = 1;
                    for (Map.Entry<String, String> e : types.entrySet()) {
                        JsonNode v = row.get(e.getKey());
                        String where = "/data/rows/" + i + "/" + e.getKey();
                        if (v == null || v.isNull()) {
                            insert.setObject(j++, null);
                        } else if (e.getValue().equals("DOUBLE")) {
                            if (!v.isNumber()) {
                                throw new InputException("spec: " + where + ": expected a number, found " + v);
                            }
                            insert.setDouble(j++, v.doubleValue());
                        } else if (e.getValue().equals("BOOLEAN")) {
                            if (!(v.isBoolean() || (v.isIntegralNumber() && (v.intValue() == 0 || v.intValue() == 1)))) {
                                throw new InputException("spec: " + where + ": expected true/false or 1/0, found " + v);
                            }
                            insert.setBoolean(j++, v.isBoolean() ? v.booleanValue() : v.intValue() == 1);
                        } else {
                            if (!v.isValueNode()) {
                                throw new InputException("spec: " + where + ": expected a text or number, found " + v);
                            }
                            insert.setString(j++, v.asText());
                        }
                    }
                    insert.setLong(j, i);
                    insert.addBatch();
                }
                insert.executeBatch();
            }
            return new Source("inline rows", "inline_rows", columns, false, "/data/rows");
        }

        String require(DataSpec data, String logical, String defaultName) {
            String c = data.column(logical, defaultName);
            if (!columns.contains(c)) {
                throw new InputException(name + ": missing column '" + c + "'"
                        + (data.mapped(logical) ? " (data.columns." + logical + ")" : " (or set data.columns." + logical + ")")
                        + "; columns found: " + String.join(", ", columns));
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
                        + "); columns found: " + String.join(", ", columns));
            }
            return null;
        }

        String optionalMapped(DataSpec data, String logical) {
            return data.mapped(logical) ? optional(data, logical, logical) : null;
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
            try (Statement s = db.createStatement()) {
                s.execute("SET threads = 1"); // file order for row_number(); this path only runs on bad data
                try (ResultSet r = s.executeQuery(sql)) {
                    while (r.next()) {
                        long p = r.getLong(1);
                        where.add(rowsPointer != null ? rowsPointer + "/" + p : String.valueOf(csv ? p + 1 : p));
                    }
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
}
