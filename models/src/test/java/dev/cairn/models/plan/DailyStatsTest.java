package dev.cairn.models.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

/**
 * A simulated day's statistics have the laws of the per-user sums: their exact moments (laws of total
 * expectation and variance, standard identities), and the same distributions as summing simulated users
 * (two-sample Kolmogorov-Smirnov test, Apache Commons Math), including days large enough that the binomial is
 * drawn in chunks.
 */
class DailyStatsTest {
    private static final int DRAWS = 40_000;

    /** Sample mean and its standard error. */
    private record Moment(double mean, double se, double variance) {
        static Moment of(double[] x) {
            double m = 0;
            for (double v : x) {
                m += v;
            }
            m /= x.length;
            double ss = 0;
            for (double v : x) {
                ss += (v - m) * (v - m);
            }
            double var = ss / (x.length - 1);
            return new Moment(m, Math.sqrt(var / x.length), var);
        }
    }

    private static double[][] simulate(ArmTruth truth, int draws, long seed) {
        DailyStats.Source source = DailyStats.of(truth).start(RandomSource.XO_RO_SHI_RO_128_PP.create(seed));
        double[][] out = new double[3][draws];
        double[] day = new double[4];
        for (int i = 0; i < draws; i++) {
            source.next(day);
            out[0][i] = day[1];
            out[1][i] = day[2];
            out[2][i] = day[3];
        }
        return out;
    }

    private static void near(double expected, Moment m, String what) {
        assertTrue(Math.abs(m.mean() - expected) < 4.5 * m.se(),
                what + ": " + m.mean() + " vs " + expected + " (se " + m.se() + ")");
    }

    @Test
    void theMomentsAreThoseOfTheSumsOverUsers() {
        for (ArmTruth t : new ArmTruth[] {new ArmTruth(300, 0.05, 1.5, 1.2), new ArmTruth(60_000, 0.03, 2.0, 1.8),
            new ArmTruth(2_000, 0.8, 0.5, 0.7)}) {
            double[][] d = simulate(t, DRAWS, 17);
            double n = t.usersPerDay(), p = t.payerRate(), mu = t.logSpendMean(), s2 = t.logSpendSd() * t.logSpendSd();
            Moment m = Moment.of(d[0]), a = Moment.of(d[1]), b = Moment.of(d[2]);
            near(n * p, m, t + " payers");
            near(n * p * mu, a, t + " sum of log spend");
            near(n * p * (mu * mu + s2), b, t + " sum of squared log spend");
            // variances: Var m = n p (1 - p); Var S1 = n p sigma^2 + mu^2 n p (1 - p) (law of total variance);
            // a sample variance of 40,000 draws is within a few percent
            assertEquals(n * p * (1 - p), m.variance(), 0.05 * n * p * (1 - p), t + " Var payers");
            double varS1 = n * p * s2 + mu * mu * n * p * (1 - p);
            assertEquals(varS1, a.variance(), 0.05 * varS1, t + " Var S1");
        }
    }

    @Test
    void theDistributionsAreThoseOfSimulatedUsers() {
        ArmTruth t = new ArmTruth(400, 0.04, 1.2, 1.5);
        int draws = 4_000;
        double[][] fast = simulate(t, draws, 5);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(6L);
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        double[][] slow = new double[3][draws];
        for (int i = 0; i < draws; i++) {
            for (int u = 0; u < t.usersPerDay(); u++) {
                if (rng.nextDouble() < t.payerRate()) {
                    double x = t.logSpendMean() + t.logSpendSd() * normal.sample();
                    slow[0][i]++;
                    slow[1][i] += x;
                    slow[2][i] += x * x;
                }
            }
        }
        KolmogorovSmirnovTest ks = new KolmogorovSmirnovTest();
        String[] names = {"payers", "sum of log spend", "sum of squared log spend"};
        for (int k = 1; k < 3; k++) { // continuous sums; payers are discrete (moments above)
            double pValue = ks.kolmogorovSmirnovTest(fast[k], slow[k]);
            assertTrue(pValue > 1e-3, names[k] + ": p = " + pValue);
        }
        Moment fastPayers = Moment.of(fast[0]), slowPayers = Moment.of(slow[0]);
        assertTrue(Math.abs(fastPayers.mean() - slowPayers.mean()) < 4.5 * Math.hypot(fastPayers.se(), slowPayers.se()));
    }

    @Test
    void edgeCasesGiveTheirOnlyPossibleDays() {
        double[] day = new double[4];
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(1L);
        DailyStats.of(new ArmTruth(0, 0.1, 1, 1)).start(rng).next(day);
        assertEquals(0, day[1]);
        DailyStats.of(new ArmTruth(500, 0, 1, 1)).start(rng).next(day);
        assertEquals(0, day[1]);
        assertEquals(0, day[2]);
        DailyStats.of(new ArmTruth(500, 1, 1, 1)).start(rng).next(day);
        assertEquals(500, day[1]);
        assertTrue(day[3] >= day[2] * day[2] / 500, "S2 >= S1^2 / m, as any data give");
        assertEquals(1, DailyStats.of(new ArmTruth(1_000_000, 1, 1, 1)).chunkCount());
        assertTrue(DailyStats.of(new ArmTruth(1_000_000, 0.05, 1, 1)).chunkCount() > 1);
    }
}
