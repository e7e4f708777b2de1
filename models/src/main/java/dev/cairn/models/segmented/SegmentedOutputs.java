package dev.cairn.models.segmented;

import dev.cairn.samplers.Draws;
import java.util.ArrayList;
import java.util.List;

/**
 * The named quantities of a segmented-spend fit, computed draw by draw from the internal coordinates
 * (so they are the same whichever parameterisation ran):
 * <ul>
 *   <li>hyperparameters: alpha0, D[arm], tauAlpha, tauD; with spend beta0, E[arm], G[arm], s0, tauBeta, tauE,
 *       tauS;</li>
 *   <li>per cell: payerRate[segment/arm]; with spend logSpendMean[segment/arm], arppu[segment/arm] =
 *       exp(mu + sigma_jk^2/2), arpu[segment/arm] = payerRate x arppu; per segment logSpendSd[segment];</li>
 *   <li>typical segment (the hyper-means): payerRate[typical/arm] = logistic(alpha0 + D_k), and with spend
 *       arppu[typical/arm] = exp(beta0 + E_k + exp(2 (s0 + G_k))/2), arpu[typical/arm];</li>
 *   <li>population (segments weighted by their share of users): payerRate[population/arm] = sum_j w_j p_jk,
 *       arpu[population/arm] = sum_j w_j arpu_jk, arppu[population/arm] = arpu / payerRate.</li>
 * </ul>
 */
final class SegmentedOutputs {
    static final String TYPICAL = "typical";
    static final String POPULATION = "population";

    private SegmentedOutputs() {
    }

    static String cell(String quantity, String segment, String arm) {
        return quantity + "[" + segment + "/" + arm + "]";
    }

    static Draws of(Draws internal, SegmentedPosterior model, List<String> segments, List<String> arms, double[] weights) {
        SegmentedPosterior.Layout at = model.at;
        List<String> names = new ArrayList<>();
        names.add("alpha0");
        names.add("tauAlpha");
        names.add("tauD");
        for (int k = 0; k < arms.size(); k++) {
            if (k != model.control) {
                names.add("D[" + arms.get(k) + "]");
            }
        }
        if (model.spend) {
            names.add("beta0");
            names.add("s0");
            names.add("tauBeta");
            names.add("tauE");
            names.add("tauS");
            for (int k = 0; k < arms.size(); k++) {
                if (k != model.control) {
                    names.add("E[" + arms.get(k) + "]");
                    names.add("G[" + arms.get(k) + "]");
                }
            }
        }
        for (String scope : new String[] {TYPICAL, POPULATION}) {
            for (String a : arms) {
                names.add(cell("payerRate", scope, a));
                if (model.spend) {
                    names.add(cell("arppu", scope, a));
                    names.add(cell("arpu", scope, a));
                }
            }
        }
        for (String s : segments) {
            if (model.spend) {
                names.add("logSpendSd[" + s + "]");
            }
            for (String a : arms) {
                names.add(cell("payerRate", s, a));
                if (model.spend) {
                    names.add(cell("logSpendMean", s, a));
                    names.add(cell("arppu", s, a));
                    names.add(cell("arpu", s, a));
                }
            }
        }
        int chains = internal.chains();
        int iterations = internal.iterations();
        double[][][] out = new double[chains][names.size()][iterations];
        double[] x = new double[at.size];
        double[][] internalColumns = new double[at.size][];
        for (int c = 0; c < chains; c++) {
            for (int i = 0; i < at.size; i++) {
                internalColumns[i] = internal.column("x" + i)[c];
            }
            for (int t = 0; t < iterations; t++) {
                for (int i = 0; i < at.size; i++) {
                    x[i] = internalColumns[i][t];
                }
                int col = 0;
                out[c][col++][t] = x[at.alpha0];
                out[c][col++][t] = Math.exp(x[at.tauAlpha]);
                out[c][col++][t] = Math.exp(x[at.tauD]);
                for (int k = 0; k < arms.size(); k++) {
                    if (k != model.control) {
                        out[c][col++][t] = x[at.bigD + k];
                    }
                }
                if (model.spend) {
                    out[c][col++][t] = x[at.beta0];
                    out[c][col++][t] = x[at.s0];
                    out[c][col++][t] = Math.exp(x[at.tauBeta]);
                    out[c][col++][t] = Math.exp(x[at.tauE]);
                    out[c][col++][t] = Math.exp(x[at.tauS]);
                    for (int k = 0; k < arms.size(); k++) {
                        if (k != model.control) {
                            out[c][col++][t] = x[at.bigE + k];
                            out[c][col++][t] = x[at.bigG + k];
                        }
                    }
                }
                // typical segment
                for (int k = 0; k < arms.size(); k++) {
                    double dk = k == model.control ? 0 : x[at.bigD + k];
                    double p = logistic(x[at.alpha0] + dk);
                    out[c][col++][t] = p;
                    if (model.spend) {
                        double ek = k == model.control ? 0 : x[at.bigE + k];
                        double gk = k == model.control ? 0 : x[at.bigG + k];
                        double arppu = Math.exp(x[at.beta0] + ek + 0.5 * Math.exp(2 * (x[at.s0] + gk)));
                        out[c][col++][t] = arppu;
                        out[c][col++][t] = p * arppu;
                    }
                }
                // population: filled after the cells, remember where it starts
                int population = col;
                col += arms.size() * (model.spend ? 3 : 1);
                double[] popRate = new double[arms.size()];
                double[] popArpu = new double[arms.size()];
                for (int j = 0; j < segments.size(); j++) {
                    double ls = model.spend ? model.logSigma(x, j) : 0;
                    if (model.spend) {
                        out[c][col++][t] = Math.exp(ls);
                    }
                    double a = model.alpha(x, j);
                    double b = model.spend ? model.beta(x, j) : 0;
                    for (int k = 0; k < arms.size(); k++) {
                        double p = logistic(a + model.d(x, j, k));
                        out[c][col++][t] = p;
                        popRate[k] += weights[j] * p;
                        if (model.spend) {
                            double mu = b + model.e(x, j, k);
                            double arppu = Math.exp(mu + 0.5 * Math.exp(2 * model.logSigmaCell(x, j, k)));
                            out[c][col++][t] = mu;
                            out[c][col++][t] = arppu;
                            out[c][col++][t] = p * arppu;
                            popArpu[k] += weights[j] * p * arppu;
                        }
                    }
                }
                for (int k = 0; k < arms.size(); k++) {
                    out[c][population++][t] = popRate[k];
                    if (model.spend) {
                        out[c][population++][t] = popArpu[k] / popRate[k];
                        out[c][population++][t] = popArpu[k];
                    }
                }
            }
        }
        return Draws.of(names, out);
    }

    static double logistic(double z) {
        return z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
    }
}
