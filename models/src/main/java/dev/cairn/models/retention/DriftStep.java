package dev.cairn.models.retention;

import dev.cairn.models.LocalSlice;
import dev.cairn.samplers.ChainState;
import dev.cairn.samplers.Step;
import dev.cairn.samplers.Target;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * A drift scale's move in the centred direction: holding the series L_1..L_C fixed (the stored steps
 * eps_c = (L_c - L_{c-1}) / sigma are rescaled afterwards), log sigma is
 * slice-sampled from p(sigma | increments) = half-N(sigma; 0, 0.25^2) prod_c N(L_c - L_{c-1}; 0, sigma^2)
 * (with the log-Jacobian). A Gibbs update, so it leaves the posterior invariant; it moves sigma where the
 * joint NUTS trajectories cross slowly (curves that barely drift). Cost O(cohorts).
 */
final class DriftStep implements Step {
    private final RetentionPosterior m;
    private final int first;
    private final int logSigma;
    private final boolean nonCentred;

    DriftStep(RetentionPosterior model, int first, int logSigma, boolean nonCentred) {
        this.m = model;
        this.first = first;
        this.logSigma = logSigma;
        this.nonCentred = nonCentred;
    }

    /** The half-normal prior of sigma on the log scale and the increments' squares over sigma^2, at log sigma l. */
    private static double walkTerms(double l, double squares) {
        return RetentionPosterior.DRIFT.logDensityOfLog(l) - squares / (2 * Math.exp(2 * l));
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        LocalSlice slice = new LocalSlice(target.parameters().size(), 0.5, stream);
        return (ChainState state, boolean adapt) -> {
            if (m.cohorts < 2) {
                return;
            }
            slice.begin(adapt);
            double[] x = state.point();
            // the increments sigma eps_c are held; eps follows the new sigma
            double sigma = Math.exp(x[logSigma]);
            double ss = 0;
            for (int c = 1; c < m.cohorts; c++) {
                double d = nonCentred ? sigma * x[first + c] : x[first + c] - x[first + c - 1];
                ss += d * d;
            }
            double squares = ss;
            int increments = m.cohorts - 1;
            double before = x[logSigma];
            double lp = state.logDensity();
            slice.update(x, logSigma, l -> {
                return RetentionPosterior.DRIFT.logDensityOfLog(l) - increments * l - squares / (2 * Math.exp(2 * l));
            });
            if (nonCentred) {
                double ratio = sigma / Math.exp(x[logSigma]);
                for (int c = 1; c < m.cohorts; c++) {
                    x[first + c] *= ratio;
                }
            }
            // the likelihood is unchanged (the series is held); the density changes by the walk's prior terms,
            // stored centred: the slice's own target; non-centred: without the increments' sigma^-(C-1), which
            // the standardised steps' coordinates absorb
            double after = x[logSigma];
            double change = walkTerms(after, squares) - walkTerms(before, squares);
            if (!nonCentred) {
                change -= increments * (after - before);
            }
            state.accept(lp + change);
        };
    }
}
