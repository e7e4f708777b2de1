package dev.cairn.models.retention;

/**
 * Chooses, from the data alone and before sampling, whether each random walk (cohort levels, cohort slopes)
 * is sampled centred or non-centred. Each cohort's own level and slope are estimated by weighted least
 * squares of the empirical logit of the observed share ((y + 0.5)/(n + 1), per arm, then averaged over arms) on the curve's
 * covariate log(1 + t) - log 8, with their variances (scaled by the residual mean square when it exceeds
 * 1: day-to-day over-dispersion); the drift variance of a series is the moment estimate
 * mean(increment^2) - mean(noise of the increments). The level walk is non-centred when the median noise
 * variance of its cohorts exceeds {@value #NON_CENTRED_FACTOR} times the drift variance, the slope walk
 * unless the drift variance exceeds that many times the noise: centring pays when the data
 * outweigh the prior (Papaspiliopoulos, Roberts & Skold 2007). Approximate for the survival curve (whose
 * coordinates are log alpha and log beta), which only affects speed, never the posterior.
 */
final class WalkChoice {
    /**
     * How far the choice leans. Levels: non-centred only when the cohorts' noise exceeds the drift this many
     * times (a non-centred walk whose cohorts the data pin is far worse, every step moving all later cohorts,
     * than a centred walk that barely drifts). Slopes: centred only when the drift exceeds the noise this
     * many times (slopes rarely drift, and a centred walk with a scale near zero is a funnel).
     */
    static final double NON_CENTRED_FACTOR = 4;

    private WalkChoice() {
    }

    /** {level non-centred, slope non-centred}. */
    static boolean[] nonCentred(RetentionPosterior m) {
        int cohorts = m.cohorts;
        if (cohorts < 3) {
            return new boolean[] {false, false};
        }
        double[][] est = estimates(m);
        boolean[] out = new boolean[2];
        for (int s = 0; s < 2; s++) {
            double sumSq = 0, sumNoise = 0;
            int increments = 0;
            double[] noise = new double[cohorts];
            int known = 0;
            for (int c = 0; c < cohorts; c++) {
                if (est[c] != null) {
                    noise[known++] = est[c][2 + s];
                }
                if (c > 0 && est[c] != null && est[c - 1] != null) {
                    double d = est[c][s] - est[c - 1][s];
                    sumSq += d * d;
                    sumNoise += est[c][2 + s] + est[c - 1][2 + s];
                    increments++;
                }
            }
            if (increments == 0 || known == 0) {
                out[s] = true;
                continue;
            }
            double drift = Math.max(0, (sumSq - sumNoise) / increments);
            double[] sorted = java.util.Arrays.copyOf(noise, known);
            java.util.Arrays.sort(sorted);
            double noiseVariance = sorted[known / 2];
            out[s] = s == 0 ? noiseVariance > NON_CENTRED_FACTOR * drift : NON_CENTRED_FACTOR * noiseVariance > drift;
        }
        return out;
    }

    /**
     * Per cohort {level, slope, var level, var slope}: the average over arms of each arm's fit (arm offsets are
     * the same in every cohort, so they cancel in the increments), variance sum / K^2; null where no arm has
     * two observed days.
     */
    static double[][] estimates(RetentionPosterior m) {
        int cohorts = m.cohorts;
        double[][] est = new double[cohorts][];
        for (int c = 0; c < cohorts; c++) {
            double[] sum = new double[4];
            int fitted = 0;
            for (int k = 0; k < m.arms; k++) {
                double[] f = fit(m, c, k);
                if (f != null) {
                    for (int i = 0; i < 4; i++) {
                        sum[i] += f[i];
                    }
                    fitted++;
                }
            }
            if (fitted > 0) {
                est[c] = new double[] {sum[0] / fitted, sum[1] / fitted, sum[2] / (fitted * (double) fitted),
                    sum[3] / (fitted * (double) fitted)};
            }
        }
        return est;
    }

    /** {level, slope, var level, var slope} of one cohort and arm, or null with fewer than 2 observed days. */
    private static double[] fit(RetentionPosterior m, int c, int k) {
        int[] days = m.days(c, k);
        double n = m.n[c][k];
        if (days.length < 2 || n == 0) {
            return null;
        }
        double sw = 0, swx = 0, swy = 0, swxx = 0, swxy = 0;
        for (int i = 0; i < days.length; i++) {
            double y = m.active[c][k][i];
            double p = (y + 0.5) / (n + 1);
            double logit = Math.log(p / (1 - p));
            double w = (n + 1) * p * (1 - p);
            double x = Math.log1p(days[i]) - RetentionPosterior.CENTRE;
            sw += w;
            swx += w * x;
            swy += w * logit;
            swxx += w * x * x;
            swxy += w * x * logit;
        }
        double det = sw * swxx - swx * swx;
        if (!(det > 0)) {
            return null;
        }
        double slope = (sw * swxy - swx * swy) / det;
        double level = (swy - slope * swx) / sw;
        // over-dispersion: scale the binomial variances by the residual mean square (at least 1)
        double scale = 1;
        if (days.length > 2) {
            double rss = 0;
            for (int i = 0; i < days.length; i++) {
                double y = m.active[c][k][i];
                double p = (y + 0.5) / (n + 1);
                double x = Math.log1p(days[i]) - RetentionPosterior.CENTRE;
                double r = Math.log(p / (1 - p)) - level - slope * x;
                rss += (n + 1) * p * (1 - p) * r * r;
            }
            scale = Math.max(1, rss / (days.length - 2));
        }
        return new double[] {level, slope, scale * swxx / det, scale * sw / det};
    }
}
