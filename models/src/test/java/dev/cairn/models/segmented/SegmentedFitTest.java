package dev.cairn.models.segmented;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.SegmentSummary;
import dev.cairn.samplers.RandomStreams;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class SegmentedFitTest {
    @TempDir
    Path dir;

    /** Per-user rows for segments of the given sizes (users per arm), payer rate 8%, log spend N(1.5, 1). */
    private Path users(int segments, int usersPerArm, long seed) throws IOException {
        UniformRandomProvider rng = RandomStreams.forChain(seed, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        StringBuilder sb = new StringBuilder("country,arm,spend\n");
        for (int j = 0; j < segments; j++) {
            for (String arm : new String[] {"A", "B"}) {
                for (int u = 0; u < usersPerArm; u++) {
                    double spend = rng.nextDouble() < 0.08 ? Math.exp(1.5 + g.sample()) : 0;
                    sb.append("c").append(j).append(',').append(arm).append(',').append(spend).append('\n');
                }
            }
        }
        Path p = dir.resolve("users.csv");
        Files.writeString(p, sb.toString());
        return p;
    }

    private Result fit(String sampler, String extra) throws IOException {
        Path spec = dir.resolve("spec.json");
        Files.writeString(spec, """
                {"model": "segmented-spend",
                 "data": {"path": "users.csv", "layout": "users", "columns": {"segment": "country"}},
                 "sampler": %s %s}
                """.formatted(sampler, extra));
        FitOutcome out = Cairn.fit(spec, FitOptions.DEFAULT);
        return (Result) out.result();
    }

    /** Many tiny segments (about two payers per cell): the funnel case. */
    @Test
    void aFunnelOfTinySegmentsConvergesNonCentredAndIsFlaggedWhenItDoesNot() throws IOException {
        users(30, 25, 12);
        Result ok = fit("{\"seed\": 4}", "");
        assertTrue(ok.run().parameterisation().startsWith("payer-rate levels centred in 0 of 30 segments"),
                ok.run().parameterisation());
        assertEquals("segment-gibbs", ok.run().method());
        assertTrue(ok.converged(), ok.diagnostics().reasons().toString());
        Result nuts = fit("{\"seed\": 4, \"method\": \"nuts\"}", "");
        assertEquals("nuts", nuts.run().method());
        assertTrue(nuts.converged(), nuts.diagnostics().reasons().toString());
        Result tooShort = fit("{\"seed\": 4, \"warmup\": 10, \"draws\": 20}", "");
        assertFalse(tooShort.converged());
        assertTrue(tooShort.warnings().get(0).startsWith("NOT converged"), tooShort.warnings().get(0));
    }

    @Test
    void awkwardSegmentsAreExplainedNotCrashedOn() throws IOException {
        StringBuilder sb = new StringBuilder("country,arm,spend\n");
        UniformRandomProvider rng = RandomStreams.forChain(3, 0);
        for (int j = 0; j < 4; j++) {
            for (String arm : new String[] {"A", "B"}) {
                for (int u = 0; u < 2000; u++) {
                    sb.append("big").append(j).append(',').append(arm).append(',')
                            .append(rng.nextDouble() < 0.05 ? 1 + 10 * rng.nextDouble() : 0).append('\n');
                }
            }
        }
        sb.append("solo,A,3.5\n");                 // a single user, and no arm B at all
        for (int u = 0; u < 300; u++) {
            sb.append("dry,A,0\ndry,B,0\n");        // no payers
        }
        Files.writeString(dir.resolve("users.csv"), sb.toString());
        Result r = fit("{\"seed\": 2}", "");
        SegmentSummary solo = r.segments().get("solo");
        assertEquals(1, solo.users());
        assertTrue(solo.notes().stream().anyMatch(n -> n.contains("no users in arm B")), solo.notes().toString());
        assertTrue(solo.notes().stream().anyMatch(n -> n.contains("single user")), solo.notes().toString());
        SegmentSummary dry = r.segments().get("dry");
        assertTrue(dry.notes().stream().anyMatch(n -> n.contains("no payers")), dry.notes().toString());
        Comparison dryArpu = dry.comparisons().get(0);
        assertNull(dryArpu.rawLift(), "no raw lift without payers");
        assertNotNull(r.segments().get("big0").comparisons().get(0).rawLift());
        assertTrue(Double.isFinite(dryArpu.lift().median()));
        // overall comparisons come in both scopes
        assertTrue(r.comparisons().stream().anyMatch(c -> "population".equals(c.scope())));
        assertTrue(r.comparisons().stream().anyMatch(c -> "typical-segment".equals(c.scope())));
        assertEquals(4 * 4000 + 1 + 600, r.data().users());
    }
}
