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
}
