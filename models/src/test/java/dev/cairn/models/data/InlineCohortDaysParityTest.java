package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.models.spec.SpecReader;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Inline cohort tables are read without the SQL engine; files (and, here, the same rows) through it. Both
 * must give the same cohorts, arms and counts, and refuse the same rows with the same message.
 */
class InlineCohortDaysParityTest {
    private static final String HEADER = "{\"model\": \"retention\", \"curve\": \"activity\", \"data\": {\"layout\": \"cohort-days\"%s, "
            + "\"rows\": [%s]}}";

    private static String row(Object cohort, Object arm, Object day, Object installs, Object active) {
        return "{\"cohort\": " + json(cohort) + (arm == null ? "" : ", \"arm\": " + json(arm)) + ", \"day\": " + json(day)
                + ", \"installs\": " + json(installs) + ", \"active\": " + json(active) + "}";
    }

    private static String json(Object v) {
        return v instanceof String t ? "\"" + t + "\"" : String.valueOf(v);
    }

    private static String outcome(boolean engine, String columns, String rows, boolean survival) {
        DataSpec d = SpecReader.parse(HEADER.formatted(columns, rows), "case").data();
        try {
            CohortDays c = engine ? CohortDays.throughEngine(d, survival) : CohortDays.readInline(d, survival);
            return List.of(c.cohorts(), c.arms(), Arrays.deepToString(c.installs()), c.active(), c.source(), c.rows())
                    .toString();
        } catch (InputException e) {
            return "refused: " + e.getMessage();
        }
    }

    private static String table(Object arm) {
        StringBuilder t = new StringBuilder();
        for (String cohort : new String[] {"2026-01-05", "2026-01-12", "2026-01-19"}) {
            int installs = 1000 + cohort.charAt(9) * 7;
            for (int day : new int[] {0, 1, 3, 7, 14}) {
                if (cohort.endsWith("19") && day > 7) {
                    continue; // a young cohort, censored
                }
                t.append(t.length() == 0 ? "" : ",").append(row(cohort, arm, day, installs,
                        day == 0 ? installs : installs * 40 / (40 + day * 3)));
            }
        }
        return t.toString();
    }

    @Test
    void validAndBrokenTablesGiveTheSameCountsOrTheSameMessage() {
        String ok = table(null);
        String two = table("A") + "," + table("B").replace("1000", "999");
        List<Object[]> cases = new ArrayList<>();
        cases.add(new Object[] {"", ok, false});
        cases.add(new Object[] {"", ok, true});
        cases.add(new Object[] {"", two, false});
        cases.add(new Object[] {"", row(" 2026-02-02 ", " A ", 1, 10, 4) + "," + row(20260209, 7, 1.0, 12, 5), false});
        cases.add(new Object[] {"", ok + "," + row("", null, 1, 10, 3), false});
        cases.add(new Object[] {"", two + "," + row("2026-02-02", "", 1, 10, 3), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, -1, 10, 3), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1.5, 10, 3), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 4000, 10, 3), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, 0, 0), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, 10, 11), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, 10, null), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, 10, 3) + "," + row("x", null, 2, 11, 3), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, 10, 3) + "," + row("x", null, 1, 10, 4), false});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, 10, 3) + "," + row("x", null, 2, 10, 5), true});
        cases.add(new Object[] {"", ok + "," + row("x", null, 1, "ten", 3), false});
        cases.add(new Object[] {"", "{\"cohort\": \"x\", \"day\": 1, \"installs\": 10}", false});
        cases.add(new Object[] {", \"columns\": {\"cohort\": \"week\", \"active\": \"retained\"}",
            "{\"week\": \"w1\", \"day\": 1, \"installs\": 50, \"retained\": 20}, {\"week\": \"w1\", \"day\": 2, "
                + "\"installs\": 50, \"retained\": 15}", true});
        List<String> differences = new ArrayList<>();
        int refused = 0;
        for (Object[] k : cases) {
            String engine = outcome(true, (String) k[0], (String) k[1], (Boolean) k[2]);
            String memory = outcome(false, (String) k[0], (String) k[1], (Boolean) k[2]);
            refused += engine.startsWith("refused") ? 1 : 0;
            if (!engine.equals(memory)) {
                differences.add(k[1] + "\n  engine: " + engine + "\n  memory: " + memory);
            }
        }
        assertEquals(List.of(), differences);
        assertTrue(refused >= 10 && refused < cases.size(), "both kinds of case: " + refused + " refused");
    }
}
