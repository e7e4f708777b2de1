package dev.cairn.samplers;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * Random-walk Metropolis on a block of coordinates with an adaptive proposal covariance.
 *
 * <p>Haario, Saksman & Tamminen (2001), "An adaptive Metropolis algorithm", Bernoulli 7(2):223-242:
 * the proposal is x' ~ N(x, lambda (Sigma_n + eps I)), where Sigma_n is the empirical covariance of the
 * chain's history so far (updated with Welford's recurrences) and, before enough history exists, a
 * fixed diagonal covariance. lambda starts at 2.38^2 / d and is tuned towards acceptance 0.234 with the
 * Robbins-Monro rule log lambda += n^-0.6 (alpha_n - 0.234), alpha_n the acceptance probability of
 * update n (Andrieu & Thoms 2008, "A tutorial on adaptive MCMC", Statistics and Computing 18:343-373,
 * Algorithm 4). The Cholesky factor (EJML) is refreshed every few updates. All adaptation happens in
 * warmup only; the kept draws use the frozen proposal.
 */
public final class BlockMetropolisStep implements Step {
    static final double TARGET_ACCEPTANCE = 0.234;
    private static final double JITTER = 1e-8;
    private static final int REFACTOR_EVERY = 10;
    private final int[] coordinates;
    private final double initialScale;

    private BlockMetropolisStep(int[] coordinates, double initialScale) {
        this.coordinates = coordinates;
        this.initialScale = initialScale;
    }

    /**
     * A block of all coordinates with initial proposal sd {@code scale} per coordinate.
     *
     * @param scale the initial proposal sd, a finite number > 0
     * @return the step
     * @throws IllegalArgumentException naming the bad scale
     */
    public static BlockMetropolisStep of(double scale) {
        return of(scale, null);
    }

    /**
     * A block of the given coordinates (all when null or empty) with initial proposal sd {@code scale}.
     *
     * @param scale       the initial proposal sd per coordinate, a finite number > 0
     * @param coordinates the block's coordinates, or null for all
     * @return the step
     * @throws IllegalArgumentException naming the bad scale or coordinate
     */
    public static BlockMetropolisStep of(double scale, int[] coordinates) {
        if (!(scale > 0) || Double.isInfinite(scale)) {
            throw new IllegalArgumentException("proposal scale must be a finite number > 0, was " + scale);
        }
        return new BlockMetropolisStep(Coordinates.checked(coordinates), scale);
    }

    @Override
    public Updater start(Target target, UniformRandomProvider stream) {
        return new BlockUpdater(Coordinates.resolve(coordinates, target), initialScale, stream);
    }

    /** Per-chain state: running mean and covariance of the history, the scale and the Cholesky factor. */
    public static final class BlockUpdater implements Updater {
        private final int[] coordinates;
        private final int d;
        private final double[] mean;
        private final double[][] comoment;
        private long n;
        private long adaptations;
        private double logLambda;
        private final DMatrixRMaj factor;
        private final CholeskyDecomposition_F64<DMatrixRMaj> cholesky;
        private final double[] z;
        private final double[] saved;
        private final int warmupBeforeCovariance;
        private long proposals;
        private long accepted;
        private final UniformRandomProvider stream;
        private final ZigguratSampler.NormalizedGaussian normal;

        BlockUpdater(int[] coordinates, double initialScale, UniformRandomProvider stream) {
            this.stream = stream;
            this.normal = ZigguratSampler.NormalizedGaussian.of(stream);
            this.coordinates = coordinates;
            this.d = coordinates.length;
            this.mean = new double[d];
            this.comoment = new double[d][d];
            this.logLambda = Math.log(2.38 * 2.38 / d);
            this.factor = new DMatrixRMaj(d, d);
            for (int i = 0; i < d; i++) {
                // Before any history: lambda * L L' = initialScale^2 I.
                factor.set(i, i, initialScale / Math.exp(logLambda / 2));
            }
            this.cholesky = DecompositionFactory_DDRM.chol(d, true);
            this.z = new double[d];
            this.saved = new double[d];
            this.warmupBeforeCovariance = Math.max(100, 10 * d);
        }

        /** {@return the empirical covariance of the history this updater has adapted to} */
        public double[][] covariance() {
            double[][] c = new double[d][d];
            for (int i = 0; i < d; i++) {
                for (int j = 0; j < d; j++) {
                    c[i][j] = n > 1 ? comoment[i][j] / (n - 1) : Double.NaN;
                }
            }
            return c;
        }

        /** {@return the current multiplier lambda of the proposal covariance} */
        public double lambda() {
            return Math.exp(logLambda);
        }

        /**
         * {@return share of block proposals accepted so far (NaN before the first)}
         */
        public double acceptanceRate() {
            return proposals == 0 ? Double.NaN : (double) accepted / proposals;
        }

        @Override
        public void update(ChainState state, boolean adapt) {
            double[] x = state.point();
            double sd = Math.exp(logLambda / 2);
            for (int i = 0; i < d; i++) {
                z[i] = normal.sample();
                saved[i] = x[coordinates[i]];
            }
            for (int i = 0; i < d; i++) {
                double step = 0;
                for (int j = 0; j <= i; j++) {
                    step += factor.unsafe_get(i, j) * z[j];
                }
                x[coordinates[i]] = saved[i] + sd * step;
            }
            double lp = ChainState.evaluate(state.target(), x);
            double logRatio = lp - state.logDensity();
            proposals++;
            if (Math.log(stream.nextDouble()) < logRatio) {
                state.accept(lp);
                accepted++;
            } else {
                for (int i = 0; i < d; i++) {
                    x[coordinates[i]] = saved[i];
                }
            }
            if (adapt) {
                adapt(x, Math.min(1.0, Math.exp(logRatio)));
            }
        }

        private void adapt(double[] x, double acceptance) {
            n++;
            // Welford update of mean and co-moment with the current block values.
            for (int i = 0; i < d; i++) {
                z[i] = x[coordinates[i]] - mean[i];
                mean[i] += z[i] / n;
            }
            for (int i = 0; i < d; i++) {
                double after = x[coordinates[i]] - mean[i];
                for (int j = 0; j < d; j++) {
                    comoment[i][j] += after * z[j];
                }
            }
            if (n < warmupBeforeCovariance) {
                return;
            }
            adaptations++;
            logLambda += Math.pow(adaptations, -0.6) * (acceptance - TARGET_ACCEPTANCE);
            if (adaptations % REFACTOR_EVERY == 1) {
                refactor();
            }
        }

        private void refactor() {
            DMatrixRMaj cov = new DMatrixRMaj(d, d);
            double trace = 0;
            for (int i = 0; i < d; i++) {
                trace += comoment[i][i] / (n - 1);
            }
            double jitter = JITTER * Math.max(trace / d, 1e-12);
            for (int i = 0; i < d; i++) {
                for (int j = 0; j < d; j++) {
                    cov.set(i, j, comoment[i][j] / (n - 1) + (i == j ? jitter : 0.0));
                }
            }
            if (cholesky.decompose(cov)) {
                DMatrixRMaj lower = cholesky.getT(null);
                for (int i = 0; i < d; i++) {
                    for (int j = 0; j < d; j++) {
                        factor.set(i, j, j <= i ? lower.get(i, j) : 0.0);
                    }
                }
            }
            // A history that is not yet positive definite keeps the previous factor.
        }
    }
}
