package dev.cairn.models.segmented;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.demo.StudioScaleScenario;
import dev.cairn.models.result.ArmSummary;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Result;
import dev.cairn.models.result.SegmentSummary;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Regression test of a crash at a studio's size: before the samplers of today, a summary table of many segments with
 * log-normally spread cell sizes and cells with 0 payers ended in "internal error: ... is not finite: NaN"
 * after minutes. The same kind of data (invented, {@link StudioScaleScenario}) must now fit with default
 * settings, converge, and give finite numbers everywhere. Reduced to 60 segments x 5 arms by default; the
 * full 200 x 5 case runs with -Pfull-validation (and in the scaling benchmark).
 */
class StudioScaleTest {
    private static final boolean FULL = "full".equals(System.getProperty("cairn.validation"));

    @TempDir
    Path dir;

    @Test
    void manySegmentsWithEmptyCellsConvergeWithDefaultSettings() throws IOException {
        int segments = FULL ? 200 : 60;
        StudioScaleScenario.write(dir.resolve("cells.csv"), segments, 5, 1);
        long emptyCells = Files.readAllLines(dir.resolve("cells.csv")).stream().skip(1)
                .filter(l -> l.split(",")[3].equals("0")).count();
        assertTrue(emptyCells > 0, "the scenario must contain cells without payers");
        Path spec = dir.resolve("spec.json");
        Files.writeString(spec, """
                {"model": "segmented-spend",
                 "data": {"path": "cells.csv", "layout": "summary", "columns": {"segment": "segment"}},
                 "control": "A"}
                """);
        Result r = (Result) Cairn.fit(spec, FitOptions.DEFAULT).result();
        assertTrue(r.converged(), String.join("; ", r.diagnostics().reasons()));
        assertEquals("segment-gibbs", r.run().method());
        assertEquals(segments, r.segments().size());
        for (SegmentSummary s : r.segments().values()) {
            for (ArmSummary a : s.arms().values()) {
                for (Interval i : List.of(a.arpu(), a.payerRate(), a.arppu())) {
                    assertTrue(Double.isFinite(i.lo()) && Double.isFinite(i.hi()) && i.lo() <= i.hi(), i.toString());
                }
            }
        }
    }
}
