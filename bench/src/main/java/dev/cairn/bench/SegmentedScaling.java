package dev.cairn.bench;

import dev.cairn.models.demo.StudioScaleScenario;
import dev.cairn.models.result.Result;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * segmented-spend at a studio's sizes: 10, 50, 200 and 500 segments x 3 and 5 arms of the invented
 * {@link StudioScaleScenario} (summary tables, cell sizes spread log-normally from 50 to 500,000 users,
 * small cells with 0-2 payers), fitted in this process with default settings (4 chains x 300 warmup +
 * 1,000 draws, segment-gibbs). Prints wall time, convergence, min bulk- and tail-ESS, min bulk-ESS per second, and
 * seconds per effective draw per cell (flat when the cost of an effective draw grows linearly in cells).
 * The first configuration is run twice and the first run dropped (JIT warm-up).
 * Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.SegmentedScaling [DIR] [SEGMENTS...]}
 */
public final class SegmentedScaling {
    private SegmentedScaling() {
    }

    public static void main(String[] args) throws Exception {
        ScalingRun run = new ScalingRun(args, 10, 50, 200, 500);
        Path dir = run.dir;
        int[] sizes = run.sizes;
        System.out.println("segments,arms,cells,seconds,converged,maxRhat,minEssBulk,minEssTail,essPerSecond,"
                + "microsecondsPerEffectiveDrawPerCell,parameterisation");
        for (int segments : sizes) {
            for (int arms : new int[] {3, 5}) {
                String name = "studio-" + segments + "x" + arms;
                StudioScaleScenario.write(dir.resolve(name + ".csv"), segments, arms, 1);
                Path spec = dir.resolve(name + ".json");
                Files.writeString(spec, """
                        {"model": "segmented-spend", "data": {"path": "%s.csv", "layout": "summary"}, "control": "A"}
                        """.formatted(name));
                ScalingRun.Timed fitted = run.fit(spec);
                Result r = (Result) fitted.result();
                double seconds = fitted.seconds();
                int cells = segments * arms;
                double ess = r.diagnostics().minEssBulk();
                System.out.printf(Locale.ROOT, "%d,%d,%d,%.2f,%s,%.4f,%.0f,%.0f,%.1f,%.3f,\"%s\"%n", segments, arms, cells,
                        seconds, r.converged(), r.diagnostics().maxRhat(), ess, r.diagnostics().minEssTail(), ess / seconds,
                        1e6 * seconds / ess / cells, r.run().parameterisation());
            }
        }
    }
}
