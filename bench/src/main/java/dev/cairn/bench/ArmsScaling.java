package dev.cairn.bench;

import dev.cairn.cli.report.ReportWriter;
import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.ResultWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * Many arms: a {@code spend} summary table of 100, 300 and 1,000 arms (the documented limit), fitted with
 * default settings and written as the command line writes it (result.json, draws.csv, report.html), in this
 * process after a JIT warm-up run. Prints the fit's and the writing's wall time and the files' sizes, to
 * show the cost growing about linearly in arms.
 *
 * <p>Invented data, seeded: per arm 500 to 5,000 users, 3% payers, log spend of payers drawn from
 * N(1, 1.2²), summed into {@code log_spend_sum} and {@code log_spend_sq_sum}.
 * Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.ArmsScaling [DIR] [ARMS...]}
 */
public final class ArmsScaling {
    private ArmsScaling() {
    }

    public static void main(String[] args) throws IOException {
        ScalingRun run = new ScalingRun(args, 100, 300, 1000);
        System.out.println("arms,fitSeconds,writeSeconds,totalSeconds,drawsMegabytes,reportMegabytes,converged");
        boolean warm = false;
        for (int arms : run.sizes) {
            Path spec = write(run.dir, arms);
            if (!warm) {
                Cairn.fit(spec, FitOptions.DEFAULT);
                warm = true;
            }
            Path out = run.dir.resolve("arms-" + arms + "-out");
            Files.createDirectories(out);
            long t0 = System.nanoTime();
            FitOutcome o = Cairn.fit(spec, FitOptions.DEFAULT);
            long t1 = System.nanoTime();
            ResultWriter.write(o, out);
            ReportWriter.write(o, spec.getFileName().toString(), out);
            long t2 = System.nanoTime();
            System.out.printf(Locale.ROOT, "%d,%.2f,%.2f,%.2f,%.0f,%.1f,%s%n", arms, (t1 - t0) / 1e9, (t2 - t1) / 1e9,
                    (t2 - t0) / 1e9, Files.size(out.resolve(ResultWriter.DRAWS)) / 1e6,
                    Files.size(out.resolve(ReportWriter.REPORT)) / 1e6, o.result().converged());
        }
    }

    private static Path write(Path dir, int arms) throws IOException {
        SplittableRandom random = new SplittableRandom(arms);
        StringBuilder csv = new StringBuilder("arm,users,payers,log_spend_sum,log_spend_sq_sum\n");
        for (int k = 0; k < arms; k++) {
            int users = 500 + random.nextInt(4_501);
            int payers = Math.max(1, (int) Math.round(0.03 * users));
            double s1 = 0, s2 = 0;
            for (int i = 0; i < payers; i++) {
                double y = 1 + 1.2 * random.nextGaussian();
                s1 += y;
                s2 += y * y;
            }
            csv.append(String.format(Locale.ROOT, "arm%04d,%d,%d,%.17g,%.17g%n", k, users, payers, s1, s2));
        }
        Files.writeString(dir.resolve("arms-" + arms + ".csv"), csv);
        Path spec = dir.resolve("arms-" + arms + ".json");
        Files.writeString(spec, "{\"model\": \"spend\", \"data\": {\"path\": \"arms-" + arms
                + ".csv\", \"layout\": \"summary\"}}");
        return spec;
    }
}
