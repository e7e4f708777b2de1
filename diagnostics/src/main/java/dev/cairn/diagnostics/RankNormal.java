package dev.cairn.diagnostics;

import org.apache.commons.math3.special.Erf;

/**
 * Rank normalisation (Vehtari et al. 2021, section 3, eq. 14): pool all draws, replace each by its rank r
 * (ties get the average rank), then by z = Phi^-1((r - 3/8) / (S + 1/4)), S the number of draws
 * (Blom's offset). The z-scores have the same autocorrelation structure as the ranks but finite variance
 * whatever the tails, so R-hat and ESS computed on them work for any distribution.
 */
final class RankNormal {
    /**
     * z for rank r is table[2r]: ranks are integers or, with ties, halves. The table of the last S is kept
     * (read-only; a fit diagnoses thousands of quantities of one length, so one entry is enough, and a
     * volatile field costs nothing to read where a map's bookkeeping showed in profiles).
     */
    private static volatile double[] cached = new double[1];

    private RankNormal() {
    }

    /** z-scores of the values given their ascending order, in the same layout. */
    static Flat of(Flat draws, int[] order) {
        double[] pooled = draws.values();
        int total = pooled.length;
        double[] table = cached;
        if (table.length != 2 * total + 1) {
            table = table(total);
            cached = table;
        }
        int[] twice = Ranking.twiceAverageRanks(pooled, order);
        double[] z = new double[total];
        for (int i = 0; i < total; i++) {
            z[i] = table[twice[i]];
        }
        return draws.with(z);
    }

    private static double[] table(int total) {
        double[] t = new double[2 * total + 1];
        for (int twiceRank = 2; twiceRank <= 2 * total; twiceRank++) {
            double p = (twiceRank / 2.0 - 0.375) / (total + 0.25);
            t[twiceRank] = Math.sqrt(2) * Erf.erfInv(2 * p - 1);
        }
        return t;
    }
}
