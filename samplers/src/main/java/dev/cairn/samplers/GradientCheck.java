package dev.cairn.samplers;

/**
 * Compares a {@link GradientTarget}'s analytic gradient with central finite differences, for tests of
 * models that supply gradients (and for anyone writing a new one).
 */
public final class GradientCheck {
    private GradientCheck() {
    }

    /**
     * The largest discrepancy over coordinates between the analytic gradient and the central difference
     * (f(x + h e_i) - f(x - h e_i)) / 2h with h = 1e-5 max(1, |x_i|), each measured as
     * |analytic - numeric| / max(1, |numeric|).
     *
     * @param target the target (not modified)
     * @param point  where to compare (not modified)
     * @return the largest scaled discrepancy; NaN when the density is not finite at a probed point
     */
    public static double maxError(GradientTarget target, double[] point) {
        double[][] compared = compare(target, point);
        double worst = 0;
        for (double[] c : compared) {
            if (!Double.isFinite(c[1])) {
                return Double.NaN;
            }
            worst = Math.max(worst, error(c));
        }
        return worst;
    }

    /**
     * The name of the coordinate with the largest discrepancy and its analytic and numeric values, for a
     * failure message.
     *
     * @param target the target (not modified)
     * @param point  where to compare (not modified)
     * @return a one-line description
     */
    public static String worst(GradientTarget target, double[] point) {
        double[][] compared = compare(target, point);
        int at = -1;
        for (int i = 0; i < compared.length; i++) {
            if (at < 0 || !(error(compared[i]) <= error(compared[at]))) {
                at = i;
            }
        }
        return at < 0 ? "no coordinates" : target.parameters().name(at) + ": analytic " + compared[at][0] + ", numeric "
                + compared[at][1];
    }

    private static double error(double[] c) {
        return Math.abs(c[0] - c[1]) / Math.max(1, Math.abs(c[1]));
    }

    /** Per coordinate {analytic, numeric} derivative. */
    private static double[][] compare(GradientTarget target, double[] point) {
        double[] x = point.clone();
        double[] gradient = new double[x.length];
        double[] scratch = new double[x.length];
        target.logDensityAndGradient(x, gradient);
        double[][] out = new double[x.length][];
        for (int i = 0; i < x.length; i++) {
            double h = 1e-5 * Math.max(1, Math.abs(x[i]));
            double saved = x[i];
            x[i] = saved + h;
            double up = target.logDensityAndGradient(x, scratch);
            x[i] = saved - h;
            double down = target.logDensityAndGradient(x, scratch);
            x[i] = saved;
            out[i] = new double[] {gradient[i], (up - down) / (2 * h)};
        }
        return out;
    }
}
