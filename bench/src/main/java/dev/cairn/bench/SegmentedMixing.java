package dev.cairn.bench;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.result.Result;
import dev.cairn.samplers.RandomStreams;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * segmented-spend on 50 segments x 3 arms (a summary table simulated from the hierarchical model, segment
 * sizes from 300 to 60,000 users per arm): wall time, min bulk-ESS, min bulk-ESS per second and per kept
 * draw (target >= 0.1), for the default sampler settings and seeds 1..3.
 * Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.SegmentedMixing [DIR]}
 */
public final class SegmentedMixing {
    private SegmentedMixing() {
    }

    public static void main(String[] args) throws Exception {
        Path dir = Path.of(args.length > 0 ? args[0] : "bench-data");
        Files.createDirectories(dir);
        UniformRandomProvider rng = RandomStreams.forChain(50, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        StringBuilder sb = new StringBuilder("segment,arm,users,payers,log_spend_sum,log_spend_sq_sum\n");
        String[] arms = {"A", "B", "C"};
        double[] armLogit = {0, 0.1, -0.05};
        double[] armMean = {0, 0.05, 0.12};
        for (int j = 0; j < 50; j++) {
            int users = (int) Math.round(300 * Math.pow(200, j / 49.0));
            double alpha = -3.3 + 0.4 * g.sample(), beta = 1.6 + 0.25 * g.sample(), sd = Math.exp(0.1 + 0.1 * g.sample());
            for (int k = 0; k < 3; k++) {
                double p = 1 / (1 + Math.exp(-(alpha + armLogit[k] + 0.05 * g.sample())));
                double mu = beta + armMean[k] + 0.04 * g.sample();
                long m = 0;
                double s1 = 0, s2 = 0;
                for (int u = 0; u < users; u++) {
                    if (rng.nextDouble() < p) {
                        double y = mu + sd * g.sample();
                        m++;
                        s1 += y;
                        s2 += y * y;
                    }
                }
                sb.append("seg").append(j).append(',').append(arms[k]).append(',').append(users).append(',').append(m)
                        .append(',').append(s1).append(',').append(s2).append('\n');
            }
        }
        Files.writeString(dir.resolve("segments-50x3.csv"), sb.toString());
        for (long seed = 1; seed <= 3; seed++) {
            Path spec = dir.resolve("segments-50x3.json");
            Files.writeString(spec, """
                    {"model": "segmented-spend", "data": {"path": "segments-50x3.csv", "layout": "summary"},
                     "sampler": {"seed": %d}}
                    """.formatted(seed));
            long t0 = System.nanoTime();
            FitOutcome out = Cairn.fit(spec, FitOptions.DEFAULT);
            double seconds = (System.nanoTime() - t0) / 1e9;
            Result r = (Result) out.result();
            double kept = (double) r.run().chains() * r.run().draws();
            System.out.printf(Locale.ROOT, "seed %d: %.2f s, converged %s, min bulk-ESS %.0f (%.0f per second, %.2f per kept draw), "
                            + "min tail-ESS %.0f, max R-hat %.4f, %s%n", seed, seconds, r.converged(),
                    r.diagnostics().minEssBulk(), r.diagnostics().minEssBulk() / seconds,
                    r.diagnostics().minEssBulk() / kept, r.diagnostics().minEssTail(), r.diagnostics().maxRhat(),
                    r.run().parameterisation());
        }
    }
}
