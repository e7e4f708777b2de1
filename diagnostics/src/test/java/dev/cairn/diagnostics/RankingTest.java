package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class RankingTest {

    /** Twice the average rank by the definition, O(S^2): count smaller values and ties. */
    private static int[] naiveTwiceRanks(double[] x) {
        int[] out = new int[x.length];
        for (int i = 0; i < x.length; i++) {
            int below = 0, ties = 0;
            for (double v : x) {
                if (v < x[i]) {
                    below++;
                } else if (v == x[i]) {
                    ties++;
                }
            }
            out[i] = 2 * below + ties + 1; // ranks below+1 .. below+ties, doubled average
        }
        return out;
    }

    @Test
    void ranksEqualTheDefinitionWithTiesNegativesAndNearCollisions() {
        SplittableRandom random = new SplittableRandom(3);
        for (int k = 0; k < 50; k++) {
            int s = 1 + random.nextInt(600);
            double[] x = new double[s];
            for (int i = 0; i < s; i++) {
                switch (random.nextInt(4)) {
                    case 0 -> x[i] = random.nextInt(5) - 2;                       // many exact ties, -0/0
                    case 1 -> x[i] = 1.0 + random.nextInt(1000) * Math.ulp(1.0);   // equal in the high key bits
                    case 2 -> x[i] = -random.nextDouble() * 1e6;
                    default -> x[i] = random.nextGaussian() * 1e-300;
                }
            }
            if (s > 3) {
                x[0] = -0.0;
                x[1] = 0.0;
            }
            int[] order = Ranking.order(x);
            for (int j = 1; j < s; j++) {
                assertEquals(true, x[order[j - 1]] <= x[order[j]], "order at " + j);
            }
            assertArrayEquals(naiveTwiceRanks(x), Ranking.twiceAverageRanks(x, order));
        }
    }

    @Test
    void foldedOrderSortsDistancesFromTheCentre() {
        SplittableRandom random = new SplittableRandom(4);
        for (int k = 0; k < 50; k++) {
            double[] x = new double[1 + random.nextInt(300)];
            for (int i = 0; i < x.length; i++) {
                x[i] = random.nextInt(3) == 0 ? random.nextInt(7) : random.nextGaussian() * 3;
            }
            double centre = Quantiles.of(x, 0.5);
            int[] folded = Ranking.foldedOrder(x, Ranking.order(x), centre);
            double[] distances = Arrays.stream(x).map(v -> Math.abs(v - centre)).toArray();
            double[] expected = distances.clone();
            Arrays.sort(expected);
            for (int j = 0; j < x.length; j++) {
                assertEquals(expected[j], distances[folded[j]], 0.0);
            }
        }
    }

    /**
     * R-hat on a case small enough to do by hand with the formulas of Gelman et al., Bayesian Data Analysis
     * 3rd ed., section 11.4 (eqs. 11.2-11.4): chains (1,2,3,4) and (3,4,5,6) have W = 5/3, B/n = 2,
     * var+ = (3/4)(5/3) + 2 = 3.25, R-hat = sqrt(3.25 / (5/3)) = sqrt(1.95).
     */
    @Test
    void basicRhatByHand() {
        assertEquals(Math.sqrt(1.95), Rhat.basic(new double[][] {{1, 2, 3, 4}, {3, 4, 5, 6}}), 1e-12);
    }
}
