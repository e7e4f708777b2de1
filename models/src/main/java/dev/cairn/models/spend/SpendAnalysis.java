package dev.cairn.models.spend;

import dev.cairn.models.data.ArmStats;
import dev.cairn.models.decision.Decisions;
import dev.cairn.models.data.SpendData;
import dev.cairn.models.result.ArmSummary;
import dev.cairn.models.result.Check;
import dev.cairn.models.result.Comparison;
import dev.cairn.models.result.Interval;
import dev.cairn.samplers.Draws;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.special.Erf;
import dev.cairn.samplers.RandomStreams;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ChengBetaSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/** Quantities derived from spend draws: ARPPU and ARPU, per-arm summaries, comparisons, P(best), checks. */
public final class SpendAnalysis {
    /** Replicated data sets drawn for the predictive checks. */
    static final int REPLICATIONS = 1000;
    /** Up to this many payers a replicated mean spend is simulated payer by payer; above, by the CLT. */
    static final int SIMULATE_PAYERS_UP_TO = 20_000;
    /** Predictive p-values below this (or above 1 - this) flag a misfit. */
    static final double MISFIT = 0.005;

    private SpendAnalysis() {
    }

    /**
     * Adds arppu[arm] = exp(mu + sigma^2 / 2) and arpu[arm] = payerRate x arppu for every arm.
     *
     * @param draws the model's draws
     * @param data  the arms' data (whether there is spend)
     * @return the draws with the derived columns (the same draws for conversion-only data)
     */
    public static Draws withDerived(Draws draws, SpendData data) {
        if (!data.hasSpend()) {
            return draws;
        }
        List<String> names = new ArrayList<>();
        List<Draws.Derived> fs = new ArrayList<>();
        for (ArmStats a : data.arms()) {
            int mu = draws.names().indexOf(SpendPosterior.name(SpendPosterior.LOG_SPEND_MEAN, a.arm()));
            int sigma = draws.names().indexOf(SpendPosterior.name(SpendPosterior.LOG_SPEND_SD, a.arm()));
            int rate = draws.names().indexOf(SpendPosterior.name(SpendPosterior.PAYER_RATE, a.arm()));
            names.add(SpendPosterior.name(SpendPosterior.ARPPU, a.arm()));
            fs.add(x -> Math.exp(x[mu] + 0.5 * x[sigma] * x[sigma]));
            names.add(SpendPosterior.name(SpendPosterior.ARPU, a.arm()));
            fs.add(x -> x[rate] * Math.exp(x[mu] + 0.5 * x[sigma] * x[sigma]));
        }
        return draws.withDerived(names, fs);
    }

    /**
     * The metrics compared: ARPU, payer rate and ARPPU with spend; the payer rate alone without.
     *
     * @param data the arms' data
     * @return the metrics' keys
     */
    public static List<String> metrics(SpendData data) {
        return data.hasSpend()
                ? List.of(SpendPosterior.ARPU, SpendPosterior.PAYER_RATE, SpendPosterior.ARPPU)
                : List.of(SpendPosterior.PAYER_RATE);
    }

    /**
     * Per-arm summaries (arms in parallel; each summary depends on its own draws only).
     *
     * @param draws the draws with derived columns
     * @param data  the arms' data
     * @param level the intervals' probability
     * @return per arm, its counts and metric intervals
     */
    public static Map<String, ArmSummary> arms(Draws draws, SpendData data, double level) {
        List<ArmSummary> summaries = inParallel(data.arms().size(), k -> {
            ArmStats a = data.arms().get(k);
            Interval rate = Interval.of(draws.pooled(SpendPosterior.name(SpendPosterior.PAYER_RATE, a.arm())), level);
            Interval arpu = data.hasSpend()
                    ? Interval.of(draws.pooled(SpendPosterior.name(SpendPosterior.ARPU, a.arm())), level) : null;
            Interval arppu = data.hasSpend()
                    ? Interval.of(draws.pooled(SpendPosterior.name(SpendPosterior.ARPPU, a.arm())), level) : null;
            return new ArmSummary(a.users(), a.payers(), arpu, rate, arppu);
        });
        Map<String, ArmSummary> out = new LinkedHashMap<>();
        for (int k = 0; k < summaries.size(); k++) {
            out.put(data.arms().get(k).arm(), summaries.get(k));
        }
        return out;
    }

    /** {@code task(0..n-1)} on the common pool, results in index order: the same on any number of threads. */
    static <T> List<T> inParallel(int n, java.util.function.IntFunction<T> task) {
        return java.util.stream.IntStream.range(0, n).parallel().mapToObj(task).toList();
    }

