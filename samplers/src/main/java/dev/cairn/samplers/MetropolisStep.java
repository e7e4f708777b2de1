package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Random-walk Metropolis on one coordinate at a time (Metropolis-within-Gibbs), each coordinate with its
 * own proposal scale.
 *
 * <p>Adaptation (warmup only) follows Roberts & Rosenthal (2009), "Examples of adaptive MCMC", Journal of
 * Computational and Graphical Statistics 18(2):349-367, section 3: after each batch of updates, the
 * log proposal sd of a coordinate moves by delta(n) (n = batch number) up when the batch's acceptance
 * rate exceeded 0.44 and down otherwise. The paper uses batches of 50 and delta(n) = min(0.01, n^-1/2),
 * made for long runs; a warmup here is typically 1,000 sweeps, so batches are 20 sweeps and
 * delta(n) = min(0.5, n^-1/2), which still vanishes and lets the scale move by orders of magnitude.
 */
public final class MetropolisStep implements Step {
    static final double TARGET_ACCEPTANCE = 0.44;
    static final int BATCH = 20;
    private final int[] coordinates;
    private final double initialScale;

    private MetropolisStep(int[] coordinates, double initialScale) {
        this.coordinates = coordinates;
        this.initialScale = initialScale;
    }

    /**
     * Metropolis updates of every coordinate, one at a time, with initial proposal sd {@code scale}.
     *
     * @param scale the initial proposal sd, a finite number > 0
     * @return the step
     * @throws IllegalArgumentException naming the bad scale
     */
    public static MetropolisStep of(double scale) {
        return of(scale, null);
    }

    /**
     * Metropolis updates of the given coordinates (all when null or empty) with initial sd {@code scale}.
     *
     * @param scale       the initial proposal sd, a finite number > 0
     * @param coordinates the coordinates, or null for all
     * @return the step
     * @throws IllegalArgumentException naming the bad scale or coordinate
     */
    public static MetropolisStep of(double scale, int[] coordinates) {
        if (!(scale > 0) || Double.isInfinite(scale)) {
            throw new IllegalArgumentException("proposal scale must be a finite number > 0, was " + scale);
        }
        return new MetropolisStep(Coordinates.checked(coordinates), scale);
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new MetropolisUpdater(Coordinates.resolve(coordinates, target), initialScale, stream);
    }

    /** Per-chain state: log proposal sd per coordinate and the current batch's acceptance counts. */
    public static final class MetropolisUpdater implements Updater {
        private final int[] coordinates;
        private final double[] logScale;
        private final int[] acceptedInBatch;
        private int inBatch;
        private int batches;
        private long proposals;
        private long accepted;
        private final UniformRandomProvider stream;
        private final ZigguratSampler.NormalizedGaussian normal;

        MetropolisUpdater(int[] coordinates, double scale, UniformRandomProvider stream) {
            this.stream = stream;
            this.normal = ZigguratSampler.NormalizedGaussian.of(stream);
            this.coordinates = coordinates;
            this.logScale = new double[coordinates.length];
            java.util.Arrays.fill(logScale, Math.log(scale));
            this.acceptedInBatch = new int[coordinates.length];
        }

        /**
         * The current proposal sd of the k-th coordinate this updater moves.
         *
         * @param k the coordinate's position in the step's block
         * @return the sd
         */
        public double scale(int k) {
            return Math.exp(logScale[k]);
        }

        /** {@return share of proposals accepted so far, all coordinates together} */
        public double acceptanceRate() {
            return proposals == 0 ? Double.NaN : (double) accepted / proposals;
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            for (int k = 0; k < coordinates.length; k++) {
                int i = coordinates[k];
                double x0 = x[i];
                x[i] = x0 + Math.exp(logScale[k]) * normal.sample();
                double lp = ChainState.evaluate(state.target(), x);
                proposals++;
                if (Math.log(stream.nextDouble()) < lp - state.logDensity()) {
                    state.accept(lp);
                    accepted++;
                    acceptedInBatch[k]++;
                } else {
                    x[i] = x0;
                }
            }
            if (adapt && ++inBatch == BATCH) {
                batches++;
                double delta = Math.min(0.5, 1.0 / Math.sqrt(batches));
                for (int k = 0; k < coordinates.length; k++) {
                    logScale[k] += (double) acceptedInBatch[k] / BATCH > TARGET_ACCEPTANCE ? delta : -delta;
                    acceptedInBatch[k] = 0;
                }
                inBatch = 0;
            } else if (!adapt) {
                inBatch = 0;
                java.util.Arrays.fill(acceptedInBatch, 0);
            }
        }
    }
}
