package dev.cairn.diagnostics;

import java.util.Arrays;
import org.apache.commons.math3.distribution.BetaDistribution;

/** Monte Carlo standard errors of posterior quantiles. */
public final class Mcse {
    private static final double MINUS_ONE_SD = 0.15865525393145707; // Phi(-1)
    private static final double PLUS_ONE_SD = 0.8413447460685429;   // Phi(+1)

    private Mcse() {
    }

    /**
     * MCSE of the sd by the delta method: the variance is the mean of (x - mean)^2, whose MCSE is
     * sd((x - mean)^2) / sqrt(ESS of (x - mean)^2); the sd's MCSE is that divided by 2 sd.
     *
     * @param chains the draws, m chains of n draws each
     * @return the Monte Carlo standard error of the posterior sd; NaN when undefined
     */
    public static double sd(double[][] chains) {
        Chains.check(chains);
        if (Chains.constant(chains) || chains[0].length < 4) {
            return Double.NaN;
        }
        Flat split = Flat.split(chains);
        double[] all = split.values();
        double mean = Autocovariance.mean(all);
        double sd = Math.sqrt(Ess.variance(all));
        double[] squared = new double[all.length];
        for (int i = 0; i < all.length; i++) {
            squared[i] = (all[i] - mean) * (all[i] - mean);
        }
        double essSquared = Ess.of(split.with(squared));
        double sdOfSquared = Math.sqrt(Ess.variance(squared));
        return sdOfSquared / Math.sqrt(essSquared) / (2 * sd);
    }

    /**
     * MCSE of the p-quantile (Vehtari et al. 2021, section 4.3): with S the ESS of the split indicator
     * chains I(x <= q_p), the uncertainty of the cumulative probability at q_p is that of
     * Beta(S p + 1, S (1 - p) + 1); its +-1 sd quantiles are mapped back through the empirical quantile
     * function of all draws, and the MCSE is half the distance between the two. NaN when undefined.
     *
     * @param chains the draws, m chains of n draws each
     * @param p      the probability, in (0, 1)
     * @return the Monte Carlo standard error of the p-quantile
     * @throws IllegalArgumentException when p is not in (0, 1)
     */
    public static double quantile(double[][] chains, double p) {
        if (!(p > 0 && p < 1)) {
            throw new IllegalArgumentException("probability must be in (0, 1), was " + p);
        }
        Chains.check(chains);
        double[] sorted = Chains.pool(chains);
        Arrays.sort(sorted);
        if (sorted[0] == sorted[sorted.length - 1] || chains[0].length < 4) {
            return Double.NaN;
        }
        double q = Quantiles.ofSorted(sorted, p);
        Flat split = Flat.split(chains);
        double[] indicator = new double[split.values().length];
        for (int i = 0; i < indicator.length; i++) {
            indicator[i] = split.values()[i] <= q ? 1.0 : 0.0;
        }
        double ess = Ess.of(split.with(indicator));
        if (Double.isNaN(ess)) {
            return Double.NaN;
        }
        BetaDistribution beta = new BetaDistribution(null, ess * p + 1, ess * (1 - p) + 1);
        int total = sorted.length;
        int lo = Math.max((int) Math.ceil(beta.inverseCumulativeProbability(MINUS_ONE_SD) * total), 1);
        int hi = Math.min((int) Math.ceil(beta.inverseCumulativeProbability(PLUS_ONE_SD) * total), total);
        return (sorted[hi - 1] - sorted[lo - 1]) / 2;
    }
}
