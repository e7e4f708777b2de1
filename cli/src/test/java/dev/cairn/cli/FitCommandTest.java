package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

class FitCommandTest {
    @TempDir
    Path dir;

    private Path spec(String sampler) throws IOException {
        Path p = dir.resolve("spec.json");
        Files.writeString(p, """
                {"model": "spend",
                 "data": {"layout": "summary", "rows": [
                   {"arm": "A", "users": 5000, "payers": 150, "log_spend_sum": 225.0, "log_spend_sq_sum": 520.0},
                   {"arm": "B", "users": 5000, "payers": 170, "log_spend_sum": 260.0, "log_spend_sq_sum": 600.0}]},
                 "priors": {"logSpendMean": {"family": "normal", "mean": 0, "sd": 5},
                            "logSpendSd": {"family": "half-normal", "sd": 2}},
                 "sampler": %s}
                """.formatted(sampler));
        return p;
    }

    @Test
    void convergedFitWritesBothFilesAndExitsZero() throws IOException {
        Path out = dir.resolve("out");
        String[] r = MainTest.run("fit", spec("{\"method\": \"slice\", \"seed\": 3}").toString(), "--out", out.toString());
        assertEquals("0", r[0], r[2]);
        JsonNode json = new ObjectMapper().readTree(out.resolve("result.json").toFile());
        assertTrue(json.get("converged").asBoolean());
        for (String key : new String[] {"model", "arms", "comparisons", "probBest", "checks", "diagnostics", "run"}) {
            assertTrue(json.has(key), key);
        }
        JsonNode arpu = json.get("arms").get("B").get("arpu");
        for (String key : new String[] {"mean", "sd", "lo", "median", "hi"}) {
            assertTrue(arpu.get(key).isNumber(), key);
        }
        JsonNode c = json.get("comparisons").get(0);
        for (String key : new String[] {"arm", "control", "metric", "lift", "difference", "probAbove", "expectedLoss"}) {
            assertTrue(c.has(key), key);
        }
        assertTrue(Files.readString(out.resolve("draws.csv")).startsWith("chain,iteration,payerRate[A],"));
        assertTrue(r[1].contains("ARPU") && r[1].contains("not financial or legal advice"), r[1]);
        assertEquals("", r[2]);
    }

    @Test
    void notConvergedIsWrittenButFlaggedWithExitThree() throws IOException {
        Path out = dir.resolve("out");
        String[] r = MainTest.run("fit", spec("{\"method\": \"metropolis-within-gibbs\", \"warmup\": 0, \"draws\": 40}").toString(),
                "--out", out.toString());
        assertEquals("3", r[0], r[2]);
        JsonNode json = new ObjectMapper().readTree(out.resolve("result.json").toFile());
        assertFalse(json.get("converged").asBoolean());
        assertTrue(json.get("diagnostics").get("reasons").size() > 0);
        assertTrue(r[1].contains("NOT CONVERGED"), r[1]);
    }

    static Stream<String> corpus() throws IOException {
        try (Stream<Path> s = Files.list(Path.of("..", "fixtures", "bad"))) {
            return s.filter(Files::isDirectory).map(p -> p.getFileName().toString()).sorted().toList().stream();
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("corpus")
    void badInputExitsTwoWithOneLineAndWritesNothing(String name) throws IOException {
        Path caseDir = Path.of("..", "fixtures", "bad", name);
        Path out = dir.resolve("never");
        String[] r = MainTest.run("fit", caseDir.resolve("spec.json").toString(), "--out", out.toString());
        assertEquals("2", r[0], r[2]);
        assertEquals("", r[1]);
        assertEquals(1, r[2].strip().lines().count(), r[2]);
        assertTrue(r[2].contains(Files.readString(caseDir.resolve("expected.txt")).strip()), r[2]);
        assertFalse(Files.exists(out), "nothing written");
        try (Stream<Path> s = Files.list(dir)) {
            assertEquals(0, s.filter(p -> p.getFileName().toString().startsWith(".never")).count(), "no claim left");
        }
    }

    /** A refused refit leaves the previous results whole; a folder with the user's own files is not taken. */
    @Test
    void previousResultsSurviveARefusedRunAndForeignFoldersAreNotTaken() throws IOException {
        Path out = dir.resolve("out");
        assertEquals("0", MainTest.run("fit", spec("{\"method\": \"slice\", \"seed\": 3}").toString(), "--out", out.toString())[0]);
        String before = Files.readString(out.resolve("result.json"));
        Path bad = Path.of("..", "fixtures", "bad", "negative-spend", "spec.json");
        assertEquals("2", MainTest.run("fit", bad.toString(), "--out", out.toString())[0]);
        assertEquals(before, Files.readString(out.resolve("result.json")));
        assertTrue(Files.exists(out.resolve("draws.csv")) && Files.exists(out.resolve("report.html")));
        Path mine = dir.resolve("mine");
        Files.createDirectories(mine);
        Files.writeString(mine.resolve("notes.txt"), "mine");
        String[] r = MainTest.run("fit", spec("{\"method\": \"slice\", \"seed\": 3}").toString(), "--out", mine.toString());
        assertEquals("2", r[0]);
        assertTrue(r[2].contains("holds files cairn did not write (notes.txt)"), r[2]);
        assertFalse(Files.exists(mine.resolve("result.json")));
    }

    @Test
    void schemaIsDraft202012Json() throws IOException {
        String[] r = MainTest.run("schema");
        assertEquals("0", r[0]);
        JsonNode schema = new ObjectMapper().readTree(r[1]);
        assertEquals("https://json-schema.org/draft/2020-12/schema", schema.get("$schema").asText());
        assertFalse(schema.get("additionalProperties").asBoolean());
    }
}
