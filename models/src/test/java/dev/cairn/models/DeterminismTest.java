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
}
