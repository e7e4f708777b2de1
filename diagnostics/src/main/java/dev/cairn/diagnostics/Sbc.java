package dev.cairn.diagnostics;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.stat.inference.ChiSquareTest;

/**
 * Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari & Gelman 2018, "Validating Bayesian
 * inference algorithms with simulation-based calibration", arXiv:1804.06788): draw parameters from the
 * prior, simulate data, fit, and record the rank of each prior draw among L (thinned) posterior draws.
 * For a correct sampler the ranks are uniform on 0..L; a chi-square test on a histogram of the ranks
 * (commons-math3) flags departures.
 *
 * <p>Use: for each replication call {@link #add} per parameter, then {@link #histograms(int)}.
 */
public final class Sbc {
    private final Map<String, List<Integer>> ranks = new LinkedHashMap<>();
    private int maxRank = -1;

    /**
     * Number of posterior draws strictly below the prior draw: 0..L for L posterior draws.
     *
     * @param priorDraw      the parameter's value drawn from the prior (the data were simulated from it)
     * @param posteriorDraws the posterior draws of the fit to those data
     * @return the rank
     * @throws IllegalArgumentException when the prior draw is not finite
     */
    public static int rank(double priorDraw, double[] posteriorDraws) {
        if (!Double.isFinite(priorDraw)) {
            throw new IllegalArgumentException("prior draw must be finite, was " + priorDraw);
        }
        int r = 0;
        for (double d : posteriorDraws) {
            if (d < priorDraw) {
                r++;
            }
        }
        return r;
    }

    /**
     * Every k-th of the pooled draws so that {@code keep} remain, to reduce autocorrelation before ranking
     * (Talts et al. 2018, section 5.1).
     *
     * @param draws the pooled posterior draws
     * @param keep  how many to keep, 1..draws.length
     * @return the thinned draws
     * @throws IllegalArgumentException when keep is out of range
     */
    public static double[] thin(double[] draws, int keep) {
        if (keep < 1 || keep > draws.length) {
            throw new IllegalArgumentException("keep must be in 1.." + draws.length + ", was " + keep);
        }
        double[] out = new double[keep];
        double step = (double) draws.length / keep;
        for (int i = 0; i < keep; i++) {
            out[i] = draws[(int) (i * step)];
        }
        return out;
    }

    /**
     * Records one replication's rank of {@code priorDraw} among {@code posteriorDraws} for a parameter.
     *
     * @param parameter      the parameter's name
     * @param priorDraw      its value drawn from the prior
     * @param posteriorDraws its posterior draws (the same number in every replication)
     * @throws IllegalArgumentException when the number of posterior draws changes between replications
     */
    public synchronized void add(String parameter, double priorDraw, double[] posteriorDraws) {
        if (maxRank >= 0 && posteriorDraws.length != maxRank) {
            throw new IllegalArgumentException("every replication needs " + maxRank + " posterior draws, was "
                    + posteriorDraws.length);
        }
        maxRank = posteriorDraws.length;
        ranks.computeIfAbsent(parameter, k -> new ArrayList<>()).add(rank(priorDraw, posteriorDraws));
    }

    /**
     * One rank histogram per parameter, with {@code bins} equal bins over 0..L.
     *
     * @param bins the number of bins, >= 2
     * @return per parameter, its histogram and chi-squared test of uniformity
     */
    public synchronized Map<String, RankHistogram> histograms(int bins) {
        Map<String, RankHistogram> out = new LinkedHashMap<>();
        for (Map.Entry<String, List<Integer>> e : ranks.entrySet()) {
            int[] r = e.getValue().stream().mapToInt(Integer::intValue).toArray();
            out.put(e.getKey(), RankHistogram.of(r, maxRank, bins));
        }
        return out;
    }

    /**
     * Counts of ranks in equal bins over 0..maxRank and the chi-square test of uniformity.
     * (maxRank + 1) must be a multiple of the number of bins so that every bin is equally likely.
     */
    public record RankHistogram(long[] counts, double chiSquare, double pValue) {
        /**
         * A histogram of ranks in 0..maxRank with {@code bins} equal bins, and the chi-squared test of its
         * uniformity (commons-math3).
         *
         * @param ranks   the ranks
         * @param maxRank the largest possible rank (the number of posterior draws)
         * @param bins    the number of bins, 2..maxRank + 1
         * @return the histogram
         * @throws IllegalArgumentException when bins is out of range
         */
        public static RankHistogram of(int[] ranks, int maxRank, int bins) {
            if (bins < 2) {
                throw new IllegalArgumentException("bins must be >= 2, was " + bins);
            }
            if ((maxRank + 1) % bins != 0) {
                throw new IllegalArgumentException("number of possible ranks " + (maxRank + 1)
                        + " must be a multiple of bins " + bins);
            }
            if (ranks.length < bins) {
                throw new IllegalArgumentException("need at least " + bins + " replications, was " + ranks.length);
            }
            int width = (maxRank + 1) / bins;
            long[] counts = new long[bins];
            for (int r : ranks) {
                if (r < 0 || r > maxRank) {
                    throw new IllegalArgumentException("rank must be in 0.." + maxRank + ", was " + r);
                }
                counts[r / width]++;
            }
            double[] expected = new double[bins];
            java.util.Arrays.fill(expected, (double) ranks.length / bins);
            ChiSquareTest test = new ChiSquareTest();
            return new RankHistogram(counts, test.chiSquare(expected, counts), test.chiSquareTest(expected, counts));
        }

        /**
         * Whether uniformity is not rejected at level {@code alpha}.
         *
         * @param alpha the test's level, e.g. 0.001
         * @return true when the p-value is at least alpha
         */
        public boolean uniformAt(double alpha) {
            return pValue >= alpha;
        }
    }
}
