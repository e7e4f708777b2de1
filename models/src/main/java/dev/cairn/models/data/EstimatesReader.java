package dev.cairn.models.data;

import dev.cairn.models.InputException;
import dev.cairn.models.Limits;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/** Reads the {@code estimates} layout: one effect per row with its standard error. */
final class EstimatesReader {
    /** Estimates and standard errors the normal model represents: their squares and ratios stay finite. */
    static final double LARGEST = 1e100, SMALLEST = 1e-100;

    private EstimatesReader() {
    }

    static Estimates read(DataSpec data, Path baseDir) {
        if (StatisticsEngine.external(data)) {
            return StatisticsEngine.fromRows(data, () -> readInline(data.withRows(StatisticsEngine.typed(
                    StatisticsEngine.named(data.engine()).rows(data, baseDir), types(data)))));
        }
        if (data.rows() != null) {
            return readInline(data);
        }
        DataFile file = DataFile.of(data.path(), baseDir, "data.path");
        return DataFile.whole(() -> read(data, file), file);
    }

    /** Inline rows through the SQL engine, as files are read (the parity test's other side). */
    static Estimates throughEngine(DataSpec data) {
        return read(data, (DataFile) null);
    }

    /** One row's values as the rules read them: the name trimmed of spaces, numbers as doubles, absent as null. */
    private record Row(String name, Double y, Double s) {
    }

    private static java.util.function.Function<String, String> types(DataSpec data) {
        String estimateCol = data.column("estimate", "estimate");
        String seCol = data.column("se", "se");
        return c -> c.equals(estimateCol) || c.equals(seCol) ? "DOUBLE" : "VARCHAR";
    }

    private static List<RowRule<Row>> rules(String name, String estimate, String se) {
        String n = "trim(CAST(" + Sql.identifier(name) + " AS VARCHAR))";
        String y = "CAST(" + Sql.identifier(estimate) + " AS DOUBLE)";
        String s = "CAST(" + Sql.identifier(se) + " AS DOUBLE)";
        return List.of(
            new RowRule<Row>(n + " IS NULL OR " + n + " = ''", r -> r.name() == null || r.name().isEmpty(), name,
                "name is empty"),
            new RowRule<Row>(y + " IS NULL OR isnan(" + y + ") OR isinf(" + y + ")",
                r -> r.y() == null || !Double.isFinite(r.y()), estimate, "estimate must be a finite number"),
            new RowRule<Row>(s + " IS NULL OR isnan(" + s + ") OR isinf(" + s + ")",
                r -> r.s() == null || !Double.isFinite(r.s()), se, "se must be a finite number"),
            new RowRule<Row>(s + " <= 0", r -> r.s() != null && r.s() <= 0, se, "se must be > 0"),
            new RowRule<Row>("abs(" + y + ") > " + LARGEST + " OR " + s + " > " + LARGEST + " OR " + s + " < " + SMALLEST,
                r -> (r.y() != null && Math.abs(r.y()) > LARGEST) || (r.s() != null && (r.s() > LARGEST || r.s() < SMALLEST)),
                estimate + "/" + se, "estimates up to " + LARGEST + " in size and se from " + SMALLEST + " to " + LARGEST
                    + " are what the model represents (squares must stay finite); rescale the unit"));
    }

    /**
     * The same layout from inline rows without the SQL engine: the same column checks, the same rules in the
     * same order with the same messages, the rows in the spec's order. There is no query to show.
     */
    static Estimates readInline(DataSpec data) {
        Source source = Source.inlineColumns(data, types(data));
        String name = source.require(data, "name", "name");
        String estimate = source.require(data, "estimate", "estimate");
        String se = source.require(data, "se", "se");
        List<Row> rows = new ArrayList<>(data.rows().size());
        for (com.fasterxml.jackson.databind.JsonNode r : data.rows()) {
            rows.add(new Row(RowRule.text(r.get(name)), RowRule.number(r.get(estimate)), RowRule.number(r.get(se))));
        }
        RowRule.checkInline(rows, rules(name, estimate, se));
        List<String> names = new ArrayList<>();
        List<double[]> values = new ArrayList<>();
        for (Row r : rows) {
            names.add(r.name());
            values.add(new double[] {r.y(), r.s()});
        }
        return estimates(source, name, names, values, null);
    }

    private static Estimates read(DataSpec data, DataFile file) {
        try (Connection db = Engine.open(false, file)) {
            java.util.function.Function<String, String> types = types(data);
            Source source = file == null ? Source.inline(db, data, types) : Source.file(db, file, types);
            String name = source.require(data, "name", "name");
            String estimate = source.require(data, "estimate", "estimate");
            String se = source.require(data, "se", "se");
            String n = "trim(CAST(" + Sql.identifier(name) + " AS VARCHAR))";
            String y = "CAST(" + Sql.identifier(estimate) + " AS DOUBLE)";
            String s = "CAST(" + Sql.identifier(se) + " AS DOUBLE)";
            source.check(db, RowRule.sqlForms(rules(name, estimate, se)));
            String query = "SELECT " + n + " AS name, " + y + " AS estimate, " + s + " AS se FROM " + source.relation;
            List<String> names = new ArrayList<>();
            List<double[]> values = new ArrayList<>();
            try (Statement st = db.createStatement(); ResultSet r = st.executeQuery(query)) {
                while (r.next()) {
                    names.add(r.getString(1));
                    values.add(new double[] {r.getDouble(2), r.getDouble(3)});
                }
            } catch (SQLException e) {
                throw Sql.readError(source.name, e);
            }
            return estimates(source, name, names, values, source.shown(query));
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }

    /** The estimates once the rows are read: names distinct, within the limits, at least two. */
    private static Estimates estimates(Source source, String name, List<String> names, List<double[]> values,
                                       String query) {
        Set<String> seen = new HashSet<>();
        for (String label : names) {
            if (!seen.add(label)) {
                throw new InputException(source.name + ", column '" + name + "': name '" + label
                        + "' appears twice; each effect needs its own name");
            }
        }
        Limits.names(source.name, "estimate", names, Limits.ESTIMATES, name);
        if (names.size() < 2) {
            throw new InputException(source.name + ": found " + names.size() + " estimate"
                    + (names.size() == 1 ? "" : "s") + "; pooling needs at least two");
        }
        double[] ys = new double[names.size()];
        double[] ses = new double[names.size()];
        for (int i = 0; i < ys.length; i++) {
            ys[i] = values.get(i)[0];
            ses[i] = values.get(i)[1];
        }
        return new Estimates(names, ys, ses, source.name, query);
    }
}
