package dev.cairn.models;

import dev.cairn.samplers.Slice;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Per-chain slice updates of single coordinates through a model's own local conditional densities, with
 * stepping-out widths adapted in warmup (the models whose sweeps are hand-built use it).
 */
public final class LocalSlice {
    private final Slice.Widths widths;
    private final double[] result = new double[2];
    private UniformRandomProvider rng;
    private boolean adapt;

    public LocalSlice(int coordinates, double initialWidth) {
        this.widths = new Slice.Widths(coordinates, initialWidth);
    }

    /** Binds the chain's stream and whether this sweep is in warmup. */
    public void begin(UniformRandomProvider r, boolean adaptNow) {
        this.rng = r;
        this.adapt = adaptNow;
    }

    /** Slice-samples x[i] from the density f (a function of x[i]'s new value). */
    public void update(double[] x, int i, DoubleUnaryOperator f) {
        double x0 = x[i];
        Slice.sample(f, x0, f.applyAsDouble(x0), widths.get(i), 64, rng, result);
        x[i] = result[0];
        widths.record(i, result[0] - x0, adapt);
    }

    /** A slice move of a free quantity starting at x0 (no stored coordinate, no width adaptation). */
    public double move(DoubleUnaryOperator f, double x0, double width) {
        Slice.sample(f, x0, f.applyAsDouble(x0), width, 64, rng, result);
        return result[0];
    }

    public UniformRandomProvider rng() {
        return rng;
    }
}
