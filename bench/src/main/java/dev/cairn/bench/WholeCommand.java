package dev.cairn.bench;

import dev.cairn.models.demo.RetentionScaleScenario;
import dev.cairn.models.demo.StudioScaleScenario;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

/**
 * The hard models at a studio's size timed as a user meets them: the whole {@code ./cairn fit SPEC --out DIR}
 * command (start-up, reading, sampling, diagnostics, result.json, draws.csv and the report) in a fresh
 * process, default settings: segmented-spend 200 segments x 5 arms ({@link StudioScaleScenario}) and
 * retention 52 weekly cohorts x 3 arms for both curves ({@link RetentionScaleScenario}). Each command runs
 * once untimed (the launcher's first fit after a build records its class-data archive), then RUNS times;
 * prints the median, fastest and slowest wall time and the exit code (0 = converged). On a shared machine
 * the speed drifts by a quarter within minutes, so the same run also times the 200 x 5 fit with
 * {@code "method": "nuts"}: the ratio of the two is what the machine cannot blur.
 * Run from the repository root: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.WholeCommand DIR [RUNS]}
 */
public final class WholeCommand {
    private WholeCommand() {
    }

    public static void main(String[] args) throws Exception {
        Path dir = Path.of(args.length > 0 ? args[0] : "bench-data").toAbsolutePath();
        int runs = args.length > 1 ? Integer.parseInt(args[1]) : 3;
        Files.createDirectories(dir);
        Path launcher = Path.of("cairn").toAbsolutePath();
        if (!Files.isExecutable(launcher)) {
            throw new IllegalStateException("run from the repository root (no ./cairn here)");
        }
        StudioScaleScenario.write(dir.resolve("studio-200x5.csv"), 200, 5, 1);
        Path segmented = spec(dir, "studio-200x5", """
                {"model": "segmented-spend", "data": {"path": "studio-200x5.csv", "layout": "summary"}, "control": "A"}
                """);
        Path nuts = spec(dir, "studio-200x5-nuts", """
                {"model": "segmented-spend", "data": {"path": "studio-200x5.csv", "layout": "summary"}, "control": "A",
                 "sampler": {"method": "nuts"}}
                """);
        List<Path> specs = new ArrayList<>(List.of(segmented));
        for (String curve : new String[] {"activity", "survival"}) {
            String name = "cohorts-" + curve + "-52x3";
            RetentionScaleScenario.write(dir.resolve(name + ".csv"), 52, 3, curve.equals("survival"), 1);
            specs.add(spec(dir, name, """
                    {"model": "retention", "curve": "%s", "data": {"path": "%s.csv", "layout": "cohort-days"},
                     "control": "A"}
                    """.formatted(curve, name)));
        }
        specs.add(nuts);
        System.out.println("spec,runs,medianSeconds,fastestSeconds,slowestSeconds,exitCodes");
        double gibbs = Double.NaN, gradient = Double.NaN;
        for (Path spec : specs) {
            command(launcher, spec, dir);
            double[] seconds = new double[runs];
            int[] codes = new int[runs];
            for (int r = 0; r < runs; r++) {
                long t0 = System.nanoTime();
                codes[r] = command(launcher, spec, dir);
                seconds[r] = (System.nanoTime() - t0) / 1e9;
            }
            double[] sorted = seconds.clone();
            Arrays.sort(sorted);
            double median = sorted[runs / 2];
            if (spec.equals(segmented)) {
                gibbs = median;
            } else if (spec.equals(nuts)) {
                gradient = median;
            }
            System.out.printf(Locale.ROOT, "%s,%d,%.2f,%.2f,%.2f,%s%n", spec.getFileName(), runs, median, sorted[0],
                    sorted[runs - 1], Arrays.toString(codes).replace(", ", " "));
        }
        System.out.printf(Locale.ROOT, "segmented 200x5: nuts / segment-gibbs = %.2f%n", gradient / gibbs);
    }

    private static Path spec(Path dir, String name, String json) throws IOException {
        Path p = dir.resolve(name + ".json");
        Files.writeString(p, json);
        return p;
    }

    private static int command(Path launcher, Path spec, Path dir) throws IOException, InterruptedException {
        Path out = dir.resolve("out-" + spec.getFileName().toString().replace(".json", ""));
        Process p = new ProcessBuilder(launcher.toString(), "fit", spec.toString(), "--out", out.toString(), "--quiet")
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        return p.waitFor();
    }
}
