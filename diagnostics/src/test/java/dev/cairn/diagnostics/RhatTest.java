package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

class RhatTest {

    @Test
    void chainsWithShiftedMeansAreCaught() {
        double[][] x = Simulated.shift(Simulated.ar1(4, 1000, 0.3, 1), 2, 1.0);
        ParameterDiagnostics d = Diagnostics.of("x", x);
        assertTrue(d.rhat() > 1.05, "R-hat " + d.rhat());
    }

    /**
     * The motivating case of Vehtari et al. (2021, section 3.1, Figure 2): one chain three times wider
     * than the others with the same location. The bulk (location) R-hat barely moves; the folded R-hat,
     * computed on |x - median|, exposes it.
     */
    @Test
    void aWiderChainIsCaughtByTheFoldedRhatOnly() {
        double[][] x = Simulated.scale(Simulated.ar1(4, 1000, 0.0, 2), 0, 3.0);
        ParameterDiagnostics d = Diagnostics.of("x", x);
        assertTrue(d.rhatFolded() > 1.05, "folded R-hat " + d.rhatFolded());
        assertTrue(d.rhatBulk() < 1.02, "bulk R-hat " + d.rhatBulk());
        assertEquals(d.rhatFolded(), d.rhat(), 0.0);
    }

    @Test
    void aTrendWithinEachChainIsCaughtBySplitting() {
        // All chains drift the same way: whole-chain means agree, but first and second halves do not.
        double[][] x = Simulated.ar1(4, 1000, 0.0, 3);
        for (double[] chain : x) {
            for (int t = 0; t < chain.length; t++) {
                chain[t] += 3.0 * t / chain.length;
            }
        }
        assertTrue(Diagnostics.of("x", x).rhat() > 1.05);
    }

    @Test
    void constantParameterIsReportedPlainly() {
        double[][] x = {{2.5, 2.5, 2.5, 2.5, 2.5}, {2.5, 2.5, 2.5, 2.5, 2.5}};
        ParameterDiagnostics d = Diagnostics.of("fixed", x);
        assertFalse(d.defined());
        assertTrue(d.note().startsWith("constant"), d.note());
        assertEquals(2.5, d.mean(), 0);
        DiagnosticsReport r = DiagnosticsReport.of(List.of(d, Diagnostics.of("x", Simulated.ar1(2, 1000, 0, 4))),
                new Thresholds(1.01, 100));
        assertTrue(r.converged(), r.reasons().toString());
        assertTrue(r.notes().get(0).contains("fixed: constant"), r.notes().toString());
    }

    @Test
    void stuckChainsAreNeverConverged() {
        double[][] x = {{1, 1, 1, 1, 1, 1}, {2, 2, 2, 2, 2, 2}};
        ParameterDiagnostics d = Diagnostics.of("stuck", x);
        assertEquals(Double.POSITIVE_INFINITY, d.rhat());
        DiagnosticsReport r = DiagnosticsReport.of(List.of(d), Thresholds.DEFAULT);
        assertFalse(r.converged());
        assertTrue(r.reasons().get(0).contains("R-hat of stuck is infinite"), r.reasons().toString());
    }

    @Test
    void singleChainUsesItsHalves() {
        ParameterDiagnostics d = Diagnostics.of("x", Simulated.ar1(1, 4000, 0.2, 5));
        assertTrue(d.rhat() < 1.01, "R-hat " + d.rhat());
        assertTrue(d.note().contains("one chain"), d.note());
        assertTrue(Double.isFinite(d.essBulk()));
    }

    @Test
    void tooFewDrawsAreExplained() {
        ParameterDiagnostics d = Diagnostics.of("x", new double[][] {{1, 2, 3}, {2, 3, 1}});
        assertFalse(d.defined());
        assertTrue(d.note().contains("at least 4"), d.note());
        assertFalse(DiagnosticsReport.of(List.of(d), Thresholds.DEFAULT).converged());
    }

    @Test
    void verdictListsEveryReason() {
        double[][] slow = Simulated.ar1(4, 500, 0.98, 6);
        DiagnosticsReport r = Diagnostics.of(List.of("slow"), List.<double[][]>of(slow), Thresholds.DEFAULT);
        assertFalse(r.converged());
        assertTrue(r.reasons().stream().anyMatch(s -> s.startsWith("bulk-ESS of slow")), r.reasons().toString());
        assertTrue(r.reasons().stream().anyMatch(s -> s.startsWith("tail-ESS of slow")), r.reasons().toString());
        DiagnosticsReport lenient = Diagnostics.of(List.of("slow"), List.<double[][]>of(slow), new Thresholds(2.0, 1));
        assertTrue(lenient.converged(), lenient.reasons().toString());
    }
}