    /**
     * Every non-control arm against the control on every metric, draw by draw.
     *
     * @param draws   the draws with derived columns
     * @param data    the arms' data
     * @param control the control arm
     * @param level   the intervals' probability
     * @return the comparisons
     */
    public static List<Comparison> comparisons(Draws draws, SpendData data, String control, double level) {
        return Decisions.compareAll(data.armNames(), control, metrics(data),
                (metric, arm) -> draws.pooled(SpendPosterior.name(metric, arm)), level);
    }

    /**
     * P(best) per metric: the share of draws in which each arm has the highest value of the metric.
     *
     * @param draws the draws with derived columns
     * @param data  the arms' data
     * @return per metric, per arm, P(best)
     */
    public static Map<String, Map<String, Double>> probBest(Draws draws, SpendData data) {
        Map<String, Map<String, Double>> out = new LinkedHashMap<>();
        for (String metric : metrics(data)) {
            out.put(metric, Decisions.probBest(data.armNames(), arm -> draws.pooled(SpendPosterior.name(metric, arm))));
        }
        return out;
    }

    /**
     * Posterior predictive checks per arm (Gelman et al., BDA3 chapter 6): for evenly spaced posterior
     * draws, a replicated data set of the arm's size is drawn and its statistic compared with the observed
     * one. Statistics: share of users who did not pay; mean spend per user; payers' median, 90th and 99th
     * percentile; the largest spend. Replicated order statistics are drawn exactly without simulating
     * every payer: the k-th of m uniform order statistics is Beta(k, m - k + 1), the largest is V^(1/m)
     * (Devroye 1986, Non-Uniform Random Variate Generation, chapter V), mapped through the lognormal
     * quantile function. The replicated mean is simulated payer by payer up to 20,000 payers and by the
     * central limit theorem above.
     *
     * @param draws       the fit's draws, with derived quantities
     * @param data        the arms' data
     * @param seed        the run's seed
     * @param firstStream the first random stream the checks use (after the chains')
     * @return the checks and the replicated statistics
     */
    public static Checked checks(Draws draws, SpendData data, long seed, int firstStream) {
        if (!data.hasSpend()) {
            return new Checked(List.of(), Map.of());
        }
        List<Map<String, double[]>> kept = new ArrayList<>();
        for (int k = 0; k < data.arms().size(); k++) {
            kept.add(new LinkedHashMap<>());
        }
        // arm k replicates with random stream firstStream + k of seed: the arms run in parallel and the checks
        // are the same on any number of threads
        List<List<Check>> perArm = inParallel(data.arms().size(), k -> checks(draws, data, data.arms().get(k),
                RandomStreams.forChain(seed, firstStream + k), kept.get(k)));
        List<Check> out = new ArrayList<>();
        Map<String, double[]> replicated = new LinkedHashMap<>();
        for (int k = 0; k < perArm.size(); k++) {
            out.addAll(perArm.get(k));
            replicated.putAll(kept.get(k));
        }
        return new Checked(out, replicated);
    }

    /**
     * The posterior predictive checks and, for the report's plots, each replicated statistic's draws.
     *
     * @param checks     per arm and statistic, the observed value and its posterior predictive p-value
     * @param replicated the replicated statistic's draws under "arm/statistic"
     */
    public record Checked(List<Check> checks, Map<String, double[]> replicated) {
    }

    private static List<Check> checks(Draws draws, SpendData data, ArmStats a, UniformRandomProvider rng,
                                      Map<String, double[]> replicatedOut) {
        List<Check> out = new ArrayList<>();
        int total = draws.chains() * draws.iterations();
        int r = Math.min(REPLICATIONS, total);
        ZigguratSampler.NormalizedGaussian gaussian = ZigguratSampler.NormalizedGaussian.of(rng);
        boolean observedSpend = data.hasObservedSpendStatistics();
        double[] p = draws.pooled(SpendPosterior.name(SpendPosterior.PAYER_RATE, a.arm()));
        double[] mu = draws.pooled(SpendPosterior.name(SpendPosterior.LOG_SPEND_MEAN, a.arm()));
        double[] sigma = draws.pooled(SpendPosterior.name(SpendPosterior.LOG_SPEND_SD, a.arm()));
        String[] names = {"zeroShare", "meanSpend", "payerP50", "payerP90", "payerP99", "maxSpend"};
        double[] observed = {1 - (double) a.payers() / a.users(), a.spendSum() / a.users(), a.payerP50(),
            a.payerP90(), a.payerP99(), a.spendMax()};
        int statistics = observedSpend && a.payers() > 0 ? names.length : 1;
        double[] above = new double[statistics];
        double[][] kept = new double[statistics][r];
        for (int j = 0; j < r; j++) {
            int i = (int) ((long) j * total / r);
            int payers = replicatedPayers(a.users(), p[i], rng);
            double[] replicated = new double[statistics];
            replicated[0] = 1 - (double) payers / a.users();
            if (statistics > 1) {
                replicated[1] = payers == 0 ? 0 : replicatedTotal(payers, mu[i], sigma[i], gaussian) / a.users();
                replicated[2] = orderStatistic(payers, 0.5, mu[i], sigma[i], rng);
                replicated[3] = orderStatistic(payers, 0.9, mu[i], sigma[i], rng);
                replicated[4] = orderStatistic(payers, 0.99, mu[i], sigma[i], rng);
                replicated[5] = payers == 0 ? 0 : maximum(payers, mu[i], sigma[i], rng);
            }
            for (int s = 0; s < statistics; s++) {
                above[s] += replicated[s] > observed[s] ? 1 : replicated[s] == observed[s] ? 0.5 : 0;
                kept[s][j] = replicated[s];
            }
        }
        for (int s = 0; s < statistics; s++) {
            if (replicatedOut != null) {
                replicatedOut.put(a.arm() + "/" + names[s], kept[s]);
            }
            double pValue = above[s] / r;
            out.add(new Check(a.arm(), names[s], observed[s], pValue, pValue < MISFIT || pValue > 1 - MISFIT));
        }
        return out;
    }

