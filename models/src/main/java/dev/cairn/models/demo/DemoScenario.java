package dev.cairn.models.demo;

import dev.cairn.samplers.RandomStreams;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * The invented demo scenario: "Lantern Reef", a fictional reef-diving collection game by the fictional
 * studio Driftwood Forge, tests four store layouts for a week. Every number here is made up; the data are
 * drawn from a seeded generator with these documented true parameters, so a fit can be checked against
 * the truth.
 *
 * <pre>
 *   arm             meaning                          payer rate  log-spend mean  log-spend sd  true ARPPU  true ARPU
 *   A-current       the current store (control)        0.030         1.60           1.10         9.070     0.2721
 *   B-bundles       bundles shown first                0.031         1.68           1.10         9.826     0.3046
 *   C-starter       cheaper starter pack               0.036         1.45           1.05         7.398     0.2663
 *   D-discount      pearl-currency discount banner     0.030         1.60           1.25        10.818     0.3246
 * </pre>
 * (true ARPPU = exp(mean + sd^2 / 2), true ARPU = rate x ARPPU; spend is rounded to whole cents). 40,000 users per arm, each in one of six invented regions;
 * spend_d7 is the spend in the first seven days after install, in an invented currency.
 */
public final class DemoScenario {
    public static final String USERS_FILE = "lantern-reef-users.csv";
    public static final long SEED = 20261202L;
    public static final int USERS_PER_ARM = 40_000;

    /** One arm's true parameters. */
    public record Arm(String name, double payerRate, double logSpendMean, double logSpendSd) {
        /**
         * {@return the arm's true ARPU: payer rate x exp(mu + sigma^2 / 2)}
         */
        public double trueArpu() {
            return payerRate * Math.exp(logSpendMean + logSpendSd * logSpendSd / 2);
        }
    }

    public static final List<Arm> ARMS = List.of(
            new Arm("A-current", 0.030, 1.60, 1.10),
            new Arm("B-bundles", 0.031, 1.68, 1.10),
            new Arm("C-starter", 0.036, 1.45, 1.05),
            new Arm("D-discount", 0.030, 1.60, 1.25));

    /** Invented regions and their shares of players. */
    static final String[] REGIONS = {"north-isles", "coral-coast", "east-shoals", "far-atoll", "deep-trench", "mist-bay"};
    static final double[] REGION_SHARES = {0.34, 0.26, 0.18, 0.12, 0.07, 0.03};

    /** The first install date of the demo test. */
    public static final java.time.LocalDate START = java.time.LocalDate.of(2026, 10, 1);
    /** Days over which players joined. */
    public static final int DAYS = 14;

    private DemoScenario() {
    }

    /**
     * Writes the per-user CSV (user_id, store_variant, region, install_date, spend_d7) into {@code dir}. Players
     * joined the test over {@link #DAYS} days from {@link #START}, in equal numbers per day (no random draw, so
     * the other columns are the same as without the date).
     *
     * @param dir the folder
     * @return the file written
     */
    public static Path writeUsers(Path dir) {
        Path file = dir.resolve(USERS_FILE);
        UniformRandomProvider rng = RandomStreams.forChain(SEED, 0);
        ZigguratSampler.NormalizedGaussian gaussian = ZigguratSampler.NormalizedGaussian.of(rng);
        try {
            Files.createDirectories(dir);
            try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
                w.write("user_id,store_variant,region,install_date,spend_d7\n");
                long id = 100_000;
                StringBuilder sb = new StringBuilder(64);
                for (int u = 0; u < USERS_PER_ARM; u++) {
                    String date = START.plusDays((long) u * DAYS / USERS_PER_ARM).toString();
                    for (Arm arm : ARMS) {
                        double spend = 0;
                        if (rng.nextDouble() < arm.payerRate()) {
                            spend = Math.exp(arm.logSpendMean() + arm.logSpendSd() * gaussian.sample());
                            spend = Math.max(0.01, Math.round(spend * 100) / 100.0); // whole cents
                        }
                        sb.setLength(0);
                        sb.append(id++).append(',').append(arm.name()).append(',').append(region(rng.nextDouble()))
                                .append(',').append(date).append(',').append(String.format(Locale.ROOT, "%.2f", spend)).append('\n');
                        w.write(sb.toString());
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return file;
    }

    private static String region(double u) {
        double c = 0;
        for (int i = 0; i < REGIONS.length; i++) {
            c += REGION_SHARES[i];
            if (u < c) {
                return REGIONS[i];
            }
        }
        return REGIONS[REGIONS.length - 1];
    }
}
