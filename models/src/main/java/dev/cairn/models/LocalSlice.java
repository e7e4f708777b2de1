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
    private final UniformRandomProvider rng;
    private boolean adapt;

    /**
     * @param coordinates  how many coordinates it may update (widths are kept per coordinate)
     * @param initialWidth the starting stepping-out width
     * @param stream       the chain's random stream
     */
    public LocalSlice(int coordinates, double initialWidth, UniformRandomProvider stream) {
        this.widths = new Slice.Widths(coordinates, initialWidth);
        this.rng = stream;
    }

    /**
     * Says whether this sweep is in warmup (widths adapt) or not (widths frozen).
     *
     * @param adaptNow true in warmup
     */
    public void begin(boolean adaptNow) {
        this.adapt = adaptNow;
    }

    /**
     * Slice-samples x[i] from the density f (a function of x[i]'s new value).
     *
     * @param x the point (x[i] is replaced)
     * @param i the coordinate
     * @param f the log density of x[i]'s value, other coordinates held
     */
    public void update(double[] x, int i, DoubleUnaryOperator f) {
        double x0 = x[i];
        Slice.sample(f, x0, f.applyAsDouble(x0), widths.get(i), 64, rng, result);
        x[i] = result[0];
        widths.record(i, result[0] - x0, adapt);
    }

    /**
     * A slice move of a free quantity starting at x0 (no stored coordinate, no width adaptation).
     *
     * @param f     the quantity's log density
     * @param x0    its current value
     * @param width the stepping-out width, > 0
     * @return the new value
     */
    public double move(DoubleUnaryOperator f, double x0, double width) {
        Slice.sample(f, x0, f.applyAsDouble(x0), width, 64, rng, result);
        return result[0];
    }

    /**
     * {@return the chain's random stream this slice draws from}
     */
    public UniformRandomProvider rng() {
        return rng;
    }
}
