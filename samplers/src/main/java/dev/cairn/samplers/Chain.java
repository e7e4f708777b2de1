package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * One chain: its state, its random stream and one updater per step of the sweep. Not thread-safe; the
 * runner gives each chain to one thread at a time.
 */
public final class Chain {
    private static final int START_ATTEMPTS = 100;
    private final ChainState state;
    private final Step.Updater[] updaters;
    private final UniformRandomProvider rng;

    private Chain(ChainState state, Step.Updater[] updaters, UniformRandomProvider rng) {
        this.state = state;
        this.updaters = updaters;
        this.rng = rng;
    }

    /**
     * Starts a chain. The initializer is asked again (up to 100 times) while its point has zero density,
     * so dispersed starts that fall outside the support are redrawn rather than fatal.
     *
     * @param target     the density
     * @param sweep      the steps of one iteration
     * @param init       the starting points
     * @param chainIndex the chain's index, from 0
     * @param rng        the chain's random stream (bound to every step's updater)
     * @return the chain at its start
     * @throws IllegalArgumentException when a start has the wrong length or a non-finite value
     * @throws NoStartException when no start has a finite, positive density
     */
    public static Chain start(Target target, Sweep sweep, Initializer init, int chainIndex, UniformRandomProvider rng) {
        Parameters p = target.parameters();
        for (int attempt = 0; attempt < START_ATTEMPTS; attempt++) {
            double[] u = init.start(chainIndex, p, rng);
            if (u.length != p.size()) {
                throw new IllegalArgumentException("initial point has " + u.length + " values, target has " + p.size());
            }
            for (int i = 0; i < u.length; i++) {
                if (!Double.isFinite(u[i])) {
                    throw new IllegalArgumentException(
                            "initial value of '" + p.name(i) + "' must be finite, was " + u[i]);
                }
            }
            ChainState state = new ChainState(target, u);
            if (state.logDensity() > Double.NEGATIVE_INFINITY && state.logDensity() < Double.POSITIVE_INFINITY) {
                return new Chain(state, sweep.start(target, rng), rng);
            }
        }
        throw new NoStartException(chainIndex + 1, START_ATTEMPTS);
    }

    /**
     * One sweep of every step.
     *
     * @param adapt true only in warmup: steps may tune themselves
     */
    public void iterate(boolean adapt) {
        for (Step.Updater u : updaters) {
            u.update(state, adapt);
        }
    }

    /**
     * {@return the chain's current point and its log density}
     */
    public ChainState state() {
        return state;
    }

    /**
     * The per-chain updater of the k-th step, to inspect its adapted tuning.
     *
     * @param k the step's position in the sweep
     * @return its updater
     */
    public Step.Updater updater(int k) {
        return updaters[k];
    }
}
