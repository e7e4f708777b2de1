package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Same spec and seed: byte-identical result.json (apart from run.seconds) and draws, on 1 and 4 threads. */
class DeterminismTest {
    @TempDir
    Path dir;

    private Path spec(String method, long seed) throws IOException {
        StringBuilder users = new StringBuilder("user,arm,spend\n");
        java.util.SplittableRandom r = new java.util.SplittableRandom(1);
        for (int i = 0; i < 3000; i++) {
            double spend = r.nextDouble() < 0.05 ? Math.exp(1 + r.nextGaussian()) : 0;
            users.append(i).append(',').append(i % 3 == 0 ? "A" : i % 3 == 1 ? "B" : "C").append(',').append(spend).append('\n');
        }
        Files.writeString(dir.resolve("users.csv"), users);
        String text = """
                {"model": "spend", "data": {"path": "users.csv", "layout": "users"},
                 "priors": %s,
                 "sampler": {"method": "%s", "chains": 4, "warmup": 300, "draws": 400, "seed": %d}}
                """.formatted(method.equals("exact") ? "{}"
                : "{\"logSpendMean\": {\"family\": \"normal\", \"mean\": 0, \"sd\": 5}, "
                  + "\"logSpendSd\": {\"family\": \"half-normal\", \"sd\": 2}}", method, seed);
        Path p = dir.resolve("spec-" + method + "-" + seed + ".json");
        Files.writeString(p, text);
        return p;
    }

    private static String[] run(Path spec, int threads) throws IOException {
        FitOutcome out = Cairn.fit(spec, FitOptions.DEFAULT.withThreads(threads));
        Path folder = spec.resolveSibling("out-" + threads);
        ResultWriter.write(out, folder);
        String json = Files.readString(folder.resolve(ResultWriter.RESULT)).replaceAll("\"seconds\" : [0-9.Ee-]+", "");
        return new String[] {json, Files.readString(folder.resolve(ResultWriter.DRAWS))};
    }

    @Test
    void sliceIsIdenticalOnOneAndFourThreads() throws IOException {
        Path spec = spec("slice", 7);
        String[] one = run(spec, 1);
        String[] four = run(spec, 4);
        assertEquals(one[0], four[0]);
        assertEquals(one[1], four[1]);
    }

    @Test
    void exactIsIdenticalOnOneAndFourThreadsAndSeedsMatter() throws IOException {
        String[] one = run(spec("exact", 7), 1);
        String[] four = run(spec("exact", 7), 4);
        assertEquals(one[0], four[0]);
        assertEquals(one[1], four[1]);
        assertNotEquals(one[1], run(spec("exact", 8), 2)[1]);
    }

    /** The hand-built sweeps of the other models keep their state per chain too. */
    @Test
    void segmentedPooledAndRetentionAreIdenticalOnOneAndThreeThreads() throws IOException {
        StringBuilder seg = new StringBuilder("segment,arm,users,payers,log_spend_sum,log_spend_sq_sum\n");
        for (int j = 0; j < 5; j++) {
            seg.append("s").append(j).append(",A,800,").append(20 + j).append(',').append(30.0 + j).append(',').append(80.0 + 3 * j).append('\n');
            seg.append("s").append(j).append(",B,800,").append(24 + j).append(',').append(37.0 + j).append(',').append(95.0 + 3 * j).append('\n');
        }
        Files.writeString(dir.resolve("seg.csv"), seg);
        StringBuilder ret = new StringBuilder("cohort,arm,day,installs,active\n");
        for (int c = 0; c < 4; c++) {
            for (String arm : new String[] {"A", "B"}) {
                int[] days = {1, 7, 14};
                for (int i = 0; i < 3 - (c == 3 ? 1 : 0); i++) {
                    ret.append("2026-0").append(c + 1).append("-01,").append(arm).append(',').append(days[i]).append(",500,")
                            .append(200 - 50 * i + (arm.equals("B") ? 10 : 0) + c).append('\n');
                }
            }
        }
        Files.writeString(dir.resolve("ret.csv"), ret);
        String[] specs = {
            "{\"model\": \"segmented-spend\", \"data\": {\"path\": \"seg.csv\", \"layout\": \"summary\"},"
                + " \"sampler\": {\"chains\": 3, \"warmup\": 100, \"draws\": 100, \"seed\": 5}}",
            "{\"model\": \"pooled-effects\", \"data\": {\"layout\": \"estimates\", \"rows\": [{\"name\": \"a\","
                + " \"estimate\": 0.1, \"se\": 0.05}, {\"name\": \"b\", \"estimate\": -0.02, \"se\": 0.08}]},"
                + " \"sampler\": {\"chains\": 3, \"warmup\": 100, \"draws\": 100, \"seed\": 5}}",
            "{\"model\": \"retention\", \"curve\": \"survival\", \"data\": {\"path\": \"ret.csv\", \"layout\": \"cohort-days\"},"
                + " \"ltv\": {\"horizon\": 30, \"revenuePerActiveDay\": 0.2},"
                + " \"sampler\": {\"chains\": 3, \"warmup\": 50, \"draws\": 50, \"seed\": 5}}"};
        for (int i = 0; i < specs.length; i++) {
            Path spec = dir.resolve("model-" + i + ".json");
            Files.writeString(spec, specs[i]);
            String[] one = run(spec, 1);
            String[] three = run(spec, 3);
            assertEquals(one[0], three[0], specs[i]);
            assertEquals(one[1], three[1], specs[i]);
        }
    }
}
