package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.models.spec.SpecReader;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Per-user inline rows are read without the SQL engine; files (and, here, the same rows) through it. Both
 * must give the same statistics per cell (counts, sums, extremes and payer order statistics) and refuse the
 * same rows with the same message, on valid and broken tables alike.
 */
class InlineUsersParityTest {
    private static final String HEADER = "{\"model\": \"%s\"%s, \"data\": {\"layout\": \"users\"%s, \"rows\": [%s]}}";

    private static String outcome(boolean engine, String model, String extra, String data, String rows) {
        DataSpec d = SpecReader.parse(HEADER.formatted(model, extra, data, rows), "case").data();
        boolean segmented = model.equals("segmented-spend");
        boolean strict = extra.contains("\"strict\": true");
        try {
            SpendDataReader.Cells c = engine ? SpendDataReader.throughEngine(d, Path.of("."), strict, segmented)
                    : UsersInline.read(d, strict, segmented);
            if (!engine) {
                assertNull(c.query(), "no query without the engine");
            }
            return List.of(c.segments(), c.stats(), c.hasSpend(), c.source(), c.rows(), c.warnings()).toString();
        } catch (InputException e) {
            return "refused: " + e.getMessage();
        }
    }

    /** Users of a game: most spend nothing, payers' spend spread over orders of magnitude. */
    private static String users(int n, long seed, boolean segments, boolean ids) {
        SplittableRandom rng = new SplittableRandom(seed);
        StringBuilder out = new StringBuilder();
        for (int i = 0; i < n; i++) {
            double spend = rng.nextDouble() < 0.06 ? Math.round(Math.exp(1 + 1.3 * rng.nextGaussian()) * 100) / 100.0 : 0;
            out.append(i == 0 ? "" : ",").append("{\"arm\": \"").append((char) ('A' + rng.nextInt(3))).append('"')
                    .append(segments ? ", \"segment\": \"" + new String[] {"north", "south"}[rng.nextInt(2)] + "\"" : "")
                    .append(ids ? ", \"user\": \"u" + rng.nextInt(n) + "\"" : "")
                    .append(", \"spend\": ").append(spend).append('}');
        }
        return out.toString();
    }

    @Test
    void validAndBrokenTablesGiveTheSameCellsOrTheSameMessage() {
        String base = users(3000, 11, false, false);
        List<String[]> cases = new ArrayList<>();
        cases.add(new String[] {"spend", "", "", base});
        cases.add(new String[] {"spend", "", "", users(500, 12, false, false).replace("\"A\"", "\" A \"")});
        cases.add(new String[] {"segmented-spend", "", "", users(2000, 13, true, false)});
        cases.add(new String[] {"spend", "", ", \"columns\": {\"user\": \"user\"}", users(400, 14, false, true)});
        cases.add(new String[] {"spend", ", \"strict\": true", ", \"columns\": {\"user\": \"user\"}", users(400, 14, false, true)});
        cases.add(new String[] {"spend", "", "", "{\"arm\": \"A\", \"spend\": 0}, {\"arm\": \"B\", \"spend\": 0}"});
        cases.add(new String[] {"spend", "", "", "{\"arm\": \"A\", \"spend\": 2.5}, {\"arm\": \"B\", \"spend\": 1e14}"});
        cases.add(new String[] {"spend", "", "", "{\"arm\": 7, \"spend\": 1}, {\"arm\": 12.5, \"spend\": 0}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"arm\": \"\", \"spend\": 1}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"spend\": 1}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"arm\": \"A\", \"spend\": null}"});
        cases.add(new String[] {"spend", "", ", \"missingSpend\": \"zero\"", base + ",{\"arm\": \"A\", \"spend\": null},"
                + "{\"arm\": \"B\"}"});
        cases.add(new String[] {"spend", "", ", \"missingSpend\": \"zero\"", "{\"arm\": \"A\", \"spend\": null}, "
                + "{\"arm\": \"B\", \"spend\": null}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"arm\": \"A\", \"spend\": -1}, {\"arm\": \"B\", \"spend\": -2}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"arm\": \"A\", \"spend\": 1e16}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"arm\": \"A\", \"spend\": 1e-13}"});
        cases.add(new String[] {"spend", "", "", base + ",{\"arm\": \"A\", \"spend\": \"free\"}"});
        cases.add(new String[] {"spend", "", "", "{\"arm\": \"A\", \"converted\": true}, {\"arm\": \"A\", \"converted\": 0}, "
                + "{\"arm\": \"B\", \"converted\": 1}, {\"arm\": \"B\", \"converted\": false}"});
        cases.add(new String[] {"spend", "", "", "{\"arm\": \"A\", \"converted\": true}, {\"arm\": \"B\", \"converted\": null}"});
        cases.add(new String[] {"spend", "", "", "{\"arm\": \"A\", \"converted\": 2}"});
        cases.add(new String[] {"spend", "", "", "{\"arm\": \"A\", \"paid\": 2}"});
        cases.add(new String[] {"segmented-spend", "", "", users(300, 15, true, false) + ",{\"arm\": \"A\", \"segment\": \" \", "
                + "\"spend\": 0}"});
        List<String> differences = new ArrayList<>();
        int refused = 0;
        for (String[] k : cases) {
            String engine = outcome(true, k[0], k[1], k[2], k[3]);
            String memory = outcome(false, k[0], k[1], k[2], k[3]);
            refused += engine.startsWith("refused") ? 1 : 0;
            if (!engine.equals(memory)) {
                differences.add(k[3].substring(0, Math.min(200, k[3].length())) + "\n  engine: " + engine + "\n  memory: " + memory);
            }
        }
        assertEquals(List.of(), differences);
        assertTrue(refused >= 10 && refused < cases.size(), "both kinds of case: " + refused + " refused");
    }
}
