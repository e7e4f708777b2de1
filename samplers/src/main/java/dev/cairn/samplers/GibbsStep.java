package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * An exact draw from a full conditional supplied by a model (a Gibbs block). The model writes the new
 * values of its block into the unconstrained point; the chain's density is then recomputed.
 */
public final class GibbsStep implements Step {

    /** Draws some coordinates of {@code point} (unconstrained scale) from their full conditional. */
    @FunctionalInterface
    public interface ConditionalDraw {
        void draw(double[] point, UniformRandomProvider rng);
    }

    private final ConditionalDraw draw;

    private GibbsStep(ConditionalDraw draw) {
        this.draw = draw;
    }

    public static GibbsStep of(ConditionalDraw draw) {
        if (draw == null) {
            throw new IllegalArgumentException("conditional draw must not be null");
        }
        return new GibbsStep(draw);
    }

    @Override
    public Updater start(Target target) {
        return (state, rng, adapt) -> {
            draw.draw(state.point(), rng);
            state.refresh();
        };
    }
}
