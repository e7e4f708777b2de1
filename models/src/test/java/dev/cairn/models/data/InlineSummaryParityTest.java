package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.fail;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.models.spec.SpecReader;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Inline summary rows are read without the SQL engine; files (and, here, the same rows) through it. Both
 * must give the same statistics to the bit and refuse the same rows with the same message, on valid and
 * broken tables alike.
 */
class InlineSummaryParityTest {
    private static final String HEADER = "{\"model\": \"%s\", \"data\": {\"layout\": \"summary\"%s, \"rows\": [%s]}}";

    private static DataSpec data(String model, String columns, String rows) {
        return SpecReader.parse(HEADER.formatted(model, columns, rows), "case").data();
    }

    private static String row(Object arm, Object users, Object payers, Object s1, Object s2) {
        return "{\"arm\": " + json(arm) + ", \"users\": " + json(users) + ", \"payers\": " + json(payers)
                + (s1 == null && s2 == null ? "" : ", \"log_spend_sum\": " + json(s1) + ", \"log_spend_sq_sum\": " + json(s2)) + "}";
    }

    private static String json(Object v) {
        return v instanceof String t ? "\"" + t + "\"" : String.valueOf(v);
    }

    private static String outcome(boolean engine, String model, String columns, String rows) {
        DataSpec d = data(model, columns, rows);
        boolean segmented = model.equals("segmented-spend");
        try {
            SpendDataReader.Cells c = engine ? SpendDataReader.throughEngine(d, Path.of("."), false, segmented)
                    : SummaryLayout.readInline(d, segmented);
            if (!engine) {
                assertNull(c.query(), "no query without the engine");
            }
            return List.of(c.segments(), c.stats(), c.hasSpend(), c.source(), c.rows(), c.warnings()).toString();
        } catch (InputException e) {
            return "refused: " + e.getMessage();
        }
    }

    @Test
    void validAndBrokenTablesGiveTheSameCellsOrTheSameMessage() {
        String a = row("A", 1000, 30, 60.5, 160.2), b = row("B", 1000, 40, 82.0, 215.0);
        List<String[]> cases = new ArrayList<>();
        cases.add(new String[] {"spend", "", a + "," + b});
        cases.add(new String[] {"spend", "", a + "," + row(" B ", 500, 20, 41.3, 101.7) + "," + row("B", 700, 25, 52.1, 130.9)
                + "," + row("A", 300, 9, 17.77, 44.1)});
        cases.add(new String[] {"spend", "", row("A", 1000, 30, null, null) + "," + row("B", 1000, 40, null, null)});
        cases.add(new String[] {"spend", "", row(7, 1000, 30, 60.5, 160.2) + "," + row(12, 900, 0, 0, 0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", 10, 40, 82.0, 215.0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", 100.5, 40, 82.0, 215.0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", -3, 0, 0, 0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", 1000, null, 82.0, 215.0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", 1000, 40, null, 215.0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", 1000, 40, 82.0, 20.0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", 1000, 0, 3.0, 9.0)});
        cases.add(new String[] {"spend", "", a + "," + row("", 1000, 40, 82.0, 215.0)});
        cases.add(new String[] {"spend", "", a + "," + row("B", "ten", 40, 82.0, 215.0)});
        cases.add(new String[] {"spend", "", a + "," + "{\"arm\": \"B\", \"users\": 10, \"payers\": 1, \"revenue_sum\": 4}"});
        cases.add(new String[] {"spend", "", a + "," + "{\"arm\": \"B\", \"payers\": 1}"});
        cases.add(new String[] {"spend", "", a + "," + "{\"arm\": \"B\", \"users\": 10, \"payers\": 1, \"log_spend_sum\": 1}"});
        StringBuilder many = new StringBuilder(a);
        for (int i = 0; i < 5; i++) {
            many.append(',').append(row("B" + i, 10, 20, 1.0, 1.0));
        }
        cases.add(new String[] {"spend", "", many.toString()});
        cases.add(new String[] {"spend", ", \"columns\": {\"users\": \"installs\"}",
            "{\"arm\": \"A\", \"installs\": 100, \"payers\": 3, \"log_spend_sum\": 6.1, \"log_spend_sq_sum\": 14.2}"});
        StringBuilder segments = new StringBuilder();
        for (String seg : new String[] {"north", "south", "east"}) {
            for (String arm : new String[] {"A", "B"}) {
                segments.append(segments.length() == 0 ? "" : ",").append("{\"segment\": \"").append(seg).append("\", ")
                        .append(row(arm, 800 + seg.length(), 20 + arm.length(), 40.25 + seg.length(), 95.5 + seg.length()).substring(1));
            }
        }
        cases.add(new String[] {"segmented-spend", "", segments.toString()});
        cases.add(new String[] {"segmented-spend", "", segments + ",{\"segment\": \"north\", " + row("A", 10, 1, 2.0, 4.5).substring(1)});
        cases.add(new String[] {"segmented-spend", "", segments + ",{\"segment\": \"\", " + row("A", 10, 1, 2.0, 4.5).substring(1)});
        cases.add(new String[] {"segmented-spend", "", a});
        List<String> differences = new ArrayList<>();
        for (String[] c : cases) {
            String engine = outcome(true, c[0], c[1], c[2]);
            String memory = outcome(false, c[0], c[1], c[2]);
            if (!engine.equals(memory)) {
                differences.add(c[2] + "\n  engine: " + engine + "\n  memory: " + memory);
            }
        }
        if (!differences.isEmpty()) {
            fail(differences.size() + " of " + cases.size() + " cases differ:\n" + String.join("\n", differences));
        }
    }
}
