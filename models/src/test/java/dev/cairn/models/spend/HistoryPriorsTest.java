package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.samplers.RandomStreams;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Priors from history recover the hyper-distribution that simulated past periods: payer rates drawn
 * from Beta(60, 1940) (mean 0.03, a + b = 2000), period log-spend means from N(1.5, 0.15^2), a common
 * log-spend sd of 1.1 (so sigma^2 = 1.21).
 */
class HistoryPriorsTest {
    @TempDir
    Path dir;

    @Test
    void methodOfMomentsRecoversTheSimulatingPriors() throws IOException {
        UniformRandomProvider rng = RandomStreams.forChain(31, 0);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        StringBuilder sb = new StringBuilder("period,users,payers,log_spend_sum,log_spend_sq_sum\n");
        for (int period = 0; period < 40; period++) {
            int users = 50_000;
            double rate = ChengBetaSampler.of(rng, 60, 1940).sample();
            double mean = 1.5 + 0.15 * g.sample();
            long payers = 0;
            double s1 = 0, s2 = 0;
            for (int u = 0; u < users; u++) {
                if (rng.nextDouble() < rate) {
                    double y = mean + 1.1 * g.sample();
                    payers++;
                    s1 += y;
                    s2 += y * y;
                }
            }
            sb.append(period).append(',').append(users).append(',').append(payers).append(',').append(s1).append(',')
                    .append(s2).append('\n');
        }
        Files.writeString(dir.resolve("history.csv"), sb.toString());
        SpendPriors p = HistoryPriors.fit("history.csv", dir);
        double a = p.payerRate().a(), b = p.payerRate().b();
        assertEquals(0.03, a / (a + b), 0.002, "prior mean payer rate");
        assertTrue(a + b > 700 && a + b < 6000, "prior concentration " + (a + b) + " (truth 2000)");
        assertEquals(1.5, p.logSpend().mu0(), 0.08, "mu0");
        double sigma2 = p.logSpend().beta0() / (p.logSpend().alpha0() - 1);
        assertEquals(1.21, sigma2, 0.05, "prior mean of sigma^2");
        double kappa0 = p.logSpend().kappa0();
        // mu | sigma^2 ~ N(mu0, sigma^2 / kappa0): sd of the period means 0.15 means kappa0 near 1.21 / 0.0225 = 54.
        assertTrue(kappa0 > 25 && kappa0 < 110, "kappa0 " + kappa0);
        assertEquals("history", p.source());
    }
}
