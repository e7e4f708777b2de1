package dev.cairn.models.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.decision.Decisions;
import dev.cairn.models.prior.Beta;
import dev.cairn.models.prior.NormalInverseGamma;
import dev.cairn.models.result.Decision;
import dev.cairn.models.result.Metric;
import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

/**
 * The plan's fast decision at a look against exact posterior draws: the approximation's error is bounded
 * where the plan uses it (every arm with at least {@link LookRule#APPROXIMATE_FROM} payers), and the draws
 * path applies the rule exactly as a fit does ({@link Decisions#decide}).
 */
class LookRuleTest {
    private static final Beta FLAT = new Beta(1, 1);
    private static final NormalInverseGamma VAGUE = new NormalInverseGamma(0, 0.01, 1, 1);
    /** Reference draws per arm: the Monte Carlo error of the reference is far below the bound. */
    private static final int REFERENCE_DRAWS = 400_000;

    private static double[][] data(UniformRandomProvider rng, int arms, long payers, double[] lift, boolean unequal) {
        double[][] stats = new double[arms][4];
        for (int a = 0; a < arms; a++) {
            double share = unequal && a == 1 ? 3 : 1;
            long users = Math.round(payers / 0.03 * share);
            ArmTruth t = new ArmTruth(users, 0.03 * (1 + lift[a % lift.length]), 1.0 + 0.5 * lift[(a + 1) % lift.length], 1.5);
            DailyStats.of(t).start(rng).next(stats[a]);
        }
        return stats;
    }

    @Test
    void approximateExpectedLossAndProbAboveStayWithinBoundsOfExactDraws() {
        UniformRandomProvider rng = RandomSource.XO_SHI_RO_256_PP.create(11L);
        double worstLoss = 0, worstAbove = 0;
        int cases = 0;
        for (Metric metric : List.of(Metric.ARPU, Metric.PAYER_RATE, Metric.ARPPU)) {
            for (long payers : new long[] {LookRule.APPROXIMATE_FROM + 40, 600, 3_000}) {
                for (int arms : new int[] {2, 4}) {
                    for (boolean unequal : new boolean[] {false, true}) {
                        double[][] stats = data(rng, arms, payers, new double[] {0, 0.04, -0.03, 0.08}, unequal);
                        LookRule exact = new LookRule(LookRule.Kind.EXPECTED_LOSS, metric, 0, null, 0.95, FLAT, VAGUE,
                                false, REFERENCE_DRAWS);
                        LookRule fast = new LookRule(LookRule.Kind.EXPECTED_LOSS, metric, 0, null, 0.95, FLAT, VAGUE,
                                true, REFERENCE_DRAWS);
                        double[][] draws = exact.posteriorDraws(stats, rng);
                        LookRule.Outcome byDraws = new LookRule.Outcome();
                        exact.decideWithDraws(draws, byDraws);
                        LookRule.Outcome approx = new LookRule.Outcome();
                        fast.decide(stats, rng, approx);
                        assertTrue(!approx.drew, "the approximation applies from " + LookRule.APPROXIMATE_FROM + " payers");
                        LognormalMixtures x = fast.mixtures(stats);
                        double control = x.mean[0];
                        for (int a = 0; a < arms; a++) {
                            // bound: a fifth of the default tolerance (1% of the control's mean), plus 2% of the loss
                            double err = Math.abs(approx.loss[a] - byDraws.loss[a]) / (0.01 * control + 0.02 * byDraws.loss[a] / 0.2);
                            worstLoss = Math.max(worstLoss, err);
                            assertTrue(err < 0.2, metric.key() + " " + payers + " payers, " + arms + " arms"
                                    + (unequal ? " (unequal)" : "") + ": expected loss of arm " + a + " " + approx.loss[a]
                                    + " vs exact draws " + byDraws.loss[a] + " (error " + err + " of the bound's scale)");
                            if (a > 0) {
                                double above = 0;
                                for (int d = 0; d < REFERENCE_DRAWS; d++) {
                                    above += draws[a][d] > draws[0][d] ? 1 : 0;
                                }
                                double gap = Math.abs(x.above(a, 0) - above / REFERENCE_DRAWS);
                                worstAbove = Math.max(worstAbove, gap);
                                assertTrue(gap < 0.01, metric.key() + " " + payers + " payers: P(above) " + x.above(a, 0)
                                        + " vs exact draws " + above / REFERENCE_DRAWS);
                            }
                        }
                        cases++;
                    }
                }
            }
        }
        System.out.printf("LookRuleTest: %d posteriors, worst expected-loss error %.3f of (1%% of the control's mean + 10%% of the loss), "
                + "worst P(above) error %.4f%n", cases, worstLoss, worstAbove);
    }

