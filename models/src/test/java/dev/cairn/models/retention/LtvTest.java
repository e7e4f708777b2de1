package dev.cairn.models.retention;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.cairn.models.data.CohortDays;
import dev.cairn.samplers.Draws;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/** LTV on a fixed curve equals the sum formula revenue x (1 + sum_{t=1..H} r(t)) (deterministic). */
class LtvTest {

    @Test
    void ltvIsTheSumFormulaOnAFixedCurve() {
        TreeMap<Integer, Long> observed = new TreeMap<>(Map.of(1, 40L));
        CohortDays data = new CohortDays(List.of("c1", "c2"), List.of("A"), new long[][] {{100}, {300}},
                List.of(List.of(observed), List.of(new TreeMap<>(observed))), "test", 2);
        RetentionPosterior m = new RetentionPosterior(data, "A", false);
        double[] x = new double[m.size];
        x[m.level] = -1.0;
        x[m.level + 1] = -0.5;
        x[m.slope] = -0.7;
        x[m.slope + 1] = -0.9;
        x[m.logSigmaL] = Math.log(0.1);
        x[m.logSigmaS] = Math.log(0.1);
        x[m.logKappa] = Math.log(100);
        x = m.coordinates(x);
        double[][][] values = new double[1][m.size][1];
        String[] names = new String[m.size];
        for (int i = 0; i < m.size; i++) {
            values[0][i][0] = x[i];
            names[i] = m.parameters.name(i);
        }
        Draws internal = Draws.of(List.of(names), values);
        int horizon = 90;
        double revenue = 0.25;
        Draws out = RetentionOutputs.of(internal, m, data.cohorts(), data.arms(), List.of(7), horizon,
                new double[][] {{revenue}});
        double sum = 1;
        for (int t = 1; t <= horizon; t++) {
            double r1 = 1 / (1 + Math.exp(-(-1.0 - 0.7 * (Math.log(1 + t) - Math.log(8)))));
            double r2 = 1 / (1 + Math.exp(-(-0.5 - 0.9 * (Math.log(1 + t) - Math.log(8)))));
            sum += (100 * r1 + 300 * r2) / 400;
        }
        assertEquals(revenue * sum, out.value(0, 0, "ltv[A]"), 1e-12);
        double d7 = (100 / (1 + Math.exp(1.0)) + 300 / (1 + Math.exp(0.5))) / 400;
        assertEquals(d7, out.value(0, 0, "d7[A]"), 1e-12);
    }
}
