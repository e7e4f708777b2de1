package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Raw activity rows aggregated into cohort-days statistics, against the same data counted by hand, on both
 * paths (a CSV file through the engine, inline rows in memory).
 */
class ActivityLayoutTest {
    @TempDir
    Path dir;

    /** user, arm, install, active: five users; 2026-03-02 is a Monday. */
    private static final String[][] ROWS = {
        {"u1", "A", "2026-03-02", "2026-03-02"}, {"u1", "A", "2026-03-02", "2026-03-03"}, {"u1", "A", "2026-03-02", "2026-03-05"},
        {"u2", "A", "2026-03-02", "2026-03-02"}, {"u2", "A", "2026-03-02", "2026-03-04"},
        {"u3", "B", "2026-03-02", "2026-03-02"}, {"u3", "B", "2026-03-02", "2026-03-03"}, {"u3", "B", "2026-03-02", "2026-03-04"},
        {"u4", "A", "2026-03-03", "2026-03-03"}, {"u4", "A", "2026-03-03", "2026-03-04"}, {"u4", "A", "2026-03-03", "2026-03-06"},
        {"u5", "B", "2026-03-04", "2026-03-04"},
        {"u1", "A", "2026-03-02", "2026-03-03"}, // the same user-day twice counts once
    };

    private DataSpec spec(boolean inline, String[][] rows, String period, String asOf) throws Exception {
        Map<String, String> columns = Map.of("user", "player", "arm", "variant", "installDate", "installed", "activeDate", "seen");
        if (!inline) {
            StringBuilder csv = new StringBuilder("player,variant,installed,seen\n");
            for (String[] r : rows) {
                csv.append(String.join(",", r)).append('\n');
            }
            Files.writeString(dir.resolve("activity.csv"), csv);
            return new DataSpec("activity.csv", "activity", columns, null, null, period, asOf);
        }
        List<JsonNode> json = new ArrayList<>();
        ObjectMapper m = new ObjectMapper();
        for (String[] r : rows) {
            json.add(m.readTree("{\"player\": \"%s\", \"variant\": \"%s\", \"installed\": \"%s\", \"seen\": \"%s\"}"
                    .formatted((Object[]) r)));
        }
        return new DataSpec(null, "activity", columns, json, null, period, asOf);
    }

    /** cohort -> arm -> [installs, day 1, day 2, ...] of the observed days. */
    private static Map<String, Map<String, List<Long>>> table(CohortDays d) {
        Map<String, Map<String, List<Long>>> out = new java.util.TreeMap<>();
        for (int c = 0; c < d.cohorts().size(); c++) {
            for (int k = 0; k < d.arms().size(); k++) {
                if (d.installs(c, k) == 0) {
                    continue;
                }
                List<Long> row = new ArrayList<>(List.of(d.installs(c, k)));
                row.addAll(d.observed(c, k).values());
                assertEquals(d.observed(c, k).size(), d.lastObservedDay(c, k), "days 1..age, none missing");
                out.computeIfAbsent(d.cohorts().get(c), x -> new java.util.TreeMap<>()).put(d.arms().get(k), row);
            }
        }
        return out;
    }

    @Test
    void dailyCohortsAsCountedByHand() throws Exception {
        // cut-off 03-06 (the latest active date): cohort 03-02 is 4 days old, 03-03 three, 03-04 two
        Map<String, Map<String, List<Long>>> activity = Map.of(
                "2026-03-02", Map.of("A", List.of(2L, 1L, 1L, 1L, 0L), "B", List.of(1L, 1L, 1L, 0L, 0L)),
                "2026-03-03", Map.of("A", List.of(1L, 1L, 0L, 1L)),
                "2026-03-04", Map.of("B", List.of(1L, 0L, 0L)));
        // still retained on day t: last active day t or later
        Map<String, Map<String, List<Long>>> survival = Map.of(
                "2026-03-02", Map.of("A", List.of(2L, 2L, 2L, 1L, 0L), "B", List.of(1L, 1L, 1L, 0L, 0L)),
                "2026-03-03", Map.of("A", List.of(1L, 1L, 1L, 1L)),
                "2026-03-04", Map.of("B", List.of(1L, 0L, 0L)));
        for (boolean inline : new boolean[] {false, true}) {
            assertEquals(activity, table(CohortDays.read(spec(inline, ROWS, null, null), dir, false)), "inline " + inline);
            assertEquals(survival, table(CohortDays.read(spec(inline, ROWS, null, null), dir, true)), "inline " + inline);
        }
    }

    @Test
    void weeklyCohortsAndAnEarlierCutOff() throws Exception {
        // one week cohort (Monday 03-02); A's youngest member installed 03-03, B's 03-04
        Map<String, Map<String, List<Long>>> weekly = Map.of(
                "2026-03-02", Map.of("A", List.of(3L, 2L, 1L, 2L), "B", List.of(2L, 1L, 1L)));
        // cut-off 03-04: later activity is not counted; cohort 03-04 is observed on no day yet
        Map<String, Map<String, List<Long>>> early = Map.of(
                "2026-03-02", Map.of("A", List.of(2L, 1L, 1L), "B", List.of(1L, 1L, 1L)),
                "2026-03-03", Map.of("A", List.of(1L, 1L)),
                "2026-03-04", Map.of("B", List.of(1L)));
        for (boolean inline : new boolean[] {false, true}) {
            assertEquals(weekly, table(CohortDays.read(spec(inline, ROWS, "week", null), dir, false)), "inline " + inline);
            assertEquals(early, table(CohortDays.read(spec(inline, ROWS, null, "2026-03-04"), dir, false)), "inline " + inline);
        }
    }

    private String refused(boolean inline, String[] bad) throws Exception {
        String[][] rows = java.util.Arrays.copyOf(ROWS, ROWS.length + 1);
        rows[ROWS.length] = bad;
        return assertThrows(InputException.class, () -> CohortDays.read(spec(inline, rows, null, null), dir, false)).getMessage();
    }

    @Test
    void badRowsAreRefusedWithTheirPlace() throws Exception {
        // the bad row is the 14th: line 15 of the file (after the header), /data/rows/13 inline
        String m = refused(false, new String[] {"u6", "A", "2026-03-05", "2026-03-04"});
        assertEquals("activity.csv: line 15, column 'seen': active before the install", m);
        m = refused(true, new String[] {"u6", "A", "2026-03-05", "2026-03-04"});
        assertEquals("spec: /data/rows/13, 'seen': active on 2026-03-04, before the install on 2026-03-05", m);
        m = refused(false, new String[] {"u6", "A", "2026-3-5", "2026-03-06"});
        assertEquals("activity.csv: line 15, column 'installed': not a date (YYYY-MM-DD)", m);
        m = refused(true, new String[] {"u6", "A", "yesterday", "2026-03-06"});
        assertEquals("spec: /data/rows/13, 'installed': 'yesterday' is not a date (YYYY-MM-DD)", m);
        m = refused(false, new String[] {"u1", "B", "2026-03-02", "2026-03-06"});
        assertEquals("activity.csv: lines 2, 3, 4 and 2 more, column 'variant': user u1 appears in two arms (every row "
                + "of a user must agree)", m);
        m = refused(true, new String[] {"u1", "B", "2026-03-02", "2026-03-06"});
        assertEquals("spec: /data/rows/13, 'variant': user u1 is in arm B here but in arm A on row 0", m);
        m = refused(true, new String[] {"u1", "A", "2026-03-01", "2026-03-06"});
        assertEquals("spec: /data/rows/13, 'installed': user u1 installed on 2026-03-01 here but on 2026-03-02 on row 0", m);
    }
}
