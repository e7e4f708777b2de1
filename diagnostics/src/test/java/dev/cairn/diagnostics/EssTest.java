package dev.cairn.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

class EssTest {

    /**
     * Textbook result: an AR(1) chain with coefficient rho has integrated autocorrelation time
     * (1 + rho) / (1 - rho), so N draws are worth N (1 - rho) / (1 + rho) independent ones
     * (e.g. Geyer 1992, Statistical Science 7(4), section 3). Bulk-ESS works on ranks, whose
     * autocorrelation is close to that of the Gaussian draws.
     */
    @ParameterizedTest(name = "rho = {0}")
    @ValueSource(doubles = {0.0, 0.5, 0.9, -0.3})
    void bulkEssOfAr1MatchesTheTextbookValue(double rho) {
        int m = 4, n = 50_000;
        double[][] x = Simulated.ar1(m, n, rho, 1234 + (long) (rho * 100));
        ParameterDiagnostics d = Diagnostics.of("x", x);
        double expected = (double) m * n * (1 - rho) / (1 + rho);
        assertEquals(expected, d.essBulk(), 0.10 * expected, "bulk-ESS for rho=" + rho);
        assertEquals(expected, d.essMean(), 0.10 * expected, "ESS of the mean for rho=" + rho);
        assertTrue(d.rhat() < 1.01, "R-hat " + d.rhat());
    }

    /** The FFT autocovariance (two chains per transform) equals the direct sum at every lag. */
    @Test
    void fftAutocovarianceEqualsTheDirectSum() {
        double[][] x = Simulated.ar1(3, 257, 0.7, 5);
        double[][] acov = Autocovariance.of(x);
        for (int c = 0; c < x.length; c++) {
            double mean = Autocovariance.mean(x[c]);
            for (int t = 0; t < x[c].length; t += 17) {
                double s = 0;
                for (int i = 0; i + t < x[c].length; i++) {
                    s += (x[c][i] - mean) * (x[c][i + t] - mean);
                }
                assertEquals(s / x[c].length, acov[c][t], 1e-9, "chain " + c + " lag " + t);
            }
        }
    }

    /**
     * The staged padding (shortest transform first, longer only when more lags are needed) gives the ESS
     * that full padding gives, for chains that truncate early, late and very late.
     */
    @ParameterizedTest(name = "rho = {0}")
    @ValueSource(doubles = {0.0, 0.6, 0.95, 0.995, -0.5})
    void stagedPaddingGivesTheFullPaddingEss(double rho) {
        for (int n : new int[] {1000, 1009, 2000, 4096}) {
            Flat chains = Flat.of(Simulated.ar1(4, n, rho, 31 + n));
            double staged = Ess.of(chains);
            double full = Ess.of(chains, Autocovariance.of(chains, 0));
            assertEquals(full, staged, 1e-9 * full, "n=" + n + " rho=" + rho);
        }
    }

    /** Property over seeded random chain shapes: 0 < ESS <= S log10 S (the antithetic cap). */
    @Test
    void essIsPositiveAndBounded() {
        SplittableRandom random = new SplittableRandom(77);
        for (int k = 0; k < 60; k++) {
            int m = 1 + random.nextInt(4);
            int n = 8 + random.nextInt(3000);
            double rho = random.nextDouble(-0.95, 0.99);
            double[][] x = Simulated.ar1(m, n, rho, random.nextLong());
            ParameterDiagnostics d = Diagnostics.of("x", x);
            double total = (double) m * (n - n % 2);
            for (double ess : new double[] {d.essBulk(), d.essTail(), d.essMean()}) {
                assertTrue(ess > 0 && ess <= total * Math.log10(total) + 1e-9,
                        "ESS " + ess + " for m=" + m + " n=" + n + " rho=" + rho);
            }
        }
    }

    /**
     * Property: rank-based diagnostics (bulk R-hat, bulk-ESS, tail-ESS) depend on the draws only through
     * their order, so any increasing transform leaves them unchanged.
     */
    @Test
    void rankDiagnosticsAreInvariantToMonotoneTransforms() {
        SplittableRandom random = new SplittableRandom(8);
        for (int k = 0; k < 20; k++) {
            double[][] x = Simulated.shift(Simulated.ar1(4, 400 + random.nextInt(400), random.nextDouble(0, 0.9),
                    random.nextLong()), 1, random.nextDouble(0, 0.5));
            ParameterDiagnostics a = Diagnostics.of("x", x);
            ParameterDiagnostics b = Diagnostics.of("exp x", Simulated.map(x, Math::exp));
            ParameterDiagnostics c = Diagnostics.of("x^3", Simulated.map(x, v -> v * v * v + v));
            for (ParameterDiagnostics other : new ParameterDiagnostics[] {b, c}) {
                assertEquals(a.rhatBulk(), other.rhatBulk(), 1e-12);
                assertEquals(a.essBulk(), other.essBulk(), 1e-9 * a.essBulk());
                assertEquals(a.essTail(), other.essTail(), 1e-9 * a.essTail());
            }
        }
    }
}
