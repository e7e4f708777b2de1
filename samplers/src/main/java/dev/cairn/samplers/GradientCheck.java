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
        double[] x = point.clone();
        double[] gradient = new double[x.length];
        double[] scratch = new double[x.length];
        target.logDensityAndGradient(x, gradient);
        double worst = 0;
        for (int i = 0; i < x.length; i++) {
            double h = 1e-5 * Math.max(1, Math.abs(x[i]));
            double saved = x[i];
            x[i] = saved + h;
            double up = target.logDensityAndGradient(x, scratch);
            x[i] = saved - h;
            double down = target.logDensityAndGradient(x, scratch);
            x[i] = saved;
            double numeric = (up - down) / (2 * h);
            if (!Double.isFinite(numeric)) {
                return Double.NaN;
            }
            worst = Math.max(worst, Math.abs(gradient[i] - numeric) / Math.max(1, Math.abs(numeric)));
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
        double[] x = point.clone();
        double[] gradient = new double[x.length];
        double[] scratch = new double[x.length];
        target.logDensityAndGradient(x, gradient);
        String line = "no coordinates";
        double worst = -1;
        for (int i = 0; i < x.length; i++) {
            double h = 1e-5 * Math.max(1, Math.abs(x[i]));
            double saved = x[i];
            x[i] = saved + h;
            double up = target.logDensityAndGradient(x, scratch);
            x[i] = saved - h;
            double down = target.logDensityAndGradient(x, scratch);
            x[i] = saved;
            double numeric = (up - down) / (2 * h);
            double error = Math.abs(gradient[i] - numeric) / Math.max(1, Math.abs(numeric));
            if (!(error <= worst)) {
                worst = error;
                line = target.parameters().name(i) + ": analytic " + gradient[i] + ", numeric " + numeric;
            }
        }
        return line;
    }
}
