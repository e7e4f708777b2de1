package dev.cairn.models.demo;

import dev.cairn.samplers.RandomStreams;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Invented retention data at a studio's size, for scaling benchmarks and tests: weekly install cohorts of
 * Lantern Reef from 2025-11-03 on, arms "A" (control), "B", "C", ..., 2,400 installs per cohort and arm,
 * observed on days 1-7, 14, 21 and 30 up to a cut-off one week after the last cohort (young cohorts are
 * censored). Written as a cohort-days table (cohort, arm, day, installs, active). True parameters:
 * <pre>
 *   activity: logit r(t) = L_c + A_k - 0.85 log(1 + t), L_c a random walk from 0.2 with sd 0.03 a week,
 *             A = 0, 0.15, 0.10, 0.05, ... ; each cell's share from Beta(r kappa, (1 - r) kappa), kappa = 150
 *   survival: each user's churn probability theta ~ Beta(alpha, beta) (shifted-beta-geometric), alpha = e^{L_c + A_k}
 *             with L_c a random walk from log 0.6 with sd 0.03, beta = e^{1.2}; retained on day t if T > t
 * </pre>
 */
public final class RetentionScaleScenario {
    static final int INSTALLS = 2400;
    static final int[] DAYS = {1, 2, 3, 4, 5, 6, 7, 14, 21, 30};
    static final double[] OFFSET = {0, 0.15, 0.10, 0.05, 0.12};
    static final LocalDate FIRST = LocalDate.of(2025, 11, 3);

    private RetentionScaleScenario() {
    }

    /**
     * Writes the table.
     *
     * @param file     where (its folder is created)
     * @param cohorts  weekly cohorts, >= 1
     * @param arms     arms, 1..5
     * @param survival true for retained counts (non-increasing), false for day-N activity
     * @param seed     the generator's seed
     * @return the file
     */
    public static Path write(Path file, int cohorts, int arms, boolean survival, long seed) {
        UniformRandomProvider rng = RandomStreams.forChain(seed, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        LocalDate cutOff = FIRST.plusWeeks(cohorts);
        try {
            if (file.getParent() != null) {
                Files.createDirectories(file.getParent());
            }
            try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
                w.write("cohort,arm,day,installs,active\n");
                double walk = survival ? Math.log(0.6) : 0.2;
                for (int c = 0; c < cohorts; c++) {
                    walk += c == 0 ? 0 : 0.03 * g.sample();
                    LocalDate start = FIRST.plusWeeks(c);
                    long age = java.time.temporal.ChronoUnit.DAYS.between(start, cutOff);
                    for (int k = 0; k < arms; k++) {
                        String arm = String.valueOf((char) ('A' + k));
                        w.write(start + "," + arm + ",0," + INSTALLS + "," + INSTALLS + "\n");
                        long[] counts = survival ? retained(walk + OFFSET[k], rng) : null;
                        for (int i = 0; i < DAYS.length && DAYS[i] <= age; i++) {
                            long y;
                            if (survival) {
                                y = counts[i];
                            } else {
                                double z = walk + OFFSET[k] - 0.85 * Math.log1p(DAYS[i]);
                                double r = 1 / (1 + Math.exp(-z));
                                double share = ChengBetaSampler.of(rng, r * 150, (1 - r) * 150).sample();
                                y = 0;
                                for (int u = 0; u < INSTALLS; u++) {
                                    y += rng.nextDouble() < share ? 1 : 0;
                                }
                            }
                            w.write(start + "," + arm + "," + DAYS[i] + "," + INSTALLS + "," + y + "\n");
                        }
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return file;
    }

    /** Users still retained at each of DAYS under the shifted-beta-geometric model. */
    private static long[] retained(double logAlpha, UniformRandomProvider rng) {
        double alpha = Math.exp(logAlpha), beta = Math.exp(1.2);
        long[] out = new long[DAYS.length];
        org.apache.commons.rng.sampling.distribution.ContinuousSampler theta = ChengBetaSampler.of(rng, alpha, beta);
        for (int u = 0; u < INSTALLS; u++) {
            double p = theta.sample();
            // churn time T >= 1: geometric number of trials to the first churn
            int t = 1;
            while (t <= 30 && rng.nextDouble() >= p) {
                t++;
            }
            for (int i = 0; i < DAYS.length; i++) {
                out[i] += t > DAYS[i] ? 1 : 0;
            }
        }
        return out;
    }
}
