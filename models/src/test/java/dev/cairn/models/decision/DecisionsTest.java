package dev.cairn.models.decision;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.result.Comparison;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/** The decision arithmetic by hand on a few draws. */
class DecisionsTest {

    @Test
    void comparisonFiguresByHand() {
        double[] arm = {2, 3, 5, 1}, control = {1, 4, 5, 2};
        Comparison c = Decisions.compare("B", "A", "arpu", arm, control, 0.95);
        assertEquals(0.25, c.probAbove(), 0, "above in draw 1 only (ties are not above)");
        assertEquals((0 + 1 + 0 + 1) / 4.0, c.expectedLoss(), 1e-15, "E[max(control - arm, 0)]");
        assertEquals((1 - 1 + 0 - 1) / 4.0, c.difference().mean(), 1e-15);
        assertEquals((1 - 0.25 + 0 - 0.5) / 4.0, c.lift().mean(), 1e-15);
    }

    @Test
    void noLiftWhereTheControlCanBeZero() {
        Comparison c = Decisions.compare("B", "A", "d7", new double[] {0.1, 0.2}, new double[] {0.0, 0.1}, 0.95);
        assertNull(c.lift());
        assertEquals(1.0, c.probAbove(), 0, "the rest of the comparison stays");
        double[] lift = Decisions.liftDraws(new double[] {0.1, 0.2}, new double[] {0.0, 0.1});
        assertTrue(Double.isNaN(lift[0]));
        assertEquals(1.0, lift[1], 1e-15);
    }

    @Test
    void probBestCountsTheDrawsEachArmLeads() {
        Map<String, double[]> draws = Map.of("A", new double[] {1, 5, 3, 0}, "B", new double[] {2, 4, 1, 0},
                "C", new double[] {0, 0, 9, 0});
        Map<String, Double> best = Decisions.probBest(List.of("A", "B", "C"), draws::get);
        assertEquals(0.5, best.get("A"), 0, "draw 2 and draw 4 (a tie goes to the first arm)");
        assertEquals(0.25, best.get("B"), 0);
        assertEquals(0.25, best.get("C"), 0);
    }

    @Test
    void compareAllPairsEveryOtherArmWithEveryMetricInOrder() {
        List<Comparison> all = Decisions.compareAll(List.of("A", "B", "C"), "B", List.of("m1", "m2"),
                (metric, arm) -> new double[] {arm.charAt(0), metric.charAt(1)}, 0.9);
        assertEquals(List.of("A/m1", "A/m2", "C/m1", "C/m2"),
                all.stream().map(c -> c.arm() + "/" + c.metric()).toList());
    }

    @Test
    void theRuleShipsKeepsOrWaitsByExpectedLossAgainstTheTolerance() {
        double[] a = {1.0, 1.1, 0.9, 1.0}, b = {1.5, 1.6, 1.4, 1.5}, noisy = {0.2, 2.0, 0.4, 1.8};
        dev.cairn.models.result.Metric arpu = dev.cairn.models.result.Metric.ARPU;
        Map<String, double[]> dominant = Map.of("A", a, "B", b);
        var d = Decisions.decide(List.of("A", "B"), "A", arpu, dominant::get, null, 0.95, "EUR");
        assertEquals("ship", d.outcome());
        assertEquals("B", d.arm());
        assertEquals(0.0, d.arms().get(1).expectedLoss(), 0, "B is best in every draw");
        assertEquals(0.5, d.arms().get(0).expectedLoss(), 1e-12, "A loses 0.5 in every draw");
        assertEquals(0.01, d.tolerance(), 1e-12, "default: 1% of the control's mean (1.0)");
        assertEquals("default", d.toleranceSource());
        assertTrue(d.statement().startsWith("Ship B: it is the best arm on ARPU with probability 100%"), d.statement());
        assertTrue(d.statement().contains("EUR per user"), d.statement());

        Map<String, double[]> controlBest = Map.of("A", b, "B", a);
        d = Decisions.decide(List.of("A", "B"), "A", arpu, controlBest::get, null, 0.95, null);
        assertEquals("keep-control", d.outcome());
        assertEquals("A", d.arm());

        // losses: A loses max(noisy - a, 0) = (0, 0.9, 0, 0.8) -> 0.425; B loses (0.8, 0, 0.5, 0) -> 0.325
        Map<String, double[]> unclear = Map.of("A", a, "B", noisy);
        d = Decisions.decide(List.of("A", "B"), "A", arpu, unclear::get, 0.05, 0.95, null);
        assertEquals("keep-collecting", d.outcome());
        assertEquals("B", d.arm(), "the least expected loss so far");
        assertEquals(0.325, d.arms().get(1).expectedLoss(), 1e-12);
        assertEquals(0.425, d.arms().get(0).expectedLoss(), 1e-12);
        assertEquals("spec", d.toleranceSource());
        d = Decisions.decide(List.of("A", "B"), "A", arpu, unclear::get, 0.5, 0.95, null);
        assertEquals("ship", d.outcome(), "a tolerance above the least loss acts");
    }

    /**
     * With two arms whose difference D = B - A is normal N(m, s^2), the expected loss of choosing A is
     * E[max(D, 0)] = m Phi(m / s) + s phi(m / s), the mean of a rectified normal (a standard identity; Phi and
     * phi from commons-math3). Checked on 400,000 paired draws within 4 Monte Carlo standard errors.
     */
    @Test
    void expectedLossMatchesTheRectifiedNormalMean() {
        int n = 400_000;
        double m = 0.3, s = 0.5;
        var rng = dev.cairn.samplers.RandomStreams.forChain(11, 0);
        var normal = org.apache.commons.rng.sampling.distribution.ZigguratSampler.NormalizedGaussian.of(rng);
        double[] a = new double[n], b = new double[n];
        double sq = 0;
        for (int i = 0; i < n; i++) {
            a[i] = 10 + normal.sample();
            b[i] = a[i] + m + s * normal.sample();
            double loss = Math.max(b[i] - a[i], 0);
            sq += loss * loss;
        }
        var std = new org.apache.commons.math3.distribution.NormalDistribution(null, 0, 1);
        double expected = m * std.cumulativeProbability(m / s) + s * std.density(m / s);
        Map<String, double[]> draws = Map.of("A", a, "B", b);
        var d = Decisions.decide(List.of("A", "B"), "A", dev.cairn.models.result.Metric.ARPU, draws::get, null, 0.95, null);
        double mcse = Math.sqrt((sq / n - expected * expected) / n);
        assertEquals(expected, d.arms().get(0).expectedLoss(), 4 * mcse);
    }
}
