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

    private final java.util.function.Supplier<ConditionalDraw> perChain;

    private GibbsStep(java.util.function.Supplier<ConditionalDraw> perChain) {
        this.perChain = perChain;
    }

    /** A stateless conditional draw, shared by all chains. */
    public static GibbsStep of(ConditionalDraw draw) {
        if (draw == null) {
            throw new IllegalArgumentException("conditional draw must not be null");
        }
        return new GibbsStep(() -> draw);
    }

    /**
     * A conditional draw with per-chain state (for example samplers bound to the chain's random stream):
     * {@code factory} makes one for each chain.
     */
    public static GibbsStep perChain(java.util.function.Supplier<ConditionalDraw> factory) {
        if (factory == null) {
            throw new IllegalArgumentException("conditional draw factory must not be null");
        }
        return new GibbsStep(factory);
    }

    @Override
    public Updater start(Target target) {
        ConditionalDraw draw = perChain.get();
        return (state, rng, adapt) -> {
            draw.draw(state.point(), rng);
            state.refresh();
        };
    }
}
