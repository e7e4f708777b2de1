package dev.cairn.models.spend;

import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;

/**
 * Priors fitted to past periods (rows of users, payers, log_spend_sum, log_spend_sq_sum), by the method of
 * moments, with each prior's weight capped at one typical period so history informs but never outweighs
 * the experiment:
 * <ul>
 *   <li>payer rate: the periods' rates r_i have mean r and, after removing binomial noise
 *       mean(r_i (1 - r_i) / n_i), between-period variance v; Beta(a, b) with a + b = r (1 - r) / v - 1
 *       and a = r (a + b), a + b at most the median period's users;</li>
 *   <li>log spend: mu0 = mean of the periods' mean log spend ybar_i; sigma0^2 = mean of their within-period
 *       variances s_i^2; the between-period variance tau^2 of ybar_i (less noise s_i^2 / m_i) gives
 *       kappa0 = sigma0^2 / tau^2 (since mu | sigma^2 ~ N(mu0, sigma^2 / kappa0)), at most the median
 *       period's payers; the variance w of s_i^2 (less sampling noise 2 s_i^4 / (m_i - 1)) gives
 *       alpha0 = 2 + sigma0^4 / w, beta0 = sigma0^2 (alpha0 - 1), so that Inv-Gamma(alpha0, beta0) has mean
 *       sigma0^2 and variance w; alpha0 at most half the median period's payers.</li>
 * </ul>
 * Where history shows no variation beyond noise, the cap applies.
 */
public final class HistoryPriors {
    private HistoryPriors() {
    }

    /**
     * Fits the priors to a table of past periods.
     *
     * @param path    the table, as the spec writes it
     * @param baseDir the spec's folder
     * @return the priors (source "history")
     * @throws InputException naming the file and line of bad rows, or too little history
     */
    public static SpendPriors fit(String path, Path baseDir) {
        double[][] rows = read(path, baseDir);
        int k = rows.length;
        if (k < 2) {
            throw new InputException(path + ": priors.fromHistory needs at least 2 past periods, found " + k);
        }
        double[] n = column(rows, 0), m = column(rows, 1), s1 = column(rows, 2), s2 = column(rows, 3);
        double medianUsers = median(n);
        double medianPayers = median(m);

        double[] rate = new double[k];
        double noise = 0;
        for (int i = 0; i < k; i++) {
            rate[i] = m[i] / n[i];
            noise += rate[i] * (1 - rate[i]) / n[i] / k;
        }
        double r = mean(rate);
        double between = variance(rate) - noise;
        double concentration = between > 0 ? r * (1 - r) / between - 1 : Double.POSITIVE_INFINITY;
        concentration = Math.min(Math.max(concentration, 2), medianUsers);
        dev.cairn.models.prior.Beta beta = new dev.cairn.models.prior.Beta(Math.max(r * concentration, 1e-3),
                Math.max((1 - r) * concentration, 1e-3));

        List<Double> means = new ArrayList<>();
        List<Double> variances = new ArrayList<>();
        List<Double> payers = new ArrayList<>();
        for (int i = 0; i < k; i++) {
            if (m[i] >= 2) {
                double ybar = s1[i] / m[i];
                means.add(ybar);
                variances.add(Math.max(0, s2[i] - s1[i] * s1[i] / m[i]) / (m[i] - 1));
                payers.add(m[i]);
            }
        }
        if (means.size() < 2) {
            throw new InputException(path + ": priors.fromHistory needs at least 2 periods with 2 or more payers");
        }
        double[] ybar = means.stream().mapToDouble(Double::doubleValue).toArray();
        double[] s2i = variances.stream().mapToDouble(Double::doubleValue).toArray();
        double[] mi = payers.stream().mapToDouble(Double::doubleValue).toArray();
        double mu0 = mean(ybar);
        double sigma2 = mean(s2i);
        double meanNoise = 0, varNoise = 0;
        for (int i = 0; i < ybar.length; i++) {
            meanNoise += s2i[i] / mi[i] / ybar.length;
            varNoise += 2 * s2i[i] * s2i[i] / (mi[i] - 1) / ybar.length;
        }
        double tau2 = variance(ybar) - meanNoise;
        double kappa0 = tau2 > 0 ? sigma2 / tau2 : Double.POSITIVE_INFINITY;
        kappa0 = Math.min(Math.max(kappa0, 0.01), medianPayers);
        double w = variance(s2i) - varNoise;
        double alpha0 = w > 0 ? 2 + sigma2 * sigma2 / w : Double.POSITIVE_INFINITY;
        alpha0 = Math.min(Math.max(alpha0, 2.01), Math.max(2.01, medianPayers / 2));
        double beta0 = sigma2 * (alpha0 - 1);
        if (!(sigma2 > 0)) {
            throw new InputException(path + ": past periods show no spread in log spend; cannot fit a prior");
        }
        return new SpendPriors(beta, new dev.cairn.models.prior.NormalInverseGamma(mu0, kappa0, alpha0, beta0), null, null, "history",
                "method of moments on " + k + " past periods of " + path + "; weights capped at one median period");
    }

    private static double[][] read(String path, Path baseDir) {
        Map<String, String> columns = new java.util.LinkedHashMap<>();
        for (String c : new String[] {"users", "payers", "log_spend_sum", "log_spend_sq_sum"}) {
            columns.put(c, "DOUBLE");
        }
        return dev.cairn.models.data.SideTable.read(path, baseDir, "priors.fromHistory.path", columns,
                relation -> "SELECT users, payers, log_spend_sum, log_spend_sq_sum FROM " + relation, r -> {
                    List<double[]> rows = new ArrayList<>();
                    int line = 1;
                    while (r.next()) {
                        line++;
                        double[] row = {r.getDouble(1), r.getDouble(2), r.getDouble(3), r.getDouble(4)};
                        if (!(row[0] > 0) || row[1] < 0 || row[1] > row[0]) {
                            throw new InputException(path + ": line " + line
                                    + ": need users > 0 and 0 <= payers <= users");
                        }
                        rows.add(row);
                    }
                    return rows.toArray(new double[0][]);
                });
    }

    private static double[] column(double[][] rows, int j) {
        return Arrays.stream(rows).mapToDouble(r -> r[j]).toArray();
    }

    private static double mean(double[] x) {
        return Arrays.stream(x).average().orElse(Double.NaN);
    }

    private static double variance(double[] x) {
        double mean = mean(x);
        return Arrays.stream(x).map(v -> (v - mean) * (v - mean)).sum() / (x.length - 1);
    }

    private static double median(double[] x) {
        double[] s = x.clone();
        Arrays.sort(s);
        return s.length % 2 == 1 ? s[s.length / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
    }
}
