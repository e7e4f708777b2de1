package dev.cairn.bench;

import dev.cairn.models.demo.RetentionScaleScenario;
import dev.cairn.models.result.FitResult;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * retention at a studio's sizes: 13, 26, 52 and 104 weekly cohorts x 2 and 3 arms of the invented
 * {@link RetentionScaleScenario} (2,400 installs per cohort and arm, days 1-7, 14, 21, 30 where reached),
 * both curves, fitted in this process with default settings. Prints wall time, convergence, min bulk- and
 * tail-ESS, bulk-ESS per second and seconds per effective draw per observed cell. The first configuration
 * is run twice and the first run dropped (JIT warm-up).
 * Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.RetentionScaling [DIR] [COHORTS...]}
 */
public final class RetentionScaling {
    private RetentionScaling() {
    }

    public static void main(String[] args) throws Exception {
        ScalingRun run = new ScalingRun(args, 13, 26, 52, 104);
        Path dir = run.dir;
        int[] sizes = run.sizes;
        System.out.println("curve,cohorts,arms,cells,seconds,converged,maxRhat,minEssBulk,minEssTail,essPerSecond,"
                + "microsecondsPerEffectiveDrawPerCell");
        for (String curve : new String[] {"activity", "survival"}) {
            for (int cohorts : sizes) {
                for (int arms : new int[] {2, 3}) {
                    String name = "cohorts-" + curve + "-" + cohorts + "x" + arms;
                    Path file = RetentionScaleScenario.write(dir.resolve(name + ".csv"), cohorts, arms,
                            curve.equals("survival"), 1);
                    long cells = Files.readAllLines(file).stream().skip(1).filter(l -> !l.split(",")[2].equals("0")).count();
                    Path spec = dir.resolve(name + ".json");
                    Files.writeString(spec, """
                            {"model": "retention", "curve": "%s", "data": {"path": "%s.csv", "layout": "cohort-days"},
                             "control": "A"}
                            """.formatted(curve, name));
                    ScalingRun.Timed fitted = run.fit(spec);
                    FitResult r = fitted.result();
                    double seconds = fitted.seconds();
                    double ess = r.diagnostics().minEssBulk();
                    System.out.printf(Locale.ROOT, "%s,%d,%d,%d,%.1f,%s,%.4f,%.0f,%.0f,%.1f,%.2f%n", curve, cohorts, arms,
                            cells, seconds, r.converged(), r.diagnostics().maxRhat(), ess, r.diagnostics().minEssTail(),
                            ess / seconds, 1e6 * seconds / ess / cells);
                }
            }
        }
    }
}
