package dev.cairn.models.demo;

import dev.cairn.samplers.RandomStreams;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.AhrensDieterMarsagliaTsangGammaSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * An invented test at a studio's size, for scaling benchmarks and the regression test of the largest
 * segmented fits: Driftwood Forge runs a store test of Lantern Reef in S regions ("r001", ...) on K arms
 * ("A" the control, then "B", "C", ...), written as a summary table (segment, arm, users, payers,
 * log_spend_sum, log_spend_sq_sum). True parameters:
 * <pre>
 *   users per cell: exp(N(log 3000, 1.7^2)) clipped to 50 .. 500,000 (one draw per region, +-10% per arm)
 *   logit payer rate  = alpha_j + d_k,  alpha_j ~ N(-3.4, 0.5^2), d = 0, 0.06, -0.04, 0.10, 0.02, ... (cycled)
 *   mean log spend    = beta_j + e_k,   beta_j ~ N(1.6, 0.3^2),   e = 0, 0.03, 0.05, -0.02, 0.04, ... (cycled)
 *   log-spend sd      = exp(N(0.1, 0.1^2)) per region
 * </pre>
 * Statistics are drawn from their exact laws: payers ~ Binomial(users, p); given m payers, the mean log
 * spend ~ N(mu, sigma^2 / m) and the squared deviations ~ sigma^2 chi^2(m - 1). Small regions have cells with
 * 0, 1 or 2 payers, as real ones do.
 */
public final class StudioScaleScenario {
    static final double[] PAYER_EFFECT = {0, 0.06, -0.04, 0.10, 0.02};
    static final double[] SPEND_EFFECT = {0, 0.03, 0.05, -0.02, 0.04};

    private StudioScaleScenario() {
    }

    /**
     * Writes the summary table.
     *
     * @param file     where (its folder is created)
     * @param segments regions, >= 1
     * @param arms     arms, 2..26
     * @param seed     the generator's seed
     * @return the file
     */
    public static Path write(Path file, int segments, int arms, long seed) {
        UniformRandomProvider rng = RandomStreams.forChain(seed, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        try {
            if (file.getParent() != null) {
                Files.createDirectories(file.getParent());
            }
            try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
                w.write("segment,arm,users,payers,log_spend_sum,log_spend_sq_sum\n");
                for (int j = 0; j < segments; j++) {
                    double size = Math.min(500_000, Math.max(50, Math.exp(Math.log(3000) + 1.7 * g.sample())));
                    double alpha = -3.4 + 0.5 * g.sample(), beta = 1.6 + 0.3 * g.sample();
                    double sigma = Math.exp(0.1 + 0.1 * g.sample());
                    for (int k = 0; k < arms; k++) {
                        int users = (int) Math.max(50, Math.round(size * (0.9 + 0.2 * rng.nextDouble())));
                        double p = 1 / (1 + Math.exp(-(alpha + PAYER_EFFECT[k % PAYER_EFFECT.length])));
                        int payers = new BinomialDistribution(null, users, p).inverseCumulativeProbability(rng.nextDouble());
                        double mu = beta + SPEND_EFFECT[k % SPEND_EFFECT.length];
                        double s1 = 0, s2 = 0;
                        if (payers > 0) {
                            double mean = mu + sigma / Math.sqrt(payers) * g.sample();
                            double squares = payers > 1
                                    ? sigma * sigma * 2 * AhrensDieterMarsagliaTsangGammaSampler.of(rng, (payers - 1) / 2.0, 1).sample()
                                    : 0;
                            s1 = payers * mean;
                            s2 = squares + payers * mean * mean;
                        }
                        w.write(String.format(Locale.ROOT, "r%03d,%s,%d,%d,%.17g,%.17g%n", j + 1, (char) ('A' + k), users,
                                payers, s1, s2));
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return file;
    }
}
