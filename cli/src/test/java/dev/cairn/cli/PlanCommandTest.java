package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code cairn plan}: files, summary first, bad input, a baseline from a previous fit, same bytes on any thread count. */
class PlanCommandTest {
    @TempDir
    Path dir;

    private static final String PLAN = """
        {"title": "Next test", "currency": "EUR",
         "arms": {"A": {}, "B": {"arppuLift": 0.05}, "C": {"payerRateLift": {"family": "normal", "mean": 0, "sd": 0.03}}},
         "control": "A", "usersPerDay": 3000,
         "baseline": %s,
         "schedule": {"minDays": 5, "maxDays": 14, "lookEvery": 3}, "simulation": {"experiments": 400, "seed": 4}}
        """;
    private static final String FIXED = "{\"payerRate\": 0.03, \"logSpendMean\": 1.0, \"logSpendSd\": 1.3}";

    private Path write(String name, String text) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, text);
        return p;
    }

    @Test
    void writesPlanJsonCsvAndReportAndPrintsTheSummaryFirst() throws IOException {
        Path out = dir.resolve("out");
        String[] r = MainTest.run("plan", write("plan.json", PLAN.formatted(FIXED)).toString(), "--out", out.toString(),
                "--threads", "2");
        assertEquals("0", r[0], r[2]);
        assertTrue(r[1].startsWith("Next test\n400 simulated tests of 3 arms (control A) on ARPU."), r[1]);
        assertTrue(r[1].indexOf("At the stop") < r[1].indexOf("Analysed once on a fixed day"), r[1]);
        assertTrue(r[1].contains("assurance") && r[1].contains("not financial or legal advice"), r[1]);
        JsonNode json = new ObjectMapper().readTree(out.resolve("plan.json").toFile());
        for (String key : List.of("kind", "settings", "assumptions", "atStop", "days", "warnings", "cautions", "run")) {
            assertTrue(json.has(key), key);
        }
        assertEquals(List.of(5, 8, 11, 14), new ObjectMapper().convertValue(json.get("settings").get("lookDays"), List.class));
        List<String> csv = Files.readAllLines(out.resolve("plan.csv"));
        assertEquals(String.join(",", dev.cairn.models.plan.PlanFiles.COLUMNS), csv.get(0));
        assertEquals(5, csv.size());
        assertTrue(csv.get(4).startsWith("14,"));
        String html = Files.readString(out.resolve("report.html"));
        assertTrue(html.contains("<svg") && html.contains("At the stop") && html.contains("Every look day"));
    }

    @Test
    void sameBytesOnAnyThreadCount() throws IOException {
        Path spec = write("plan.json", PLAN.formatted(FIXED));
        String[] one = MainTest.run("plan", spec.toString(), "--json", "--threads", "1");
        String[] three = MainTest.run("plan", spec.toString(), "--json", "--threads", "3");
        ObjectMapper m = new ObjectMapper();
        JsonNode a = m.readTree(one[1]), b = m.readTree(three[1]);
        ((com.fasterxml.jackson.databind.node.ObjectNode) a).remove("run");
        ((com.fasterxml.jackson.databind.node.ObjectNode) b).remove("run");
        assertEquals(m.writeValueAsString(a), m.writeValueAsString(b));
    }

    @Test
    void badPlanExitsTwoWithOneLineAndWritesNothing() throws IOException {
        Path out = dir.resolve("out");
        String[] r = MainTest.run("plan", write("plan.json", PLAN.formatted(FIXED).replace("\"control\": \"A\"",
                "\"control\": \"Q\"")).toString(), "--out", out.toString());
        assertEquals("2", r[0]);
        assertEquals("cairn plan: " + dir.resolve("plan.json") + ": /control: 'Q' is not one of the arms [A, B, C]\n", r[2]);
        assertFalse(Files.exists(out));
    }

    @Test
    void baselineFromAPreviousFit() throws IOException {
        Path spec = write("spec.json", """
            {"model": "spend", "control": "A",
             "data": {"layout": "summary", "rows": [
               {"arm": "A", "users": 20000, "payers": 610, "log_spend_sum": 620.0, "log_spend_sq_sum": 1650.0},
               {"arm": "B", "users": 20000, "payers": 640, "log_spend_sum": 660.0, "log_spend_sq_sum": 1760.0}]},
             "sampler": {"seed": 2}}
            """);
        String[] fit = MainTest.run("fit", spec.toString(), "--out", dir.resolve("first").toString(), "--quiet");
        assertEquals("0", fit[0], fit[2]);
        Path out = dir.resolve("planned");
        String[] r = MainTest.run("plan", write("plan.json", PLAN.formatted("{\"fromResult\": {\"path\": \"first/result.json\"}}"))
                .toString(), "--out", out.toString(), "--quiet");
        assertEquals("0", r[0], r[2]);
        JsonNode baseline = new ObjectMapper().readTree(out.resolve("plan.json").toFile()).get("assumptions").get("baseline");
        assertEquals("result", baseline.get("source").asText());
        assertEquals(610.0 / 20000, baseline.get("payerRate").asDouble(), 0.002, "the posterior of A's payer rate");
        assertTrue(baseline.get("note").asText().contains("arm 'A' in first/result.json"), baseline.toString());
    }

    @Test
    void schemaOfThePlan() {
        String[] r = MainTest.run("schema", "--plan");
        assertEquals("0", r[0]);
        assertTrue(r[1].contains("\"$id\" : \"https://cairn.dev/schema/plan-v1.json\"")
                || r[1].contains("\"$id\": \"https://cairn.dev/schema/plan-v1.json\""), r[1].substring(0, 200));
    }
}
