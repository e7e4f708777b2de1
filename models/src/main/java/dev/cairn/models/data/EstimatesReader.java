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
        DataFile file = data.rows() != null ? null : DataFile.of(data.path(), baseDir, "data.path");
        return DataFile.whole(() -> read(data, file), file);
    }

    private static Estimates read(DataSpec data, DataFile file) {
        try (Connection db = Engine.open(false, file)) {
            String nameCol = data.column("name", "name");
            String estimateCol = data.column("estimate", "estimate");
            String seCol = data.column("se", "se");
            java.util.function.Function<String, String> types =
                    c -> c.equals(estimateCol) || c.equals(seCol) ? "DOUBLE" : "VARCHAR";
            Source source = file == null ? Source.inline(db, data, types) : Source.file(db, file, types);
            String name = source.require(data, "name", "name");
            String estimate = source.require(data, "estimate", "estimate");
            String se = source.require(data, "se", "se");
            String n = "trim(CAST(" + Sql.identifier(name) + " AS VARCHAR))";
            String y = "CAST(" + Sql.identifier(estimate) + " AS DOUBLE)";
            String s = "CAST(" + Sql.identifier(se) + " AS DOUBLE)";
            String[][] rules = {
                {n + " IS NULL OR " + n + " = ''", name, "name is empty"},
                {y + " IS NULL OR isnan(" + y + ") OR isinf(" + y + ")", estimate, "estimate must be a finite number"},
                {s + " IS NULL OR isnan(" + s + ") OR isinf(" + s + ")", se, "se must be a finite number"},
                {s + " <= 0", se, "se must be > 0"},
                {"abs(" + y + ") > " + LARGEST + " OR " + s + " > " + LARGEST + " OR " + s + " < " + SMALLEST, estimate + "/" + se,
                    "estimates up to " + LARGEST + " in size and se from " + SMALLEST + " to " + LARGEST
                        + " are what the model represents (squares must stay finite); rescale the unit"},
            };
            source.check(db, rules);
            String query = "SELECT " + n + " AS name, " + y + " AS estimate, " + s + " AS se FROM " + source.relation;
            List<String> names = new ArrayList<>();
            List<double[]> values = new ArrayList<>();
            Set<String> seen = new HashSet<>();
            try (Statement st = db.createStatement(); ResultSet r = st.executeQuery(query)) {
                while (r.next()) {
                    String label = r.getString(1);
                    if (!seen.add(label)) {
                        throw new InputException(source.name + ", column '" + name + "': name '" + label
                                + "' appears twice; each effect needs its own name");
                    }
                    names.add(label);
                    values.add(new double[] {r.getDouble(2), r.getDouble(3)});
                }
            } catch (SQLException e) {
                throw Sql.readError(source.name, e);
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
            return new Estimates(names, ys, ses, source.name, source.shown(query));
        } catch (SQLException e) {
            throw new IllegalStateException("embedded SQL engine failed: " + e.getMessage(), e);
        }
    }
}
