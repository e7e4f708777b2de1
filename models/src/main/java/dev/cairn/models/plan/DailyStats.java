package dev.cairn.models.plan;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.AhrensDieterMarsagliaTsangGammaSampler;
import org.apache.commons.rng.sampling.distribution.DiscreteSampler;
import org.apache.commons.rng.sampling.distribution.MarsagliaTsangWangDiscreteSampler;
import org.apache.commons.rng.sampling.distribution.SharedStateDiscreteSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * One day of one arm simulated as its sufficient statistics, not user by user: for n users with payer rate
 * p and log spend x ~ N(mu, sigma^2),
 * <pre>
 *   m  ~ Binomial(n, p)                              payers
 *   S1 = sum x_i        ~ N(m mu, m sigma^2)         given m
 *   S2 = sum x_i^2      = sigma^2 W + S1^2 / m,  W ~ chi-square(m - 1), independent of S1
 * </pre>
 * (the sum of squares about the mean is sigma^2 times a chi-square with m - 1 degrees of freedom, independent
 * of the mean: Cochran's theorem). These are exactly the laws of the per-user sums, drawn at a cost that does
 * not grow with n. The binomial is drawn as a sum of binomials of at most {@link #CHUNK_LOG_ZERO} in log
 * probability of zero successes each (Commons RNG's Marsaglia-Tsang-Wang sampler needs (1 - p)^trials to be
 * representable); a sum of independent binomials of one p is binomial, so the draw stays exact.
 */
public final class DailyStats {
    /** The most -trials * log(1 - p) of one chunk: (1 - p)^trials stays far above the smallest double. */
    static final double CHUNK_LOG_ZERO = 500;
    private final ArmTruth truth;
    private final int[] chunks;
    /** The chunks' samplers with their tables built once, bound to a stream per {@link #start}. */
    private final SharedStateDiscreteSampler[] prototypes;

    private DailyStats(ArmTruth truth, int[] chunks) {
        this.truth = truth;
        this.chunks = chunks;
        this.prototypes = new SharedStateDiscreteSampler[chunks.length];
        UniformRandomProvider unused = RandomSource.SPLIT_MIX_64.create(0L); // replaced by each source's stream
        for (int i = 0; i < chunks.length; i++) {
            prototypes[i] = MarsagliaTsangWangDiscreteSampler.Binomial.of(unused, chunks[i], truth.payerRate());
        }
    }

    /**
     * @param truth the arm's assumed truth
     * @return the simulator of its days
     */
    public static DailyStats of(ArmTruth truth) {
        long n = truth.usersPerDay();
        double p = truth.payerRate();
        double perTrial = -Math.log1p(-Math.min(p, 1 - p)); // the sampler works with the smaller of p, 1 - p
        int k = n == 0 ? 0 : (int) Math.max(1, Math.min(n, Math.ceil(n * perTrial / CHUNK_LOG_ZERO)));
        int[] chunks = new int[k];
        for (int i = 0; i < k; i++) {
            chunks[i] = (int) (n / k + (i < n % k ? 1 : 0));
        }
        return new DailyStats(truth, chunks);
    }

    /** {@return how many binomial samplers one day's payers are drawn from} */
    int chunkCount() {
        return chunks.length;
    }

    /** {@return the arm's truth} */
    public ArmTruth truth() {
        return truth;
    }

    /**
     * A source of days bound to one random stream.
     *
     * @param rng the stream (used by this source only)
     * @return the source
     */
    public Source start(UniformRandomProvider rng) {
        return new Source(rng);
    }

    /** Draws days; not thread-safe (one per stream). */
    public final class Source {
        private final UniformRandomProvider rng;
        private final DiscreteSampler[] binomials;
        private final ZigguratSampler.NormalizedGaussian normal;

        private Source(UniformRandomProvider rng) {
            this.rng = rng;
            this.binomials = new DiscreteSampler[chunks.length];
            for (int i = 0; i < chunks.length; i++) {
                binomials[i] = prototypes[i].withUniformRandomProvider(rng);
            }
            this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        }

        /**
         * Draws one day's statistics.
         *
         * @param out modified: {users, payers, sum of log spend, sum of squared log spend}
         */
        public void next(double[] out) {
            long m = 0;
            for (DiscreteSampler b : binomials) {
                m += b.sample();
            }
            double mu = truth.logSpendMean(), sigma = truth.logSpendSd();
            double s1 = 0, s2 = 0;
            if (m > 0 && truth.hasSpend()) {
                s1 = m * mu + Math.sqrt((double) m) * sigma * normal.sample();
                double within = m > 1
                        ? AhrensDieterMarsagliaTsangGammaSampler.of(rng, 0.5 * (m - 1), 2.0).sample() : 0;
                s2 = sigma * sigma * within + s1 * s1 / m;
            }
            out[0] = truth.usersPerDay();
            out[1] = m;
            out[2] = s1;
            out[3] = s2;
        }
    }
}
