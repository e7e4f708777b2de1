package dev.cairn.models.retention;

import dev.cairn.samplers.Draws;
import java.util.ArrayList;
import java.util.List;

/**
 * Named quantities of a retention fit computed draw by draw from the internal coordinates: per cohort and
 * arm d<N>[cohort/arm] (projected where the cohort has not reached day N), per arm the install-weighted
 * d<N>[arm] and, with LTV, ltv[arm] = revenue per active day x (1 + sum_{t=1..H} r_arm(t)) where r_arm is
 * the install-weighted curve; driftLevel, driftSlope; the arm offsets; alpha and beta per cohort and arm
 * (survival) or kappa (activity).
 */
final class RetentionOutputs {
    private RetentionOutputs() {
    }

    static String day(int d) {
        return "d" + d;
    }

    static String cell(String quantity, String cohort, String arm) {
        return quantity + "[" + cohort + "/" + arm + "]";
    }

    /**
     * @param revenuePerDay per arm and draw (chains x iterations flattened, chain-major), or null without LTV
     */
    static Draws of(Draws internal, RetentionPosterior m, List<String> cohorts, List<String> arms, List<Integer> days,
                    int horizon, double[][] revenuePerDay) {
        List<String> names = new ArrayList<>();
        names.add("driftLevel");
        names.add("driftSlope");
        if (!m.survival) {
            names.add("kappa");
        }
        for (int k = 0; k < arms.size(); k++) {
            if (k != m.control) {
                names.add("armLevel[" + arms.get(k) + "]");
                names.add("armSlope[" + arms.get(k) + "]");
            }
        }
        for (String a : arms) {
            for (int d : days) {
                names.add(day(d) + "[" + a + "]");
            }
            if (revenuePerDay != null) {
                names.add("ltv[" + a + "]");
            }
        }
        for (int c = 0; c < cohorts.size(); c++) {
            for (int k = 0; k < arms.size(); k++) {
                if (m.n[c][k] == 0) {
                    continue;
                }
                for (int d : days) {
                    names.add(cell(day(d), cohorts.get(c), arms.get(k)));
                }
                if (m.survival) {
                    names.add(cell("alpha", cohorts.get(c), arms.get(k)));
                    names.add(cell("beta", cohorts.get(c), arms.get(k)));
                }
            }
        }
        int maxDay = horizon;
        for (int d : days) {
            maxDay = Math.max(maxDay, d);
        }
        int chains = internal.chains(), iterations = internal.iterations();
        double[][][] out = new double[chains][names.size()][iterations];
        double[] x = new double[m.size], coordinates = new double[m.size];
        double[][] columns = new double[m.size][];
        double[][] curves = new double[arms.size() * cohorts.size()][maxDay + 1];
        double[] weighted = new double[maxDay + 1];
        for (int ch = 0; ch < chains; ch++) {
            for (int i = 0; i < m.size; i++) {
                columns[i] = internal.column(m.parameters.name(i))[ch];
            }
            for (int t = 0; t < iterations; t++) {
                for (int i = 0; i < m.size; i++) {
                    coordinates[i] = columns[i][t];
                }
                m.centred(coordinates, x);
                int col = 0;
                out[ch][col++][t] = Math.exp(x[m.logSigmaL]);
                out[ch][col++][t] = Math.exp(x[m.logSigmaS]);
                if (!m.survival) {
                    out[ch][col++][t] = Math.exp(x[m.logKappa]);
                }
                for (int k = 0; k < arms.size(); k++) {
                    if (k != m.control) {
                        out[ch][col++][t] = m.offL(x, k);
                        out[ch][col++][t] = m.offS(x, k);
                    }
                }
                for (int c = 0; c < cohorts.size(); c++) {
                    for (int k = 0; k < arms.size(); k++) {
                        if (m.n[c][k] > 0) {
                            series(m, x, c, k, curves[c * arms.size() + k]);
                        }
                    }
                }
                for (int k = 0; k < arms.size(); k++) {
                    java.util.Arrays.fill(weighted, 0);
                    double installs = 0;
                    for (int c = 0; c < cohorts.size(); c++) {
                        double w = m.n[c][k];
                        if (w == 0) {
                            continue;
                        }
                        installs += w;
                        double[] curve = curves[c * arms.size() + k];
                        for (int d = 1; d <= maxDay; d++) {
                            weighted[d] += w * curve[d];
                        }
                    }
                    for (int d : days) {
                        out[ch][col++][t] = installs == 0 ? Double.NaN : weighted[d] / installs;
                    }
                    if (revenuePerDay != null) {
                        double sum = 1;
                        for (int d = 1; d <= horizon; d++) {
                            sum += installs == 0 ? 0 : weighted[d] / installs;
                        }
                        out[ch][col++][t] = revenuePerDay[k][ch * iterations + t] * sum;
                    }
                }
                for (int c = 0; c < cohorts.size(); c++) {
                    for (int k = 0; k < arms.size(); k++) {
                        if (m.n[c][k] == 0) {
                            continue;
                        }
                        double[] curve = curves[c * arms.size() + k];
                        for (int d : days) {
                            out[ch][col++][t] = curve[d];
                        }
                        if (m.survival) {
                            out[ch][col++][t] = Math.exp(x[m.level + c] + m.offL(x, k));
                            out[ch][col++][t] = Math.exp(x[m.slope + c] + m.offS(x, k));
                        }
                    }
                }
            }
        }
        return Draws.of(names, out);
    }

    /** r(1..T) of cohort c, arm k into out[1..T], in one pass (the survival recursion is incremental). */
    static void series(RetentionPosterior m, double[] x, int c, int k, double[] out) {
        double l = x[m.level + c] + m.offL(x, k);
        double s = x[m.slope + c] + m.offS(x, k);
        if (!m.survival) {
            for (int t = 1; t < out.length; t++) {
                double z = l + s * (Math.log1p(t) - RetentionPosterior.CENTRE);
                out[t] = z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
            }
            return;
        }
        double alpha = Math.exp(l), beta = Math.exp(s);
        double surv = 1, p = 0;
        for (int t = 1; t < out.length; t++) {
            p = t == 1 ? alpha / (alpha + beta) : p * (beta + t - 2) / (alpha + beta + t - 1);
            surv -= p;
            out[t] = Math.max(surv, 0);
        }
    }
}
