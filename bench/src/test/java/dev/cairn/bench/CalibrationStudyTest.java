package dev.cairn.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The calibration study in reduced size (the full one: {@code CalibrationStudy}'s main, figures in the
 * README): where the model holds, cairn's 95% ARPU-lift intervals cover the true lift at a rate a 95%
 * interval can give; the bootstrap's resampling through the payers draws the same law as resampling users.
 */
class CalibrationStudyTest {
    @Test
    void cairnCoversTheTrueLiftOnLognormalSpend() {
        int n = Integer.getInteger("cairn.calibration.experiments", 200);
        List<CalibrationStudy.Outcome> rows = CalibrationStudy.run(
                List.of(new CalibrationStudy.Setting(CalibrationStudy.Law.LOGNORMAL, 10_000)), new int[] {n}, 3);
        double covered = rows.stream().filter(CalibrationStudy.Outcome::cairnLift).count() / (double) n;
        double se = Math.sqrt(0.95 * 0.05 / n);
        System.out.printf("CalibrationStudyTest: cairn covers the true lift in %.1f%% of %d experiments%n", 100 * covered, n);
        assertTrue(Math.abs(covered - 0.95) < 3.5 * se, "coverage " + covered);
    }

    @Test
    void bootstrapThroughThePayersHasTheMeanAndSpreadOfResamplingUsers() {
        CalibrationStudy.Arm a = CalibrationStudy.arm(org.apache.commons.rng.simple.RandomSource.XO_SHI_RO_256_PP.create(1L),
                20_000, 0.03, 1.5, CalibrationStudy.Law.LOGNORMAL, 1);
        CalibrationStudy.Arm zero = new CalibrationStudy.Arm(20_000, new double[0]);
        var rng = org.apache.commons.rng.simple.RandomSource.XO_SHI_RO_256_PP.create(2L);
        double[] ci = CalibrationStudy.bootstrap(zero, a, rng, 0.95);
        // the bootstrap interval of a mean is close to mean +- 1.96 sd / sqrt(n) at this size
        double mean = a.sum() / a.users();
        double sum2 = 0;
        for (double y : a.spend()) {
            sum2 += (y - mean) * (y - mean);
        }
        sum2 += (a.users() - a.spend().length) * mean * mean;
        double half = 1.96 * Math.sqrt(sum2 / (a.users() - 1) / a.users());
        assertEquals(mean - half, ci[0], 0.15 * half);
        assertEquals(mean + half, ci[1], 0.15 * half);
    }
}
