package dev.cairn.models.plan;

import dev.cairn.models.Version;
import dev.cairn.models.result.Metric;
import dev.cairn.models.result.Result;
import dev.cairn.samplers.Progress;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.IntStream;
import org.apache.commons.rng.JumpableUniformRandomProvider;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;

/**
 * Simulates whole tests under a plan. Each test draws its truth (baseline and lifts, when they are
 * distributions), then day by day each arm's new users as sufficient statistics ({@link DailyStats}: exact
 * laws, no per-user work), and at each look day applies the rule ({@link LookRule}) to the data so far. Every
 * look is kept in the tallies twice: as a fixed-horizon analysis on that day, and — at the first look that
 * decides — as the stop of the sequential rule. Looks start on minDays.
 *
 * <p>Tests run in blocks of {@value #BLOCK}; block b's random stream is the seed's xoshiro256++ generator
 * advanced by b + 1 jumps of 2^128, and its tests use it in order. Block tallies are added in block order, so
 * the figures are the same on any number of threads.
 */
public final class Planner {
    /** Tests per block (one random stream each). */
    static final int BLOCK = 50;

    private Planner() {
    }

    /**
     * Runs a plan.
     *
     * @param plan     the plan
     * @param threads  worker threads (the figures do not depend on them)
     * @param progress receives tests done (as one "chain" of experiments steps)
     * @return the figures
     */
    public static PlanResult run(PlanSpec plan, int threads, Progress progress) {
        long started = System.nanoTime();
        int[] lookDays = plan.lookDays();
        int blocks = (plan.experiments() + BLOCK - 1) / BLOCK;
        UniformRandomProvider[] streams = new UniformRandomProvider[blocks];
        JumpableUniformRandomProvider master = (JumpableUniformRandomProvider) RandomSource.XO_SHI_RO_256_PP.create(plan.seed());
        for (int b = 0; b < blocks; b++) {
            streams[b] = master.jump();
        }
        progress.start(1, plan.experiments());
        AtomicLong done = new AtomicLong();
        ForkJoinPool pool = new ForkJoinPool(Math.max(1, threads));
        PlanTally[] tallies;
        try {
            tallies = pool.submit(() -> IntStream.range(0, blocks).parallel().mapToObj(b -> {
                PlanTally t = new PlanTally(plan.arms().size(), lookDays.length);
                int from = b * BLOCK, to = Math.min(plan.experiments(), from + BLOCK);
                Experiment experiment = new Experiment(plan, lookDays);
                for (int e = from; e < to; e++) {
                    experiment.run(streams[b], t);
                    progress.report(0, done.incrementAndGet(), plan.experiments(), false);
                }
                return t;
            }).toArray(PlanTally[]::new)).get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new java.util.concurrent.CancellationException("interrupted");
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) {
                throw re;
            }
            throw new IllegalStateException(e.getCause());
        } finally {
            pool.shutdownNow();
        }
        PlanTally all = new PlanTally(plan.arms().size(), lookDays.length);
        for (PlanTally t : tallies) {
            all.add(t);
        }
        double seconds = (System.nanoTime() - started) / 1e9;
        return summarise(plan, lookDays, all, new PlanResult.Run(seconds, threads, Version.get()));
    }

    /** One simulated test at a time, reusing its buffers. */
    private static final class Experiment {
        private final PlanSpec plan;
        private final int[] lookDays;
        private final LookRule rule;
        private final int k;
        private final double[][] sums;
        private final double[] day = new double[4];
        private final double[] truth;
        private final LookRule.Outcome outcome = new LookRule.Outcome();
        /** The last test's arms, reused when the next test's truth is the same (fixed effects and baseline). */
        private final DailyStats[] last;

        Experiment(PlanSpec plan, int[] lookDays) {
            this.plan = plan;
            this.lookDays = lookDays;
            this.rule = plan.lookRule();
            this.k = plan.arms().size();
            this.sums = new double[k][4];
            this.truth = new double[k];
            this.last = new DailyStats[k];
        }

        void run(UniformRandomProvider rng, PlanTally t) {
            double[] base = plan.baseline().draw(rng);
            DailyStats.Source[] sources = new DailyStats.Source[k];
            for (int a = 0; a < k; a++) {
                double p = Math.min(1, base[0] * (1 + plan.payerRateLift()[a].draw(rng)));
                double mu = base[1] + Math.log1p(plan.arppuLift()[a].draw(rng));
                ArmTruth arm = new ArmTruth(plan.usersPerDay()[a], p, Double.isNaN(base[2]) ? Double.NaN : mu, base[2]);
                truth[a] = value(plan.metric(), arm);
                if (last[a] == null || !last[a].truth().equals(arm)) {
                    last[a] = DailyStats.of(arm);
                }
                sources[a] = last[a].start(rng);
                java.util.Arrays.fill(sums[a], 0);
            }
            t.truth(truth, plan.control(), base);
            int look = 0;
            boolean stopped = false;
            for (int d = 1; d <= plan.maxDays(); d++) {
                for (int a = 0; a < k; a++) {
                    sources[a].next(day);
                    for (int j = 0; j < 4; j++) {
                        sums[a][j] += day[j];
                    }
                }
                if (d != lookDays[look]) {
                    continue;
                }
                rule.decide(sums, rng, outcome);
                t.fixed(look, outcome, truth, plan.control());
                if (!stopped && outcome.code != LookRule.KEEP_COLLECTING) {
                    t.stop(look, outcome, truth, plan.control());
                    stopped = true;
                }
                look++;
            }
            if (!stopped) {
                t.undecided(outcome, truth, plan.control());
            }
        }
    }

    /** The true value of the metric for an arm. */
    static double value(Metric metric, ArmTruth arm) {
        if (metric == Metric.PAYER_RATE) {
            return arm.payerRate();
        }
        return metric == Metric.ARPPU ? arm.arppu() : arm.arpu();
    }

    private static PlanResult summarise(PlanSpec plan, int[] lookDays, PlanTally t, PlanResult.Run run) {
        double n = t.tests;
        List<String> arms = plan.arms();
        String control = arms.get(plan.control());
        Map<String, Long> users = new LinkedHashMap<>();
        for (int a = 0; a < arms.size(); a++) {
            users.put(arms.get(a), plan.usersPerDay()[a]);
        }
        Metric metric = plan.metric();
        boolean lossRule = plan.rule() == LookRule.Kind.EXPECTED_LOSS;
        PlanResult.Settings settings = new PlanResult.Settings(arms, control, users, metric.key(),
                metric.unitLabel(plan.currency()), lossRule ? "expected-loss" : "prob-above", plan.tolerance(),
                lossRule ? (plan.tolerance() != null ? "spec" : "default") : null, lossRule ? null : plan.threshold(),
                plan.minDays(), plan.maxDays(), plan.lookEvery(), java.util.Arrays.stream(lookDays).boxed().toList(),
                plan.experiments(), plan.seed(), plan.approximate() ? "approximate" : "draws", plan.draws(), plan.currency());

        Baseline b = plan.baseline();
        String note = null;
        if (b instanceof Baseline.Drawn d) {
            note = d.note() != null ? d.note() : "drawn for each test from the plan's baseline priors";
        } else if (b instanceof Baseline.Posterior p) {
            note = "drawn for each test from the posterior draws of arm '" + p.arm() + "' in " + p.path() + " ("
                    + p.rows().length + " draws)";
        }
        double[] means = {t.baseSum[0] / n, t.baseSum[1] / n, t.baseSum[2] / n};
        if (b instanceof Baseline.Fixed f) {
            means = new double[] {f.payerRate(), f.logSpendMean(), f.logSpendSd()};
        }
        PlanResult.BaselineUsed baseline = new PlanResult.BaselineUsed(b.source(), means[0],
                b.hasSpend() ? means[1] : null, b.hasSpend() ? means[2] : null, note);
        Map<String, PlanResult.ArmAssumed> assumed = new LinkedHashMap<>();
        for (int a = 0; a < arms.size(); a++) {
            assumed.put(arms.get(a), new PlanResult.ArmAssumed(describe(plan.payerRateLift()[a]),
                    b.hasSpend() ? describe(plan.arppuLift()[a]) : null, t.valueSum[a] / n,
                    a == plan.control() ? null : t.liftSum[a] / n, t.bestShare[a] / n));
        }

        int looks = lookDays.length;
        long[] stopDays = new long[plan.maxDays() + 1];
        long ship = 0, keep = 0, shipWorse = 0, shipNotBetter = 0, shipBetter = 0, shipBest = 0, pickBest = 0;
        double loss = 0, regret = 0;
        for (int l = 0; l <= looks; l++) {
            stopDays[l < looks ? lookDays[l] : plan.maxDays()] += t.stopAt[l];
            ship += t.stopShip[l];
            keep += t.stopKeep[l];
            shipWorse += t.stopShipWorse[l];
            shipNotBetter += t.stopShipNotBetter[l];
            shipBetter += t.stopShipBetter[l];
            shipBest += t.stopShipBest[l];
            pickBest += t.stopPickBest[l];
            loss += t.stopLoss[l];
            regret += t.stopRegret[l];
        }
        long undecided = t.stopAt[looks];
        Map<String, Double> acted = new LinkedHashMap<>();
        for (int a = 0; a < arms.size(); a++) {
            acted.put(arms.get(a), t.acted[a] / n);
        }
        boolean uncertain = plan.uncertain();
        PlanResult.AtStop atStop = new PlanResult.AtStop((n - undecided) / n, ship / n, keep / n, undecided / n,
                shipWorse / n, shipNotBetter / n, shipBetter / n, shipBest / n, pickBest / n, loss / n, regret / n,
                uncertain ? null : ship / n, uncertain ? ship / n : null, duration(stopDays, t.tests), acted);

        List<PlanResult.Day> days = new ArrayList<>();
        long cumStop = 0, cumShip = 0, cumWorse = 0, cumBest = 0;
        double cumLoss = 0;
        for (int l = 0; l < looks; l++) {
            cumStop += t.stopAt[l];
            cumShip += t.stopShip[l];
            cumWorse += t.stopShipWorse[l];
            cumBest += t.stopShipBest[l];
            cumLoss += t.stopLoss[l];
            PlanResult.Sequential seq = new PlanResult.Sequential(t.stopAt[l] / n, cumStop / n, cumShip / n, cumWorse / n,
                    cumBest / n, cumStop == 0 ? null : cumLoss / cumStop);
            PlanResult.Fixed fixed = new PlanResult.Fixed(t.decided[l] / n, t.ship[l] / n, t.shipWorse[l] / n,
                    t.shipNotBetter[l] / n, t.shipBest[l] / n, t.pickBest[l] / n, t.loss[l] / n, t.regret[l] / n,
                    t.drew[l] / n);
            days.add(new PlanResult.Day(lookDays[l], seq, fixed));
        }
        return new PlanResult("plan", plan.title(), settings, new PlanResult.Assumptions(baseline, assumed), atStop, days,
                warnings(plan, t, lookDays), Result.CAUTIONS, run);
    }

    /** A lift as plan.json shows it: the number, or the distribution's parameters. */
    private static Object describe(Lift lift) {
        return switch (lift.family()) {
            case "fixed" -> lift.first();
            case "normal" -> Map.of("family", "normal", "mean", lift.first(), "sd", lift.second());
            default -> Map.of("family", "uniform", "lower", lift.first(), "upper", lift.second());
        };
    }

    private static PlanResult.Duration duration(long[] stopDays, long tests) {
        double mean = 0;
        for (int d = 0; d < stopDays.length; d++) {
            mean += d * (double) stopDays[d];
        }
        return new PlanResult.Duration(mean / tests, quantile(stopDays, tests, 0.10), quantile(stopDays, tests, 0.25),
                quantile(stopDays, tests, 0.50), quantile(stopDays, tests, 0.75), quantile(stopDays, tests, 0.90));
    }

    /** The smallest day by which at least share q of the tests had stopped. */
    private static int quantile(long[] stopDays, long tests, double q) {
        long cumulative = 0;
        for (int d = 0; d < stopDays.length; d++) {
            cumulative += stopDays[d];
            if (cumulative >= q * tests) {
                return d;
            }
        }
        return stopDays.length - 1;
    }

    private static List<String> warnings(PlanSpec plan, PlanTally t, int[] lookDays) {
        List<String> w = new ArrayList<>();
        long drew = 0;
        for (long d : t.drew) {
            drew += d;
        }
        if (plan.approximate() && drew > 0) {
            w.add(String.format(java.util.Locale.ROOT, "%.1f%% of looks had fewer than %d payers or non-payers in some "
                    + "arm and took %d exact posterior draws per arm instead of the approximation",
                    100.0 * drew / (t.tests * (double) lookDays.length), LookRule.APPROXIMATE_FROM, plan.draws()));
        }
        if (plan.experiments() < 2000) {
            w.add("only " + plan.experiments() + " simulated tests: shares carry a Monte Carlo error of up to about "
                    + String.format(java.util.Locale.ROOT, "%.1f", 100 * 0.5 / Math.sqrt(plan.experiments()))
                    + " percentage points");
        }
        return w;
    }
}
