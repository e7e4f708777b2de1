package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.File;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * cairn where the SQL engine cannot start (here: its driver left off the classpath, as when the jar travels
 * without the engine's files): data given inline (statistics, per-user values, estimates, cohort tables) still fit, and files are refused
 * in one line that says what is missing.
 */
class WithoutEngineTest {
    @TempDir
    Path dir;

    private String[] run(String spec) throws Exception {
        String classpath = Arrays.stream(System.getProperty("java.class.path").split(File.pathSeparator))
                .filter(p -> !p.toLowerCase(java.util.Locale.ROOT).contains("duckdb"))
                .collect(Collectors.joining(File.pathSeparator));
        Path file = dir.resolve("spec.json");
        Files.writeString(file, spec);
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process p = new ProcessBuilder(List.of(java, "-Xmx512m", "-cp", classpath, "dev.cairn.cli.Main", "fit",
                file.toString(), "--json")).directory(dir.toFile())
                .redirectOutput(dir.resolve("out").toFile()).redirectError(dir.resolve("err").toFile()).start();
        assertTrue(p.waitFor(120, TimeUnit.SECONDS));
        return new String[] {String.valueOf(p.exitValue()), Files.readString(dir.resolve("out"), StandardCharsets.UTF_8),
            Files.readString(dir.resolve("err"), StandardCharsets.UTF_8)};
    }

    @Test
    void inlineStatisticsFitAndFilesAreRefusedInOneLine() throws Exception {
        String[] inline = run("""
                {"model": "spend", "data": {"layout": "summary", "rows": [
                  {"arm": "A", "users": 1000, "payers": 30, "log_spend_sum": 60.5, "log_spend_sq_sum": 160.2},
                  {"arm": "B", "users": 1000, "payers": 40, "log_spend_sum": 82.0, "log_spend_sq_sum": 215.0}]}}
                """);
        assertEquals("0", inline[0], inline[2]);
        assertTrue(new ObjectMapper().readTree(inline[1]).get("converged").asBoolean());
        // per-user values, estimates and a cohort table given inline are read in memory as well
        StringBuilder users = new StringBuilder();
        for (int i = 0; i < 400; i++) {
            users.append(i == 0 ? "" : ",").append("{\"arm\": \"").append(i % 2 == 0 ? "A" : "B").append("\", \"spend\": ")
                    .append(i % 20 == 0 ? 2.99 + i % 7 : i % 20 == 1 ? 4.99 + i % 3 : 0).append('}');
        }
        String[] perUser = run("{\"model\": \"spend\", \"data\": {\"layout\": \"users\", \"rows\": [" + users + "]}}");
        assertTrue(List.of("0", "3").contains(perUser[0]), perUser[2]);
        assertTrue(new ObjectMapper().readTree(perUser[1]).has("arms"), perUser[1]);
        String[] pooled = run("""
                {"model": "pooled-effects", "data": {"layout": "estimates", "rows": [
                  {"name": "north", "estimate": 0.021, "se": 0.008}, {"name": "south", "estimate": -0.004, "se": 0.011},
                  {"name": "east", "estimate": 0.013, "se": 0.0095}]}}
                """);
        assertTrue(List.of("0", "3").contains(pooled[0]), pooled[2]);
        StringBuilder cohorts = new StringBuilder();
        for (String cohort : new String[] {"2026-01-05", "2026-01-12", "2026-01-19"}) {
            for (int day : new int[] {1, 3, 7}) {
                cohorts.append(cohorts.length() == 0 ? "" : ",").append("{\"cohort\": \"").append(cohort)
                        .append("\", \"day\": ").append(day).append(", \"installs\": 2000, \"active\": ")
                        .append(2000 * 40 / (40 + 6 * day)).append('}');
            }
        }
        String[] retention = run("{\"model\": \"retention\", \"curve\": \"activity\", \"data\": {\"layout\": "
                + "\"cohort-days\", \"rows\": [" + cohorts + "]}}");
        assertTrue(List.of("0", "3").contains(retention[0]), retention[2]);
        Files.writeString(dir.resolve("users.csv"), "arm,spend\nA,0\nA,3.5\nB,0\nB,1.2\n");
        String[] file = run("{\"model\": \"spend\", \"data\": {\"path\": \"users.csv\", \"layout\": \"users\"}}");
        assertEquals("2", file[0], file[2]);
        assertEquals("", file[1]);
        assertEquals(1, file[2].strip().lines().count(), file[2]);
        assertTrue(file[2].startsWith("cairn fit: cannot start the embedded SQL engine: its driver"), file[2]);
    }
}
