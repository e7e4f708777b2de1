package dev.cairn.diagnostics;

/**
 * Multi-chain effective sample size (Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021, "Rank-
 * normalization, folding, and localization", Bayesian Analysis 16(2):667-718, section 3.2 and
 * appendix), with Geyer's (1992, Statistical Science 7(4)) initial positive and initial monotone sequence.
 *
 * <pre>
 *   W      = mean over chains of s_m^2                     (within-chain variance)
 *   var+   = (N-1)/N W + B/N,  B/N = variance of chain means (0 for one chain)
 *   rho_t  = 1 - (W - mean_m gamma_{m,t}) / var+           (combined autocorrelation)
 *   P_k    = rho_{2k} + rho_{2k+1}, summed while positive and made non-increasing
 *   tau    = -1 + 2 sum_{t<=2K+1} rho_t (+ a last positive even term), at least 1/log10(MN)
 *   ESS    = M N / tau
 * </pre>
 * The floor on tau caps ESS at M N log10(M N) for antithetic chains; when even the first pair sums to <= 0,
 * rho_0 is counted once (tau = 2, ESS = MN/2), as the reference implementation does.
 */
public final class Ess {
    /** Lags summed directly first: enough for independent draws most of the time. */
    static final int DIRECT_LAGS = 8;
    /** Lags summed directly next, before the FFT: enough for well-mixing chains nearly always. */
    static final int MORE_DIRECT_LAGS = 40;

    private Ess() {
    }

    /**
     * ESS of draws laid out as chains[m][n]; NaN when undefined (fewer than 4 draws, or no variation).
     *
     * @param chains the draws, m chains of n draws each
     * @return the effective sample size of the mean
     */
    public static double of(double[][] chains) {
        return of(Flat.of(chains));
    }

    static double of(Flat chains) {
        int n = chains.length();
        if (n < 4) {
            return Double.NaN;
        }
        // Independent and well-mixing draws truncate within a few lags: those are summed directly, O(N) a
        // lag, first 8 and then 40 of them (a truncation by chance beyond lag 8 is common for independent
        // draws, beyond lag 40 rare). A chain that needs more goes to the FFT, where zero padding to L makes lags 0..L - N exact:
        // first the shortest power of two above N + 16, then 1.25 N, then full padding. Every stage gives
        // the same autocovariances at the lags it covers.
        double ess = of(chains, Autocovariance.direct(chains, Math.min(n, DIRECT_LAGS)));
        if (Double.isNaN(ess) && n > DIRECT_LAGS) {
            ess = of(chains, Autocovariance.direct(chains, Math.min(n, MORE_DIRECT_LAGS)));
        }
        int shortest = Integer.highestOneBit(n + 16) << 1;
        if (Double.isNaN(ess)) {
            ess = of(chains, Autocovariance.of(chains, shortest));
        }
        int longer = Integer.highestOneBit(n + n / 4) << 1;
        if (Double.isNaN(ess) && longer > shortest) {
            ess = of(chains, Autocovariance.of(chains, longer));
        }
        return Double.isNaN(ess) ? of(chains, Autocovariance.of(chains, 0)) : ess;
    }

    /** ESS from autocovariances exact up to lag acov[c].length - 1; NaN when more lags are needed. */
    static double of(Flat chains, double[][] acov) {
        int m = chains.chains();
        int n = chains.length();
        int lags = acov[0].length;
        double meanOfVars = 0;
        double[] means = new double[m];
        for (int c = 0; c < m; c++) {
            means[c] = chains.mean(c);
            meanOfVars += acov[c][0] * n / (n - 1.0);
        }
        meanOfVars /= m;
        double varPlus = meanOfVars * (n - 1.0) / n;
        if (m > 1) {
            varPlus += variance(means);
        }
        if (!(varPlus > 0) || !(meanOfVars > 0)) {
            return Double.NaN;
        }
        // rho[t] is the combined autocorrelation at lag t; t runs over even lags, pairs (t, t+1).
        double[] rho = new double[n];
        rho[0] = 1;
        double even = 1;
        double odd = 1 - (meanOfVars - meanAt(acov, 1)) / varPlus;
        rho[1] = odd;
        int t = 0;
        while (t < n - 5 && even + odd > 0) {
            t += 2;
            if (t + 1 >= lags) {
                return Double.NaN; // needs lags beyond the exact ones: the caller pads fully
            }
            even = 1 - (meanOfVars - meanAt(acov, t)) / varPlus;
            odd = 1 - (meanOfVars - meanAt(acov, t + 1)) / varPlus;
            if (even + odd >= 0) {
                rho[t] = even;
                rho[t + 1] = odd;
            }
        }
        int maxT = t;
        // A last positive even lag reduces the variance of the estimate for antithetic chains.
        if (even > 0) {
            rho[maxT] = even;
        }
        // Initial monotone sequence: no pair sum larger than the pair before it.
        for (t = 2; t <= maxT - 2; t += 2) {
            if (rho[t] + rho[t + 1] > rho[t - 2] + rho[t - 1]) {
                rho[t] = (rho[t - 2] + rho[t - 1]) / 2;
                rho[t + 1] = rho[t];
            }
        }
        double total = (double) m * n;
        double sum = 0;
        for (t = 0; t < maxT; t++) {
            sum += rho[t];
        }
        // When the first pair already sums to <= 0 (antithetic chains, lag-1 autocorrelation near -1), the
        // reference implementation (R package posterior 1.4.0, ess_rfun: sum(rho_hat_t[1:max_t]) with max_t = 0
        // sums the first element) counts rho_0 once, so tau = 2 and ESS = MN/2; follow it rather than
        // report MN log10(MN) for a pathological sampler.
        if (maxT == 0) {
            sum = rho[0];
        }
        double tau = -1 + 2 * sum + rho[maxT];
        tau = Math.max(tau, 1 / Math.log10(total));
        return total / tau;
    }

    private static double meanAt(double[][] acov, int t) {
        double s = 0;
        for (double[] a : acov) {
            s += t < a.length ? a[t] : 0;
        }
        return s / acov.length;
    }

    static double variance(double[] x) {
        if (x.length < 2) {
            return 0;
        }
        double mean = Autocovariance.mean(x);
        double s = 0;
        for (double v : x) {
            s += (v - mean) * (v - mean);
        }
        return s / (x.length - 1);
    }
}
