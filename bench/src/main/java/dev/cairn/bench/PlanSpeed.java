package dev.cairn.bench;

import dev.cairn.models.plan.PlanReader;
import dev.cairn.models.plan.PlanResult;
import dev.cairn.models.plan.PlanSpec;
import dev.cairn.models.plan.Planner;
import dev.cairn.samplers.Progress;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;

/**
 * The plan simulator's speed target: 10,000 simulated 28-day tests x 4 arms on the spend model with a look
 * every day from day 1, on 1 and on 2 threads in one run (compare the ratio; the machine's speed drifts).
 * Two traffic levels: 10,000 users per arm per day (every look decides from the approximation) and 2,000 (the
 * first day has fewer than 100 payers per arm and takes exact draws); and 2,000 with looks from day 7.
 * One warm-up run, then the median of three. Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.PlanSpeed
 * [USERS_PER_DAY MIN_DAYS]} (no arguments: the three settings).
 */
public final class PlanSpeed {
    private PlanSpeed() {
    }

    static PlanSpec plan(int usersPerDay, int minDays) {
        return PlanReader.parse("""
            {"arms": {"A": {}, "B": {"arppuLift": 0.03}, "C": {"payerRateLift": 0.02}, "D": {"payerRateLift": -0.02}},
             "control": "A", "usersPerDay": %d, "baseline": {"payerRate": 0.03, "logSpendMean": 1.0, "logSpendSd": 1.5},
             "schedule": {"minDays": %d, "maxDays": 28, "lookEvery": 1}, "simulation": {"experiments": 10000, "seed": 3}}
            """.formatted(usersPerDay, minDays), "bench", Path.of("."));
    }

    public static void main(String[] args) {
        int[][] settings = args.length == 2 ? new int[][] {{Integer.parseInt(args[0]), Integer.parseInt(args[1])}}
                : new int[][] {{10_000, 1}, {2_000, 7}, {2_000, 1}};
        for (int[] setting : settings) {
            PlanSpec p = plan(setting[0], setting[1]);
            double[] times = new double[3];
            for (int threads : new int[] {1, 2}) {
                PlanResult last = null;
                for (int i = 0; i < 4; i++) {
                    long t0 = System.nanoTime();
                    last = Planner.run(p, threads, Progress.NONE);
                    if (i >= 1) {
                        times[i - 1] = (System.nanoTime() - t0) / 1e9;
                    }
                }
                Arrays.sort(times);
                double drew = last.days().stream().mapToDouble(d -> d.fixed().drawsShare()).average().orElse(0);
                System.out.printf(Locale.ROOT, "%,d users/arm/day, looks days %d-28: %d thread(s) median %.2f s "
                        + "(%.1f%% of looks took exact draws)%n", setting[0], setting[1], threads, times[1], 100 * drew);
            }
        }
    }
}
