package dev.cairn.models.data;

import dev.cairn.models.InputException;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * The tables a spec names beside its data (past periods for priors, revenue per active day): read with the
 * same rules as the data — a literal file, typed columns, every listed column present, no empty cell, every
 * number finite — then handed to one query.
 */
public final class SideTable {
    private SideTable() {
    }

    /** Turns the query's rows into a value. */
    @FunctionalInterface
    public interface Rows<T> {
        T read(ResultSet rows) throws SQLException;
    }

    /**
     * @param written the path as the spec writes it
     * @param baseDir the spec's folder
     * @param field   the spec field naming the path, for messages
     * @param columns column name -> "DOUBLE" or "VARCHAR"; other columns in the file are ignored
     * @param query   the SQL, given the relation to read from
     * @param rows    what to make of the result
     * @return that value
     * @throws InputException naming the file, line and column for bad input
     */
    public static <T> T read(String written, Path baseDir, String field, Map<String, String> columns,
                             Function<String, String> query, Rows<T> rows) {
        DataFile file = DataFile.of(written, baseDir, field);
        return DataFile.whole(() -> read(file, written, field, columns, query, rows), file);
    }

    private static <T> T read(DataFile file, String written, String field, Map<String, String> columns,
                              Function<String, String> query, Rows<T> rows) {
        try (Connection db = Engine.open(false, file)) {
            Source source = Source.file(db, file, c -> columns.getOrDefault(c, "VARCHAR"));
            List<String> missing = new ArrayList<>();
            for (String c : columns.keySet()) {
                if (!source.columns.contains(c)) {
                    missing.add(c);
                }
            }
            if (!missing.isEmpty()) {
                throw new InputException(written + ": missing column" + (missing.size() > 1 ? "s " : " ")
                        + String.join(", ", missing) + " (" + field + "); columns found: "
                        + source.found());
            }
            List<String[]> rules = new ArrayList<>();
            for (Map.Entry<String, String> e : columns.entrySet()) {
                String id = Sql.identifier(e.getKey());
                rules.add(new String[] {id + " IS NULL", e.getKey(), "empty cell"});
                if (e.getValue().equals("DOUBLE")) {
                    rules.add(new String[] {"isnan(" + id + ") OR isinf(" + id + ")", e.getKey(), "must be a finite number"});
                }
            }
            source.check(db, rules.toArray(new String[0][]));
            try (Statement s = db.createStatement(); ResultSet r = s.executeQuery(query.apply(source.relation))) {
                return rows.read(r);
            } catch (SQLException e) {
                throw Sql.readError(written, e);
            }
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }
}
