package dev.cairn.samplers;

/**
 * Dual averaging of the log step size towards a target mean acceptance statistic (Hoffman & Gelman 2014,
 * JMLR 15:1593-1623, section 3.2.1; Nesterov 2009): after each warmup iteration with acceptance statistic a,
 * <pre>
 *   h_t = (1 - 1/(t + t0)) h_{t-1} + (delta - a) / (t + t0)
 *   log eps_t = mu - sqrt(t) / gamma h_t
 *   log epsbar_t = t^-kappa log eps_t + (1 - t^-kappa) log epsbar_{t-1}
 * </pre>
 * with mu = log(10 eps_0), gamma = 0.05, t0 = 10, kappa = 0.75. The averaged epsbar is used once warmup ends.
 * Per chain, mutable.
 */
final class StepSizeAdaptation {
    private static final double GAMMA = 0.05, T0 = 10, KAPPA = 0.75;
    private final double delta;
    private double mu;
    private double h;
    private double logAveraged;
    private int t;

    StepSizeAdaptation(double targetAcceptance) {
        this.delta = targetAcceptance;
    }

    /** Starts afresh around {@code stepSize} (after a new mass matrix, with a new starting step size). */
    void restart(double stepSize) {
        mu = Math.log(10 * stepSize);
        h = 0;
        logAveraged = 0;
        t = 0;
    }

    /** Records one iteration's acceptance statistic; returns the step size for the next iteration. */
    double learn(double acceptance) {
        t++;
        double a = Double.isFinite(acceptance) ? Math.min(1, Math.max(0, acceptance)) : 0;
        double w = 1.0 / (t + T0);
        h = (1 - w) * h + w * (delta - a);
        double logStep = mu - Math.sqrt(t) / GAMMA * h;
        double weight = Math.pow(t, -KAPPA);
        logAveraged = weight * logStep + (1 - weight) * logAveraged;
        return Math.exp(logStep);
    }

    /** The averaged step size, used for the kept draws. */
    double averaged() {
        return Math.exp(logAveraged);
    }
}
