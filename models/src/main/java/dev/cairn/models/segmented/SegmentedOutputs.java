package dev.cairn.models.segmented;

import dev.cairn.models.result.Metric;

import dev.cairn.samplers.Recording;
import java.util.ArrayList;
import java.util.List;

/**
 * The named quantities of a segmented-spend fit, computed draw by draw from the coordinates as the chains
 * run (so they are the same whichever parameterisation ran, and the coordinates are never stored):
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
    static final String POPULATION = dev.cairn.models.result.Metric.POPULATION;

    private SegmentedOutputs() {
    }

    static String cell(String quantity, String segment, String arm) {
        return dev.cairn.models.result.Metric.of(quantity).column(segment, arm);
    }

    static List<String> names(SegmentedCells cells) {
        List<String> arms = cells.arms;
        List<String> names = new ArrayList<>(List.of("alpha0", "tauAlpha", "tauD"));
        for (int k = 0; k < arms.size(); k++) {
            if (k != cells.control) {
                names.add("D[" + arms.get(k) + "]");
            }
        }
        if (cells.spend) {
            names.addAll(List.of("beta0", "s0", "tauBeta", "tauE", "tauS"));
            for (int k = 0; k < arms.size(); k++) {
                if (k != cells.control) {
                    names.add("E[" + arms.get(k) + "]");
                    names.add("G[" + arms.get(k) + "]");
                }
            }
        }
        for (String scope : new String[] {TYPICAL, POPULATION}) {
            for (String a : arms) {
                names.add(cell(Metric.PAYER_RATE.key(), scope, a));
                if (cells.spend) {
                    names.add(cell(Metric.ARPPU.key(), scope, a));
                    names.add(cell(Metric.ARPU.key(), scope, a));
                }
            }
        }
        for (String s : cells.segments) {
            if (cells.spend) {
                names.add("logSpendSd[" + s + "]");
            }
            for (String a : arms) {
                names.add(cell(Metric.PAYER_RATE.key(), s, a));
                if (cells.spend) {
                    names.add(cell("logSpendMean", s, a));
                    names.add(cell(Metric.ARPPU.key(), s, a));
                    names.add(cell(Metric.ARPU.key(), s, a));
                }
            }
        }
        return names;
    }

    /**
     * The recording that keeps these quantities of each draw (instead of the coordinates).
     *
     * @param cells   the data
     * @param layout  the coordinates
     * @param weights per segment, its share of users (sum 1)
     * @return the recording
     */
    static Recording recording(SegmentedCells cells, SegmentedLayout layout, double[] weights) {
        List<String> names = names(cells);
        int cellCount = cells.segmentCount() * cells.armCount(), arms = cells.armCount();
        return new Recording() {
            @Override
            public List<String> names() {
                return names;
            }

            @Override
            public Recorder start() {
                double[] eta = new double[cellCount], mu = new double[cellCount], logSigma = new double[cellCount];
                double[] popRate = new double[arms], popArpu = new double[arms];
                return (x, out) -> row(x, out, cells, layout, weights, eta, mu, logSigma, popRate, popArpu);
            }
        };
    }

    /**
     * The named quantities of one draw, in the order of {@link #names}.
     *
     * @param x the draw's coordinates (not modified)
     * @param o the quantities (modified)
     * (the remaining arrays are scratch, modified)
     */
    private static void row(double[] x, double[] o, SegmentedCells cells, SegmentedLayout layout, double[] weights,
                            double[] eta, double[] mu, double[] logSigma, double[] popRate, double[] popArpu) {
        int segs = cells.segmentCount(), arms = cells.armCount(), control = cells.control;
        HierarchicalCells payer = layout.payer, mean = layout.mean, spread = layout.spread;
        int col = 0;
        o[col++] = x[payer.levelMean];
        o[col++] = Math.exp(x[payer.logTauLevel]);
        o[col++] = Math.exp(x[payer.logTauEffect]);
        for (int k = 0; k < arms; k++) {
            if (k != control) {
                o[col++] = x[payer.armMean[k]];
            }
        }
        if (cells.spend) {
            o[col++] = x[mean.levelMean];
            o[col++] = x[spread.levelMean];
            o[col++] = Math.exp(x[mean.logTauLevel]);
            o[col++] = Math.exp(x[mean.logTauEffect]);
            o[col++] = Math.exp(x[spread.logTauLevel]);
            for (int k = 0; k < arms; k++) {
                if (k != control) {
                    o[col++] = x[mean.armMean[k]];
                    o[col++] = x[spread.armMean[k]];
                }
            }
        }
        for (int k = 0; k < arms; k++) {
            double p = logistic(x[payer.levelMean] + (k == control ? 0 : x[payer.armMean[k]]));
            o[col++] = p;
            if (cells.spend) {
                double e = k == control ? 0 : x[mean.armMean[k]];
                double g = k == control ? 0 : x[spread.armMean[k]];
                double arppu = Math.exp(x[mean.levelMean] + e + 0.5 * Math.exp(2 * (x[spread.levelMean] + g)));
                o[col++] = arppu;
                o[col++] = p * arppu;
            }
        }
        int population = col;
        col += arms * (cells.spend ? 3 : 1);
        payer.values(x, eta);
        if (cells.spend) {
            mean.values(x, mu);
            spread.values(x, logSigma);
        }
        java.util.Arrays.fill(popRate, 0);
        java.util.Arrays.fill(popArpu, 0);
        for (int j = 0; j < segs; j++) {
            if (cells.spend) {
                o[col++] = Math.exp(logSigma[j * arms + control]);
            }
            for (int k = 0; k < arms; k++) {
                int cell = j * arms + k;
                double p = logistic(eta[cell]);
                o[col++] = p;
                popRate[k] += weights[j] * p;
                if (cells.spend) {
                    double arppu = Math.exp(mu[cell] + 0.5 * Math.exp(2 * logSigma[cell]));
                    o[col++] = mu[cell];
                    o[col++] = arppu;
                    o[col++] = p * arppu;
                    popArpu[k] += weights[j] * p * arppu;
                }
            }
        }
        for (int k = 0; k < arms; k++) {
            o[population++] = popRate[k];
            if (cells.spend) {
                o[population++] = popArpu[k] / popRate[k];
                o[population++] = popArpu[k];
            }
        }
    }

    static double logistic(double z) {
        return z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
    }
}
