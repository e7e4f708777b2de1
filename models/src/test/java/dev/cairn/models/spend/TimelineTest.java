package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.InputException;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.TimelineDay;
import dev.cairn.models.spec.SpecReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The timeline of a running test from data.columns.time: per period, the evidence so far and the decision then. */
class TimelineTest {
    @TempDir
    Path dir;

    /** Users over 6 days, two arms, B's spend 30% higher; rows as {day, arm, spend}. */
    private static List<Object[]> users() {
        SplittableRandom rng = new SplittableRandom(4);
        List<Object[]> rows = new ArrayList<>();
        for (int day = 1; day <= 6; day++) {
            for (int i = 0; i < 700; i++) {
                String arm = i % 2 == 0 ? "A" : "B";
                double spend = rng.nextDouble() < 0.05 ? Math.exp(1 + (arm.equals("B") ? Math.log(1.3) : 0) + rng.nextGaussian()) : 0;
                rows.add(new Object[] {String.format(Locale.ROOT, "2026-10-%02d", day), arm, spend});
            }
        }
        return rows;
    }

    private Result fit(String data) {
        String spec = """
            {"model": "spend", "control": "A", "data": %s, "sampler": {"seed": 5}}
            """.formatted(data);
        return (Result) Cairn.fit(SpecReader.parse(spec, "spec.json"), dir, FitOptions.DEFAULT).result();
    }

    @Test
    void usersFromAFileAndInlineGiveOneTimelineEndingOnTheFitsTotals() throws Exception {
        StringBuilder csv = new StringBuilder("joined,variant,spend\n");
        StringBuilder inline = new StringBuilder();
        for (Object[] r : users()) {
            csv.append(r[0]).append(',').append(r[1]).append(',').append(r[2]).append('\n');
            inline.append(inline.length() == 0 ? "" : ",").append(String.format(Locale.ROOT,
                    "{\"joined\": \"%s\", \"variant\": \"%s\", \"spend\": %s}", r[0], r[1], r[2]));
        }
        Files.writeString(dir.resolve("users.csv"), csv);
        Result fromFile = fit("{\"path\": \"users.csv\", \"layout\": \"users\", \"columns\": {\"arm\": \"variant\", \"time\": \"joined\"}}");
        Result fromRows = fit("{\"rows\": [" + inline + "], \"layout\": \"users\", \"columns\": {\"arm\": \"variant\", \"time\": \"joined\"}}");
        assertEquals(ResultWriter.jsonOf(fromFile.timeline()), ResultWriter.jsonOf(fromRows.timeline()));
        List<TimelineDay> t = fromFile.timeline();
        assertEquals(6, t.size());
        assertEquals("2026-10-01", t.get(0).time());
        assertEquals(350L, t.get(0).users().get("A"));
        TimelineDay last = t.get(5);
        assertEquals("2026-10-06", last.time());
        assertEquals(fromFile.arms().get("B").users(), last.users().get("B"));
        assertEquals(fromFile.arms().get("B").payers(), last.payers().get("B"));
        for (int i = 1; i < t.size(); i++) {
            assertTrue(t.get(i).users().get("A") > t.get(i - 1).users().get("A"));
        }
        // the last period holds all the data: its figures are the fit's, up to Monte Carlo error of separate draws
        assertEquals(fromFile.probBest().get("arpu").get("B"), last.probBest().get("B"), 0.03);
        assertEquals(fromFile.decision().arms().get(0).expectedLoss(), last.expectedLoss().get("A"),
                0.1 * fromFile.decision().arms().get(0).expectedLoss() + 1e-4);
        assertEquals(fromFile.comparisons().get(0).lift().median(), last.lift().get("B").median(), 0.02);
        // the interval narrows as data arrive
        double first = t.get(0).lift().get("B").hi() - t.get(0).lift().get("B").lo();
        double end = last.lift().get("B").hi() - last.lift().get("B").lo();
        assertTrue(end < first, first + " -> " + end);
    }

    @Test
    void summaryRowsWithADayColumn() {
        String rows = """
            [{"arm": "A", "day": 1, "users": 1000, "payers": 30, "log_spend_sum": 31.0, "log_spend_sq_sum": 80.0},
             {"arm": "B", "day": 1, "users": 1000, "payers": 36, "log_spend_sum": 40.0, "log_spend_sq_sum": 101.0},
             {"arm": "A", "day": 2, "users": 1200, "payers": 37, "log_spend_sum": 36.0, "log_spend_sq_sum": 95.0},
             {"arm": "B", "day": 2, "users": 1100, "payers": 40, "log_spend_sum": 45.0, "log_spend_sq_sum": 112.0},
             {"arm": "A", "day": 10, "users": 900, "payers": 25, "log_spend_sum": 27.0, "log_spend_sq_sum": 70.0}]
            """;
        Result r = fit("{\"rows\": " + rows + ", \"layout\": \"summary\", \"columns\": {\"time\": \"day\"}}");
        List<TimelineDay> t = r.timeline();
        assertEquals(List.of(1L, 2L, 10L), t.stream().map(TimelineDay::time).toList(), "day numbers in numeric order");
        assertEquals(3100L, t.get(2).users().get("A"));
        assertEquals(2100L, t.get(2).users().get("B"), "B has no row on day 10: its sums carry over");
        assertEquals(r.arms().get("A").payers(), t.get(2).payers().get("A"));
    }

    @Test
    void noPayersYetUnderTheDefaultPriorIsNoDecision() {
        String rows = """
            [{"arm": "A", "day": 1, "spend": 0}, {"arm": "B", "day": 1, "spend": 3.0},
             {"arm": "A", "day": 2, "spend": 2.0}, {"arm": "B", "day": 2, "spend": 0}]
            """;
        Result r = fit("{\"rows\": " + rows + ", \"layout\": \"users\", \"columns\": {\"time\": \"day\"}}");
        assertEquals("no-decision", r.timeline().get(0).outcome());
        assertNull(r.timeline().get(0).lift());
        assertTrue(List.of("ship", "keep-control", "keep-collecting").contains(r.timeline().get(1).outcome()));
    }

    @Test
    void badTimesAreRefusedWithTheRow() {
        String missing = "[{\"arm\": \"A\", \"day\": 1, \"spend\": 2.0}, {\"arm\": \"B\", \"spend\": 1.0}]";
        InputException e = assertThrows(InputException.class,
                () -> fit("{\"rows\": " + missing + ", \"layout\": \"users\", \"columns\": {\"time\": \"day\"}}"));
        assertEquals("spec: /data/rows/1, 'day': no time; with data.columns.time every row needs a date (YYYY-MM-DD) "
                + "or a day number", e.getMessage());
        String mixed = "[{\"arm\": \"A\", \"day\": 1, \"spend\": 2.0}, {\"arm\": \"B\", \"day\": \"2026-01-01\", \"spend\": 1.0}]";
        e = assertThrows(InputException.class,
                () -> fit("{\"rows\": " + mixed + ", \"layout\": \"users\", \"columns\": {\"time\": \"day\"}}"));
        assertTrue(e.getMessage().contains("mixes dates and day numbers"), e.getMessage());
        e = assertThrows(InputException.class, () -> SpecReader.parse("""
            {"model": "pooled-effects", "data": {"layout": "estimates", "columns": {"time": "t"},
             "rows": [{"name": "x", "estimate": 1, "se": 1}]}}
            """, "spec.json"));
        assertTrue(e.getMessage().startsWith("spec.json: /data/columns/time: a timeline applies to model 'spend'"), e.getMessage());
    }
}
