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

    /** Diagnostics of one parameter's draws laid out as chains[m][n]. */
    public static ParameterDiagnostics of(String name, double[][] chains) {
        Chains.check(chains);
        int m = chains.length;
        int n = chains[0].length;
        double[] all = Chains.pool(chains);
        double mean = Autocovariance.mean(all);
        double sd = Math.sqrt(Ess.variance(all));
        double nan = Double.NaN;
        if (Chains.constant(chains)) {
            return new ParameterDiagnostics(name, m, n, mean, 0, all[0], nan, nan, nan, nan, nan, nan, 0,
                    "constant: every draw is " + all[0] + ", so R-hat and ESS are undefined");
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
        double[] folded = new double[pooled.length];
        for (int i = 0; i < folded.length; i++) {
            folded[i] = Math.abs(pooled[i] - splitMedian);
        }
        double rhatFolded = Rhat.basic(RankNormal.of(split.with(folded),
                Ranking.foldedOrder(pooled, order, splitMedian)));
        double rhat = Double.isNaN(rhatBulk) || Double.isNaN(rhatFolded)
                ? (Double.isNaN(rhatBulk) ? rhatFolded : rhatBulk)
                : Math.max(rhatBulk, rhatFolded);

        double essBulk = Ess.of(z);
        // Tail-ESS: indicators of the 5% and 95% quantiles (reusing the folded buffer).
        double essTail = Math.min(
                indicatorEss(split, Quantiles.ofSorted(splitSorted, 0.05), folded),
                indicatorEss(split, Quantiles.ofSorted(splitSorted, 0.95), folded));
        double essMean = Ess.of(split);
        double mcseMean = sd / Math.sqrt(essMean);

        String note = m == 1 ? "one chain: R-hat compares its two halves only" : "";
        if (Double.isInfinite(rhat)) {
            note = "chains are stuck: no variation within chains, different values between them";
        }
        return new ParameterDiagnostics(name, m, n, mean, sd, median, rhat, rhatBulk, rhatFolded,
                essBulk, essTail, essMean, mcseMean, note);
    }

    /**
     * Diagnostics of several parameters (computed in parallel; the result does not depend on the
     * number of threads) with a verdict against {@code thresholds}.
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
