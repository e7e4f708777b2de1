package dev.cairn.diagnostics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.IntStream;

/**
 * Convergence diagnostics following Vehtari, Gelman, Simpson, Carpenter & Buerkner (2021),
 * "Rank-normalization, folding, and localization: an improved R-hat for assessing convergence of MCMC",
 * Bayesian Analysis 16(2):667-718:
 * <ul>
 *   <li>split every chain into halves;</li>
 *   <li>bulk: rank-normalise the split chains (see {@link RankNormal}); R-hat and ESS of the z-scores;</li>
 *   <li>folded: the same on |x - median|, which catches chains that agree in location but not in spread;
 *       R-hat = max(bulk R-hat, folded R-hat);</li>
 *   <li>tail-ESS: the smaller ESS of the indicators I(x <= q05) and I(x <= q95) (split, not ranked);</li>
 *   <li>MCSE of the mean: sd / sqrt(ESS of the split draws).</li>
 * </ul>
 * MCSEs of the sd and of quantiles, needed for a few summaries rather than every parameter, are in
 * {@link Mcse}.
 */
public final class Diagnostics {
    private Diagnostics() {
    }

    /**
     * Diagnostics of one parameter's draws laid out as chains[m][n]. Draws that are not finite (an overflow
     * in a derived quantity, a sampler that failed) leave every diagnostic undefined, and the note says
     * where they are.
     *
     * @param name   the parameter's name
     * @param chains draws[chain][iteration] (not modified)
     * @return the diagnostics
     * @throws IllegalArgumentException when the chains are empty or of unequal lengths
     */
    public static ParameterDiagnostics of(String name, double[][] chains) {
        Chains.checkLayout(chains);
        int m = chains.length;
        int n = chains[0].length;
        String nonFinite = Chains.nonFinite(chains);
        if (nonFinite != null) {
            double nan = Double.NaN;
            return new ParameterDiagnostics(name, m, n, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan,
                    nonFinite + ", so R-hat and ESS are undefined");
        }
        double[] all = Chains.pool(chains);
        double mean = Autocovariance.mean(all);
        double sd = Math.sqrt(Ess.variance(all));
        double nan = Double.NaN;
        // Flat chains: variation within every chain is rounding (a scale-relative tolerance), so ranks and
        // autocorrelations would measure noise. The reference implementation returns such noise as numbers
        // (R-hat around 1e14 for stuck chains); here they are named for what they are.
        double tolerance = Chains.tolerance(chains);
        int flatChains = 0;
        for (double[] chain : chains) {
            flatChains += Chains.flat(chain, tolerance) ? 1 : 0;
        }
        if (flatChains == m) {
            if (Chains.flat(all, tolerance)) {
                return new ParameterDiagnostics(name, m, n, mean, 0, all[0], nan, nan, nan, nan, nan, nan, 0,
                        "constant: every draw is " + all[0] + (tolerance > 0 ? " (to rounding)" : "")
                                + ", so R-hat and ESS are undefined");
            }
            double inf = Double.POSITIVE_INFINITY;
            return new ParameterDiagnostics(name, m, n, mean, sd, Quantiles.of(all, 0.5), inf, inf, inf, nan, nan,
                    nan, nan, "chains are stuck: each chain keeps one value, and the chains' values differ");
        }
        if (n < 4) {
            double median = Quantiles.of(all, 0.5);
            return new ParameterDiagnostics(name, m, n, mean, sd, median, nan, nan, nan, nan, nan, nan, nan,
                    "only " + n + " draws per chain: at least 4 are needed for R-hat and ESS");
        }
        Flat split = Flat.split(chains);
        double[] pooled = split.values();
        int[] order = Ranking.order(pooled);
        double[] splitSorted = new double[pooled.length];
        for (int k = 0; k < order.length; k++) {
            splitSorted[k] = pooled[order[k]];
        }

        Flat z = RankNormal.of(split, order);
        double rhatBulk = Rhat.basic(z);
        double splitMedian = Quantiles.ofSorted(splitSorted, 0.5);
        // With an even chain length the split draws are all the draws; otherwise the middle ones are left out.
        double median = n % 2 == 0 ? splitMedian : Quantiles.of(all, 0.5);
        // Folding and the tail quantiles use all draws (as the reference does), which for an odd chain length
        // include the middle draws the split leaves out.
        double[] folded = new double[pooled.length];
        for (int i = 0; i < folded.length; i++) {
            folded[i] = Math.abs(pooled[i] - median);
        }
        double rhatFolded = Rhat.basic(RankNormal.of(split.with(folded),
                Ranking.foldedOrder(pooled, order, median)));
        double rhat = Double.isNaN(rhatBulk) || Double.isNaN(rhatFolded)
                ? (Double.isNaN(rhatBulk) ? rhatFolded : rhatBulk)
                : Math.max(rhatBulk, rhatFolded);

        double essBulk = Ess.of(z);
        // Tail-ESS: indicators of the 5% and 95% quantiles (reusing the folded buffer).
        boolean even = n % 2 == 0;
        double q05 = even ? Quantiles.ofSorted(splitSorted, 0.05) : Quantiles.of(all, 0.05);
        double q95 = even ? Quantiles.ofSorted(splitSorted, 0.95) : Quantiles.of(all, 0.95);
        double essTail = Math.min(indicatorEss(split, q05, folded), indicatorEss(split, q95, folded));
        double essMean = Ess.of(split);
        double mcseMean = sd / Math.sqrt(essMean);

        List<String> notes = new ArrayList<>();
        if (m == 1) {
            notes.add("one chain: R-hat compares its two halves only");
        }
        if (flatChains > 0) {
            notes.add(flatChains + " of " + m + " chains are stuck at one value");
        }
        if (Double.isNaN(rhatFolded)) {
            notes.add("the folded draws |x - median| are constant, so R-hat is the bulk R-hat alone");
        }
        if (Double.isNaN(essTail)) {
            notes.add("the 5% or 95% quantile indicator is constant (a discrete parameter at its edge), so tail-ESS"
                    + " is undefined");
        }
        String note = String.join("; ", notes);
        return new ParameterDiagnostics(name, m, n, mean, sd, median, rhat, rhatBulk, rhatFolded,
                essBulk, essTail, essMean, mcseMean, note);
    }

    /**
     * Diagnostics of several parameters (computed in parallel; the result does not depend on the
     * number of threads) with a verdict against {@code thresholds}.
     *
     * @param names      the parameters' names
     * @param draws      per parameter, its draws as chains[m][n] (same order as names)
     * @param thresholds the convergence thresholds of the verdict
     * @return every parameter's diagnostics and the verdict
     * @throws IllegalArgumentException when the lists differ in length or a parameter's chains are ragged
     */
    public static DiagnosticsReport of(List<String> names, List<double[][]> draws, Thresholds thresholds) {
        if (names.size() != draws.size()) {
            throw new IllegalArgumentException(names.size() + " names for " + draws.size() + " parameters");
        }
        ParameterDiagnostics[] out = new ParameterDiagnostics[names.size()];
        IntStream.range(0, out.length).parallel().forEach(i -> out[i] = of(names.get(i), draws.get(i)));
        return DiagnosticsReport.of(new ArrayList<>(Arrays.asList(out)), thresholds);
    }

    /** ESS of the indicator I(x <= q), written into {@code buffer}; NaN when the indicator is constant. */
    private static double indicatorEss(Flat split, double q, double[] buffer) {
        double[] v = split.values();
        for (int i = 0; i < v.length; i++) {
            buffer[i] = v[i] <= q ? 1.0 : 0.0;
        }
        return Ess.of(split.with(buffer));
    }

}
