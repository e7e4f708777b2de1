package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * SBC on a normal mean with known variance: theta ~ N(0, 1), five observations y_i ~ N(theta, 1), so
 * theta | y ~ N(sum y / 6, 1/6) (Bayesian Data Analysis 3rd ed., section 2.5). Reduced size by default;
 * -Pfull-validation runs ten times as many replications.
 */
class SbcTest {
    private static final boolean FULL = "full".equals(System.getProperty("cairn.validation"));
    private static final int REPLICATIONS = FULL ? 10_000 : 1_000;
    private static final int DRAWS = 99;

    private static Sbc.RankHistogram run(double sdFactor, double bias) {
        SplittableRandom random = new SplittableRandom(2018);
        Sbc sbc = new Sbc();
        for (int r = 0; r < REPLICATIONS; r++) {
            double theta = random.nextGaussian();
            double sum = 0;
            for (int i = 0; i < 5; i++) {
                sum += theta + random.nextGaussian();
            }
            double mean = sum / 6 + bias;
            double sd = Math.sqrt(1.0 / 6) * sdFactor;
            double[] posterior = new double[DRAWS];
            for (int k = 0; k < DRAWS; k++) {
                posterior[k] = mean + sd * random.nextGaussian();
            }
            sbc.add("theta", theta, posterior);
        }
        return sbc.histograms(20).get("theta");
    }

    @Test
    void theExactPosteriorPasses() {
        Sbc.RankHistogram h = run(1.0, 0.0);
        assertTrue(h.uniformAt(0.001), "p = " + h.pValue());
    }

    @Test
    void anOverconfidentPosteriorFails() {
        Sbc.RankHistogram h = run(0.7, 0.0); // too narrow: ranks pile up at both ends
        assertFalse(h.uniformAt(0.001), "p = " + h.pValue());
    }

    @Test
    void aBiasedPosteriorFails() {
        Sbc.RankHistogram h = run(1.0, 0.2); // shifted up: prior draws rank low
        assertFalse(h.uniformAt(0.001), "p = " + h.pValue());
        assertTrue(h.counts()[0] > h.counts()[19]);
    }

    @Test
    void binsMustDivideTheRanks() {
        assertThrows(IllegalArgumentException.class, () -> Sbc.RankHistogram.of(new int[100], 99, 7));
        assertTrue(Sbc.thin(new double[] {0, 1, 2, 3, 4, 5}, 3)[1] == 2.0);
    }
}
