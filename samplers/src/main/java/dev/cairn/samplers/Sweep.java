package dev.cairn.samplers;

import java.util.List;

/** The steps applied, in order, in one iteration of a chain (Metropolis-within-Gibbs). */
public final class Sweep {
    private final List<Step> steps;

    private Sweep(List<Step> steps) {
        this.steps = steps;
    }

    /**
     * The steps of one iteration, run in this order.
     *
     * @param steps one or more steps
     * @return the sweep
     * @throws IllegalArgumentException when there is no step or a step is null
     */
    public static Sweep of(Step... steps) {
        if (steps == null || steps.length == 0) {
            throw new IllegalArgumentException("a sweep needs at least one step");
        }
        for (Step s : steps) {
            if (s == null) {
                throw new IllegalArgumentException("a sweep's steps must not be null");
            }
        }
        return new Sweep(List.of(steps));
    }

    /**
     * {@return the steps, in order (unmodifiable)}
     */
    public List<Step> steps() {
        return steps;
    }

    /** Per-chain updaters, one per step, in sweep order. */
    Step.Updater[] start(Target target, org.apache.commons.rng.UniformRandomProvider stream) {
        Step.Updater[] updaters = new Step.Updater[steps.size()];
        for (int i = 0; i < updaters.length; i++) {
            updaters[i] = steps.get(i).start(target, stream);
        }
        return updaters;
    }
}
