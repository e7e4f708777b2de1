package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The diagnostics at the edges against stored values from the reference implementation: R package
 * 'posterior' 1.4.0 (Vehtari et al. 2021), computed by fixtures/reference/diagnostics-edges/make.R on the
 * draws files beside it (R is not needed to run this test). Where cairn deliberately differs, the
 * assertion says why.
 */
class EdgeReferenceTest {
    private static final Path DIR = Path.of("..", "fixtures", "reference", "diagnostics-edges");
    private static final double RELATIVE = 1e-9;

    private static double[][] draws(String name) throws IOException {
        List<String> lines = Files.readAllLines(DIR.resolve(name + ".csv"));
        Map<Integer, List<Double>> byChain = new java.util.TreeMap<>();
        for (String line : lines.subList(1, lines.size())) {
            String[] cells = line.split(",");
            byChain.computeIfAbsent(Integer.parseInt(cells[0]), c -> new java.util.ArrayList<>())
                    .add(Double.parseDouble(cells[2]));
        }
        return byChain.values().stream().map(l -> l.stream().mapToDouble(Double::doubleValue).toArray())
                .toArray(double[][]::new);
    }

    private static Map<String, double[]> reference() throws IOException {
        Map<String, double[]> out = new HashMap<>();
        for (String line : Files.readAllLines(DIR.resolve("reference.csv"))) {
            if (line.startsWith("#") || line.startsWith("case,")) {
                continue;
            }
            String[] cells = line.split(",");
            double[] v = new double[4];
            for (int i = 0; i < 4; i++) {
                v[i] = cells[i + 1].equals("NA") ? Double.NaN : Double.parseDouble(cells[i + 1]);
            }
            out.put(cells[0], v);
        }
        return out;
    }

    private static void close(double expected, double actual, String what) {
        if (Double.isNaN(expected)) {
            assertTrue(Double.isNaN(actual), what + ": reference undefined, cairn " + actual);
        } else {
            assertEquals(expected, actual, RELATIVE * Math.abs(expected), what);
        }
    }

    private static ParameterDiagnostics check(String name, boolean rhat, boolean essBulk, boolean essTail, boolean mcse)
            throws IOException {
        double[] ref = reference().get(name);
        ParameterDiagnostics p = Diagnostics.of(name, draws(name));
        if (rhat) {
            close(ref[0], p.rhat(), name + " R-hat");
        }
        if (essBulk) {
            close(ref[1], p.essBulk(), name + " bulk-ESS");
        }
        if (essTail) {
            close(ref[2], p.essTail(), name + " tail-ESS");
        }
        if (mcse) {
            close(ref[3], p.mcseMean(), name + " MCSE of the mean");
        }
        return p;
    }

    @Test
    void ordinaryEdgesAgreeWithTheReference() throws IOException {
        check("single_chain", true, true, true, true);
        check("odd_length", true, true, true, true);
        check("median_ties", true, true, true, true);
    }

    /** Alternating draws: the first autocorrelation pair sums to 0; the reference gives ESS = S/2. */
    @Test
    void antiCorrelatedChainsGetHalfTheDraws() throws IOException {
        ParameterDiagnostics p = check("alternating", false, true, true, true);
        assertEquals(2000, p.essBulk(), 1e-9);
        // R-hat: the folded draws |x - median| are all 1, so the reference's max(bulk, folded) is NA; cairn
        // reports the bulk R-hat alone (defined, and the note says why) rather than hide a usable number.
        assertTrue(p.rhat() > 0.99 && p.rhat() < 1.01, "bulk R-hat " + p.rhat());
        assertTrue(p.note().contains("folded"), p.note());
    }

    /** Half ones in a 0/1 parameter: the 95% indicator is constant, so tail-ESS is undefined in both. */
    @Test
    void foldedConstantBinaryDraws() throws IOException {
        ParameterDiagnostics p = check("binary_half", false, true, true, true);
        assertTrue(p.note().contains("tail-ESS is undefined"), p.note());
        DiagnosticsReport r = DiagnosticsReport.of(List.of(p), Thresholds.DEFAULT);
        String reason = String.join("; ", r.reasons());
        assertTrue(reason.contains("tail-ESS of binary_half is undefined: "), reason);
        assertTrue(!reason.contains("()"), reason);
    }

    /** Every draw the same: undefined in both, named constant. */
    @Test
    void constantColumn() throws IOException {
        ParameterDiagnostics p = check("constant", true, true, true, false);
        assertTrue(p.note().startsWith("constant"), p.note());
        assertEquals(0, p.sd());
    }

    /**
     * Values differing only in the last bit (1 and 1 + 2^-52). Deliberate difference: the reference ranks the
     * two values and returns R-hat 0.9998 and bulk-ESS 3755 for what is rounding; cairn treats draws within
     * 64 ulps of each other as one value and calls the parameter constant.
     */
    @Test
    void rangeBelowMachineEpsilonIsConstant() throws IOException {
        double[] ref = reference().get("below_epsilon");
        assertTrue(Double.isFinite(ref[0]), "the reference gives a number here");
        ParameterDiagnostics p = Diagnostics.of("below_epsilon", draws("below_epsilon"));
        assertTrue(Double.isNaN(p.rhat()) && Double.isNaN(p.essBulk()), p.toString());
        assertTrue(p.note().startsWith("constant"), p.note());
    }

    /**
     * Each chain constant at a different value. Deliberate difference: the reference returns R-hat 4.05e14
     * (rounding noise in the within-chain variance of identical z-scores) and bulk-ESS 4.03; cairn reports
     * R-hat = +infinity, ESS undefined, and says the chains are stuck, whatever the chain length.
     */
    @Test
    void stuckChainsAreNamedOnAnyLength() throws IOException {
        double[] ref = reference().get("stuck");
        assertTrue(ref[0] > 1e13, "the reference's R-hat is rounding noise: " + ref[0]);
        ParameterDiagnostics p = Diagnostics.of("stuck", draws("stuck"));
        assertEquals(Double.POSITIVE_INFINITY, p.rhat());
        assertTrue(Double.isNaN(p.essBulk()));
        assertTrue(p.note().startsWith("chains are stuck"), p.note());
        DiagnosticsReport r = DiagnosticsReport.of(List.of(p), Thresholds.DEFAULT);
        String reason = String.join("; ", r.reasons());
        assertTrue(reason.contains("R-hat of stuck is"), reason);
        assertTrue(reason.contains("bulk-ESS and tail-ESS of stuck are undefined: chains are stuck"), reason);
        for (int n : new int[] {6, 999, 1000}) {
            double[][] chains = new double[3][n];
            for (int c = 0; c < 3; c++) {
                java.util.Arrays.fill(chains[c], 0.1 * (c + 1));
            }
            assertEquals(Double.POSITIVE_INFINITY, Diagnostics.of("s", chains).rhat(), "length " + n);
        }
    }
}
