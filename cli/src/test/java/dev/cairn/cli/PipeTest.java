package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * cairn driven the way a Python or R program drives it: a separate process, the spec written to its standard
 * input, result.json read from its standard output, the exit code and one line of standard error on failure.
 */
class PipeTest {
    private static final String SPEC = """
            {"model": "spend", "currency": "EUR", "title": "Récif: deux offres",
             "data": {"layout": "summary", "rows": [
               {"arm": "A", "users": 1000, "payers": 30, "log_spend_sum": 60.5, "log_spend_sq_sum": 160.2},
               {"arm": "B", "users": 1000, "payers": 40, "log_spend_sum": 82.0, "log_spend_sq_sum": 215.0}]}}
            """;

    @TempDir
    Path dir;

    record Run(int code, String stdout, String stderr) {
    }

    private Run cairn(String stdin, String... args) throws IOException, InterruptedException {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        List<String> command = new java.util.ArrayList<>(List.of(java, "-Xmx512m", "-cp",
                System.getProperty("java.class.path"), "dev.cairn.cli.Main"));
        command.addAll(List.of(args));
        Process p = new ProcessBuilder(command).directory(dir.toFile())
                .redirectOutput(dir.resolve("stdout").toFile()).redirectError(dir.resolve("stderr").toFile()).start();
        try (OutputStream in = p.getOutputStream()) {
            in.write(stdin.getBytes(StandardCharsets.UTF_8));
        }
        assertTrue(p.waitFor(120, TimeUnit.SECONDS), "finished");
        return new Run(p.exitValue(), Files.readString(dir.resolve("stdout"), StandardCharsets.UTF_8),
                Files.readString(dir.resolve("stderr"), StandardCharsets.UTF_8));
    }

    @Test
    void aSpecPipedInGivesResultJsonOnStandardOutput() throws Exception {
        Run r = cairn(SPEC, "fit", "-", "--json");
        assertEquals(0, r.code(), r.stderr());
        assertTrue(r.stdout().chars().allMatch(c -> c < 128), "ASCII only: any reader's encoding works");
        JsonNode result = new ObjectMapper().readTree(r.stdout());
        assertTrue(result.get("converged").asBoolean());
        assertEquals("Récif: deux offres", result.get("title").asText(), "non-ASCII text survives as escapes");
        assertTrue(result.has("decision") && result.has("arms") && result.has("diagnostics"));
        try (var files = Files.list(dir)) {
            assertEquals(List.of("stderr", "stdout"), files.map(f -> f.getFileName().toString()).sorted().toList(),
                    "no files without --out");
        }
    }

    @Test
    void withOutTheFilesAreWrittenToo() throws Exception {
        Run r = cairn(SPEC, "fit", "-", "--json", "--out", "res", "--quiet");
        assertEquals(0, r.code(), r.stderr());
        JsonNode piped = new ObjectMapper().readTree(r.stdout());
        JsonNode file = new ObjectMapper().readTree(dir.resolve("res/result.json").toFile());
        ((com.fasterxml.jackson.databind.node.ObjectNode) piped.get("run")).remove("seconds");
        ((com.fasterxml.jackson.databind.node.ObjectNode) file.get("run")).remove("seconds");
        assertEquals(file, piped, "the same result on standard output and in the file");
        assertTrue(Files.exists(dir.resolve("res/draws.csv")) && Files.exists(dir.resolve("res/report.html")));
    }

    @Test
    void badInputIsOneLineOnStandardErrorAndExitTwo() throws Exception {
        Run r = cairn(SPEC.replace("\"payers\": 30", "\"payers\": 3000"), "fit", "-", "--json");
        assertEquals(2, r.code());
        assertEquals("", r.stdout(), "nothing on standard output");
        assertEquals(1, r.stderr().strip().lines().count(), r.stderr());
        assertTrue(r.stderr().startsWith("cairn fit: "), r.stderr());
        Run empty = cairn("", "fit", "-", "--json");
        assertEquals(2, empty.code());
        assertTrue(empty.stderr().contains("standard input"), empty.stderr());
        Run nowhere = cairn(SPEC, "fit", "-");
        assertEquals(2, nowhere.code());
        assertTrue(nowhere.stderr().contains("--out DIR") && nowhere.stderr().contains("--json"), nowhere.stderr());
    }
}