    @Test
    void drawsPathDecidesAsTheFitDoes() {
        UniformRandomProvider rng = RandomSource.XO_SHI_RO_256_PP.create(12L);
        List<String> arms = List.of("A", "B", "C");
        for (int rep = 0; rep < 30; rep++) {
            double[][] stats = data(rng, 3, 50 + 40L * rep, new double[] {0, 0.05 * (rep % 4), -0.02}, rep % 2 == 0);
            for (Double tolerance : new Double[] {null, 0.001, 0.05}) {
                LookRule rule = new LookRule(LookRule.Kind.EXPECTED_LOSS, Metric.ARPU, 0, tolerance, 0.95, FLAT, VAGUE,
                        false, 4000);
                double[][] draws = rule.posteriorDraws(stats, rng);
                LookRule.Outcome out = new LookRule.Outcome();
                rule.decideWithDraws(draws, out);
                Decision fit = Decisions.decide(arms, "A", Metric.ARPU, arm -> draws[arms.indexOf(arm)], tolerance, 0.95, null);
                assertEquals(fit.arm(), arms.get(out.arm), "chosen arm");
                String code = out.code == LookRule.SHIP ? "ship" : out.code == LookRule.KEEP_CONTROL ? "keep-control"
                        : "keep-collecting";
                assertEquals(fit.outcome(), code, "outcome");
                for (int a = 0; a < 3; a++) {
                    assertEquals(fit.arms().get(a).expectedLoss(), out.loss[a], 1e-12 * Math.max(1, out.loss[a]), "loss");
                }
            }
        }
    }

    @Test
    void smallArmsTakeExactDraws() {
        UniformRandomProvider rng = RandomSource.XO_SHI_RO_256_PP.create(13L);
        double[][] stats = data(rng, 2, LookRule.APPROXIMATE_FROM / 2, new double[] {0, 0.1}, false);
        LookRule rule = new LookRule(LookRule.Kind.EXPECTED_LOSS, Metric.ARPU, 0, null, 0.95, FLAT, VAGUE, true, 1000);
        LookRule.Outcome out = new LookRule.Outcome();
        rule.decide(stats, rng, out);
        assertTrue(out.drew);
    }

    @Test
    void probAboveShipsOnlyPastTheThreshold() {
        // two arms, known normal-approximation answer: P(B > A) for Beta posteriors of 10,000 users each
        double[][] stats = {{10_000, 1_000, 0, 0}, {10_000, 1_060, 0, 0}};
        LookRule rule = new LookRule(LookRule.Kind.PROB_ABOVE, Metric.PAYER_RATE, 0, null, 0.95, FLAT, VAGUE, true, 1000);
        double p = rule.mixtures(stats).above(1, 0);
        // z = 0.006 / sqrt(0.1 x 0.9 / 10^4 + 0.106 x 0.894 / 10^4) = 1.39 -> about 0.92 (normal approximation)
        assertEquals(0.918, p, 0.01);
        LookRule.Outcome out = new LookRule.Outcome();
        rule.decide(stats, null, out);
        assertEquals(LookRule.KEEP_COLLECTING, out.code);
        LookRule lower = new LookRule(LookRule.Kind.PROB_ABOVE, Metric.PAYER_RATE, 0, null, 0.90, FLAT, VAGUE, true, 1000);
        lower.decide(stats, null, out);
        assertEquals(LookRule.SHIP, out.code);
        assertEquals(1, out.arm);
    }
}
