package dev.cairn.models.demo;

import dev.cairn.samplers.RandomStreams;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.temporal.ChronoUnit;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;

/**
 * The invented retention scenario: Lantern Reef's weekly install cohorts from 2026-08-03 to 2026-10-26
 * (13 cohorts), half of each on the current first session ("A-current") and half on a guided first dive
 * ("B-guided"), observed on days 1, 2, 3, 5, 7, 14, 21 and 30 up to the cut-off 2026-11-01, so young
 * cohorts have not reached day 30. True day-N activity:
 * <pre>
 *   logit r(t) = a_c + A_k + b log(1 + t),   a_c = 0.20 + 0.03 (c - 1)  (the game improves week by week),
 *   b = -0.85,   A_A-current = 0,   A_B-guided = 0.15,   2,400 installs per cohort and arm,
 *   each cell's share drawn from Beta(r kappa, (1 - r) kappa) with kappa = 150 (day-to-day noise).
 * </pre>
 * So the true D1 of the first cohort on A-current is logistic(0.20 - 0.85 log 2) = 0.410, D7 0.193, D30 0.083.
 */
public final class RetentionScenario {
    public static final String FILE = "lantern-reef-cohorts.csv";
    public static final LocalDate FIRST = LocalDate.of(2026, 8, 3);
    public static final LocalDate CUT_OFF = LocalDate.of(2026, 11, 1);
    static final int COHORTS = 13;
    static final int INSTALLS = 2400;
    static final int[] DAYS = {1, 2, 3, 5, 7, 14, 21, 30};
    static final double KAPPA = 150, SLOPE = -0.85;
    static final String[] ARMS = {"A-current", "B-guided"};
    static final double[] ARM_OFFSET = {0, 0.15};

    private RetentionScenario() {
    }

    /**
     * The true day-7 logit level of a cohort (before the arm's offset).
     *
     * @param cohort the cohort's index, from 0
     * @return the level
     */
    public static double trueLevel(int cohort) {
        return 0.20 + 0.03 * cohort;
    }

    /**
     * Writes the demo's cohort-days CSV into {@code dir}.
     *
     * @param dir the folder
     * @return the file written
     */
    public static Path write(Path dir) {
        Path file = dir.resolve(FILE);
        UniformRandomProvider rng = RandomStreams.forChain(DemoScenario.SEED, 2);
        try {
            Files.createDirectories(dir);
            try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
                w.write("cohort,arm,day,installs,active\n");
                for (int c = 0; c < COHORTS; c++) {
                    LocalDate start = FIRST.plusWeeks(c);
                    long age = ChronoUnit.DAYS.between(start, CUT_OFF);
                    for (int k = 0; k < ARMS.length; k++) {
                        w.write(start + "," + ARMS[k] + ",0," + INSTALLS + "," + INSTALLS + "\n");
                        for (int d : DAYS) {
                            if (d > age) {
                                break;
                            }
                            double z = trueLevel(c) + ARM_OFFSET[k] + SLOPE * Math.log1p(d);
                            double r = 1 / (1 + Math.exp(-z));
                            double share = ChengBetaSampler.of(rng, r * KAPPA, (1 - r) * KAPPA).sample();
                            int active = 0;
                            for (int u = 0; u < INSTALLS; u++) {
                                active += rng.nextDouble() < share ? 1 : 0;
                            }
                            w.write(start + "," + ARMS[k] + "," + d + "," + INSTALLS + "," + active + "\n");
                        }
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return file;
    }
}