    /**
     * A plain-words warning for each misfit.
     *
     * @param checks the predictive checks
     * @return one line per check marked a misfit
     */
    public static List<String> warnings(List<Check> checks) {
        List<String> out = new ArrayList<>();
        for (Check c : checks) {
            if (!c.misfit()) {
                continue;
            }
            String direction = c.pValue() < 0.5 ? "higher" : "lower";
            String meaning = switch (c.statistic()) {
                case "maxSpend", "payerP99", "meanSpend" -> c.pValue() < 0.5
                        ? "a few payers spend more than a lognormal allows (extreme payers); ARPU and ARPPU intervals "
                                + "may be too narrow - check those users, or analyse with and without them"
                        : "payers' spend has a lighter upper tail than a lognormal; ARPPU may be overstated";
                case "zeroShare" -> "the share of non-payers does not match the payer rate";
                default -> "payers' spend is not shaped like a lognormal";
            };
            out.add(String.format(java.util.Locale.ROOT,
                    "arm %s: observed %s (%.4g) is %s than the model reproduces (predictive p = %.3f): %s.",
                    c.arm(), c.statistic(), c.observed(), direction, c.pValue(), meaning));
        }
        return out;
    }

    /**
     * Binomial(n, p) payers: exact inversion (commons-math3) while n min(p, 1 - p) < 1,000; above that the
     * de Moivre-Laplace normal approximation with continuity correction, whose error there is far below
     * the resolution of a predictive p-value from 1,000 replications (and exact inversion of a
     * multi-million-user arm would cost more than the rest of the fit).
     */
    private static int replicatedPayers(long users, double p, UniformRandomProvider rng) {
        if (users > Integer.MAX_VALUE) {
            throw new IllegalArgumentException("an arm with more than " + Integer.MAX_VALUE + " users");
        }
        double u = rng.nextDouble();
        if (users * Math.min(p, 1 - p) < 1000) {
            return new BinomialDistribution(null, (int) users, p).inverseCumulativeProbability(u);
        }
        double m = Math.floor(users * p + Math.sqrt(users * p * (1 - p)) * normalQuantile(u) + 0.5);
        return (int) Math.max(0, Math.min(users, m));
    }

    private static double replicatedTotal(int payers, double mu, double sigma, ZigguratSampler.NormalizedGaussian g) {
        if (payers <= SIMULATE_PAYERS_UP_TO) {
            double sum = 0;
            for (int i = 0; i < payers; i++) {
                sum += Math.exp(mu + sigma * g.sample());
            }
            return sum;
        }
        double s2 = sigma * sigma;
        double mean = Math.exp(mu + s2 / 2);
        double variance = Math.expm1(s2) * Math.exp(2 * mu + s2);
        return payers * mean + Math.sqrt(payers * variance) * g.sample();
    }

    /** The replicated payer q-quantile (order statistic floor(q (m - 1)) + 1 of m). */
    private static double orderStatistic(int payers, double q, double mu, double sigma, UniformRandomProvider rng) {
        if (payers == 0) {
            return 0;
        }
        int k = (int) Math.floor(q * (payers - 1)) + 1;
        double u = ChengBetaSampler.of(rng, k, payers - k + 1.0).sample();
        return Math.exp(mu + sigma * normalQuantile(u));
    }

    /** The largest of m lognormals: U = V^(1/m); 1 - U = -expm1(log V / m) keeps the upper tail exact. */
    private static double maximum(int payers, double mu, double sigma, UniformRandomProvider rng) {
        double upper = -Math.expm1(Math.log(rng.nextDouble()) / payers);
        return Math.exp(mu - sigma * normalQuantile(upper));
    }

    /** Standard normal quantile via the inverse complementary error function, accurate in both tails. */
    static double normalQuantile(double u) {
        return -Math.sqrt(2) * Erf.erfcInv(2 * u);
    }
}
