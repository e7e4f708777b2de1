package dev.cairn.samplers;

import java.util.function.Function;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * An exact draw from a full conditional supplied by a model (a Gibbs block). The model writes the new
 * values of its block into the unconstrained point; the chain's density is then recomputed.
 */
public final class GibbsStep implements Step {

    /** Draws some coordinates of {@code point} (unconstrained scale) from their full conditional. */
    @FunctionalInterface
    public interface ConditionalDraw {
        void draw(double[] point);
    }

    /** A stateless conditional draw that takes the chain's stream on each call. */
    @FunctionalInterface
    public interface StreamDraw {
        void draw(double[] point, UniformRandomProvider stream);
    }

    private final Function<UniformRandomProvider, ConditionalDraw> perChain;

    private GibbsStep(Function<UniformRandomProvider, ConditionalDraw> perChain) {
        this.perChain = perChain;
    }

    /**
     * A stateless conditional draw, shared by all chains.
     *
     * @param draw writes a draw of its coordinates from their full conditional into the point
     * @return the step
     * @throws IllegalArgumentException when draw is null
     */
    public static GibbsStep of(StreamDraw draw) {
        if (draw == null) {
            throw new IllegalArgumentException("conditional draw must not be null");
        }
        return new GibbsStep(stream -> point -> draw.draw(point, stream));
    }

    /**
     * A conditional draw with per-chain state, such as samplers bound to the chain's random stream:
     * {@code factory} makes one for each chain from the chain's stream.
     *
     * @param factory makes a chain's conditional draw from its random stream
     * @return the step
     * @throws IllegalArgumentException when factory is null
     */
    public static GibbsStep perChain(Function<UniformRandomProvider, ConditionalDraw> factory) {
        if (factory == null) {
            throw new IllegalArgumentException("conditional draw factory must not be null");
        }
        return new GibbsStep(factory);
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        ConditionalDraw draw = perChain.apply(stream);
        return (state, adapt) -> {
            draw.draw(state.point());
            state.refresh();
        };
    }
}
