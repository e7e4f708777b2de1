package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** Draws that are not finite make a parameter's diagnostics undefined and the verdict say so, by name. */
class NonFiniteTest {

    @Test
    void anOverflowIsAReasonNamingTheParameterNotACrash() {
        double[][] ok = new double[4][100];
        double[][] bad = new double[4][100];
        for (int c = 0; c < 4; c++) {
            for (int t = 0; t < 100; t++) {
                ok[c][t] = Math.sin(31.0 * t + c);
                bad[c][t] = Math.cos(17.0 * t + c);
            }
        }
        bad[2][40] = Double.POSITIVE_INFINITY;
        bad[3][7] = Double.NaN;
        DiagnosticsReport report = Diagnostics.of(List.of("ok", "arppu[x/A]"), List.of(ok, bad),
                new Thresholds(1.05, 1));
        assertFalse(report.converged());
        String reason = String.join("; ", report.reasons());
        assertTrue(reason.contains("R-hat, bulk-ESS and tail-ESS of arppu[x/A] are undefined"), reason);
        assertTrue(reason.contains("2 draws are not finite (first at chain 3, draw 41: Infinity)"), reason);
        assertFalse(reason.contains("()"), reason);
    }
}
