package dev.cairn.models.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

/**
 * Outside check of the day simulator: a two-sided two-proportion z-test at nominal 5 %, looked at after each
 * of K equal batches of users and stopped at the first |z| > 1.96, under no difference between the arms.
 * The overall false-positive rate must match Armitage, McPherson &amp; Rowe (1969), "Repeated significance
 * tests on accumulating data", J. R. Stat. Soc. A 132, Table 2 (normal responses; with 2,000 users per arm
 * and batch the proportions are close to normal), within Monte Carlo error.
 */
class PeekingFalsePositiveTest {
    /** Overall rate by number of looks, Armitage, McPherson &amp; Rowe (1969) Table 2, 2 alpha = 0.05 (from memory). */
    private static final int[] LOOKS = {1, 2, 3, 5, 10, 20};
    private static final double[] RATE = {0.050, 0.083, 0.107, 0.142, 0.193, 0.248};
    private static final int REPLICATIONS = 20_000;

    @Test
    void peekingAtKLooksGivesThePublishedFalsePositiveRates() {
        ArmTruth same = new ArmTruth(2_000, 0.10, 1.0, 1.0);
        for (int j = 0; j < LOOKS.length; j++) {
            int looks = LOOKS[j];
            DailyStats.Source a = DailyStats.of(same).start(RandomSource.XO_RO_SHI_RO_128_PP.create(100L + j));
            DailyStats.Source b = DailyStats.of(same).start(RandomSource.XO_RO_SHI_RO_128_PP.create(200L + j));
            double[] day = new double[4];
            int rejected = 0;
            for (int r = 0; r < REPLICATIONS; r++) {
                double usersA = 0, usersB = 0, payersA = 0, payersB = 0;
                for (int k = 0; k < looks; k++) {
                    a.next(day);
                    usersA += day[0];
                    payersA += day[1];
                    b.next(day);
                    usersB += day[0];
                    payersB += day[1];
                    double pooled = (payersA + payersB) / (usersA + usersB);
                    double z = (payersA / usersA - payersB / usersB)
                            / Math.sqrt(pooled * (1 - pooled) * (1 / usersA + 1 / usersB));
                    if (Math.abs(z) > 1.959964) {
                        rejected++;
                        break;
                    }
                }
            }
            double rate = (double) rejected / REPLICATIONS;
            double mcError = Math.sqrt(RATE[j] * (1 - RATE[j]) / REPLICATIONS);
            assertEquals(RATE[j], rate, 4 * mcError + 0.003, looks + " looks"); // 0.003: the table's rounding and
            // the binomial's small departure from the normal model the table assumes
        }
    }
}
