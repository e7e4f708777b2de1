package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.models.spec.SpecReader;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Inline estimates are read without the SQL engine; files (and, here, the same rows) through it. Both must
 * give the same estimates to the bit, in the same order, and refuse the same rows with the same message.
 */
class InlineEstimatesParityTest {
    private static final String HEADER = "{\"model\": \"pooled-effects\", \"data\": {\"layout\": \"estimates\"%s, "
            + "\"rows\": [%s]}}";

    private static String row(Object name, Object estimate, Object se) {
        return "{\"name\": " + json(name) + ", \"estimate\": " + json(estimate) + ", \"se\": " + json(se) + "}";
    }

    private static String json(Object v) {
        return v instanceof String t ? "\"" + t + "\"" : String.valueOf(v);
    }

    private static String outcome(boolean engine, String columns, String rows) {
        DataSpec d = SpecReader.parse(HEADER.formatted(columns, rows), "case").data();
        try {
            Estimates e = engine ? EstimatesReader.throughEngine(d) : EstimatesReader.readInline(d);
            if (!engine) {
                assertNull(e.query(), "no query without the engine");
            }
            return List.of(e.names(), Arrays.toString(e.estimate()), Arrays.toString(e.se()), e.source())
                    .toString();
        } catch (InputException e) {
            return "refused: " + e.getMessage();
        }
    }

    @Test
    void validAndBrokenTablesGiveTheSameEstimatesOrTheSameMessage() {
        String a = row("north", 0.021, 0.008), b = row("south", -0.004, 0.011), c = row("east", 0.013, 0.0095);
        List<String[]> cases = new ArrayList<>();
        cases.add(new String[] {"", a + "," + b + "," + c});
        cases.add(new String[] {"", row(" west ", 0.5, 0.25) + "," + a});
        cases.add(new String[] {"", row(7, 0.5, 0.25) + "," + row(12.5, -0.5, 0.3)});
        cases.add(new String[] {"", a});
        cases.add(new String[] {"", a + "," + a});
        cases.add(new String[] {"", a + "," + row("", 0.1, 0.1)});
        cases.add(new String[] {"", a + "," + row(null, 0.1, 0.1)});
        cases.add(new String[] {"", a + "," + row("x", null, 0.1)});
        cases.add(new String[] {"", a + "," + row("x", 0.1, null)});
        cases.add(new String[] {"", a + "," + row("x", 0.1, 0)});
        cases.add(new String[] {"", a + "," + row("x", 0.1, -2)});
        cases.add(new String[] {"", a + "," + row("x", 1e101, 0.1)});
        cases.add(new String[] {"", a + "," + row("x", 0.1, 1e-101)});
        cases.add(new String[] {"", a + "," + row("x", "big", 0.1)});
        cases.add(new String[] {"", a + "," + row("x", 0.1, 0) + "," + row("y", 0.1, -1) + "," + row("z", 0.1, 0)
                + "," + row("w", 0.1, 0)});
        cases.add(new String[] {"", a + ",{\"name\": \"x\", \"estimate\": 0.1}"});
        cases.add(new String[] {"", a + ",{\"name\": \"x\", \"estimate\": 0.1, \"se\": 0.2, \"extra\": 3}"});
        cases.add(new String[] {", \"columns\": {\"name\": \"region\", \"se\": \"stderr\"}",
            "{\"region\": \"north\", \"estimate\": 0.02, \"stderr\": 0.01}, {\"region\": \"south\", \"estimate\": 0.01, "
                + "\"stderr\": 0.02}"});
        cases.add(new String[] {", \"columns\": {\"name\": \"region\"}", a + "," + b});
        List<String> differences = new ArrayList<>();
        int refused = 0;
        for (String[] k : cases) {
            String engine = outcome(true, k[0], k[1]);
            String memory = outcome(false, k[0], k[1]);
            refused += engine.startsWith("refused") ? 1 : 0;
            if (!engine.equals(memory)) {
                differences.add(k[1] + "\n  engine: " + engine + "\n  memory: " + memory);
            }
        }
        assertEquals(List.of(), differences);
        assertTrue(refused >= 12 && refused < cases.size(), "both kinds of case: " + refused + " refused");
    }
}
