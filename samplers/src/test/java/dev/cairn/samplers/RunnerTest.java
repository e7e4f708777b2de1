package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.concurrent.CancellationException;
import java.util.concurrent.atomic.AtomicLong;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.api.Test;

class RunnerTest {
    private static final Target NORMAL_2D = Target.onConstrainedScale(
            Parameters.builder().real("mu").positive("sigma").build(),
            x -> -0.5 * (x[0] - 1) * (x[0] - 1) - x[1]);

    private static Sweep mixedSweep() {
        return Sweep.of(SliceStep.of(1.0, new int[] {0}), MetropolisStep.of(0.5, new int[] {1}),
                BlockMetropolisStep.of(0.5));
    }

    @Test
    void sameSeedGivesIdenticalDrawsOnOneAndFourThreads() {
        RunSettings s = RunSettings.of(4, 200, 300, 42);
        Draws one = ChainRunner.of(s.withThreads(1)).run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        Draws four = ChainRunner.of(s.withThreads(4)).run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        assertEquals(one, four);
    }

    @Test
    void differentSeedsGiveDifferentDraws() {
        Draws a = ChainRunner.of(RunSettings.of(2, 50, 50, 1)).run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        Draws b = ChainRunner.of(RunSettings.of(2, 50, 50, 2)).run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        assertNotEquals(a, b);
        // and chains within one run differ from each other (their streams are distinct)
        assertNotEquals(a.column("mu")[0][49], a.column("mu")[1][49]);
    }

    @Test
    void drawsAreOnTheNaturalScaleWithThinning() {
        Draws d = ChainRunner.of(RunSettings.of(3, 10, 40, 5).withThin(3))
                .run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        assertEquals(3, d.chains());
        assertEquals(40, d.iterations());
        assertEquals(java.util.List.of("mu", "sigma"), d.names());
        for (double s : d.pooled("sigma")) {
            assertTrue(s > 0, "sigma drawn on the positive scale: " + s);
        }
    }

    @Test
    void dispersedStartsDiffer() {
        Draws d = ChainRunner.of(RunSettings.of(4, 0, 1, 8)).run(NORMAL_2D, Sweep.of(MetropolisStep.of(1e-9)),
                Initializer.uniform(2));
        double[][] mu = d.column("mu");
        assertTrue(Math.abs(mu[0][0] - mu[1][0]) > 1e-6 && Math.abs(mu[2][0] - mu[3][0]) > 1e-6);
    }

    @Test
    void exactSamplerYieldsDrawsThatIgnoreThreadCount() {
        Parameters p = Parameters.real("z");
        ExactSampler normal = rng -> {
            ZigguratSampler.NormalizedGaussian gaussian = ZigguratSampler.NormalizedGaussian.of(rng);
            return out -> out[0] = gaussian.sample();
        };
        RunSettings s = RunSettings.of(4, 0, 5000, 3);
        Draws one = ChainRunner.of(s.withThreads(1)).runExact(p, normal);
        Draws two = ChainRunner.of(s.withThreads(2)).runExact(p, normal);
        assertEquals(one, two);
        MonteCarlo.assertMean(one.column("z"), 0.0, "exact z");
        MonteCarlo.assertSd(one.column("z"), 0.0, 1.0, "exact z");
    }

    @Test
    void progressReachesTheEndOfEveryChain() {
        AtomicLong finished = new AtomicLong();
        RunSettings s = RunSettings.of(3, 100, 100, 1);
        ChainRunner.of(s).withProgress((chain, done, total, warmup) -> {
            assertEquals(200, total);
            if (done == total) {
                finished.incrementAndGet();
            }
        }).run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        assertTrue(finished.get() >= 3);
    }

    @Test
    void cancellationStopsTheRun() {
        Cancellation cancel = new Cancellation();
        RunSettings s = RunSettings.of(2, 1_000_000, 1_000_000, 1);
        ChainRunner runner = ChainRunner.of(s).withCancellation(cancel).withProgress((chain, done, total, warmup) -> {
            if (done > 1000) {
                cancel.cancel();
            }
        });
        assertThrows(CancellationException.class, () -> runner.run(NORMAL_2D, mixedSweep(), Initializer.uniform(2)));
    }

    @Test
    void theTallyOfARunOnlyGrowsAndEndsWhole() {
        ProgressTally tally = new ProgressTally();
        java.util.List<Double> shares = java.util.Collections.synchronizedList(new java.util.ArrayList<>());
        ProgressTally watched = new ProgressTally() {
            @Override
            public void report(int chain, long iterations, long total, boolean warmup) {
                tally.report(chain, iterations, total, warmup);
                shares.add(tally.share());
            }

            @Override
            public void start(int chains, long totalPerChain) {
                tally.start(chains, totalPerChain);
            }
        };
        ChainRunner.of(RunSettings.of(3, 400, 600, 5).withThreads(1)).withProgress(watched)
                .run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        assertEquals(3 * 1000, tally.total());
        assertEquals(tally.total(), tally.done());
        assertEquals(1.0, tally.share());
        assertTrue(!tally.warmup());
        for (int i = 1; i < shares.size(); i++) {
            assertTrue(shares.get(i) >= shares.get(i - 1), "one thread: the share never falls");
        }
    }

    @Test
    void aRunKeepingMoreValuesThanAllowedIsRefusedBeforeItStarts() {
        // 2 chains x 100 draws x 2 coordinates = 400 values: 400 allowed runs, 399 does not (and says so)
        RunSettings s = RunSettings.of(2, 10, 100, 1);
        ChainRunner.of(s).withCancellation(new Cancellation(400)).run(NORMAL_2D, mixedSweep(), Initializer.uniform(2));
        java.util.concurrent.atomic.AtomicBoolean started = new java.util.concurrent.atomic.AtomicBoolean();
        ChainRunner refused = ChainRunner.of(s).withCancellation(new Cancellation(399))
                .withProgress((chain, done, total, warmup) -> started.set(true));
        RunTooLargeException e = assertThrows(RunTooLargeException.class,
                () -> refused.run(NORMAL_2D, mixedSweep(), Initializer.uniform(2)));
        assertTrue(e.getMessage().contains("2 x 100 x 2 = 400 values"), e.getMessage());
        assertEquals(399, e.limit());
        assertTrue(!started.get(), "no chain may start");
        assertThrows(RunTooLargeException.class, () -> ChainRunner.of(s).withCancellation(new Cancellation(399))
                .runExact(Parameters.real("a", "b"), rng -> draw -> { }));
        assertEquals(Long.MAX_VALUE, Cancellation.values(Integer.MAX_VALUE, Integer.MAX_VALUE, Integer.MAX_VALUE));
    }

    @Test
    void startsOutsideTheSupportAreRedrawn() {
        // Support only for x > 1: most dispersed starts in (-2, 2) miss it and must be redrawn.
        Target t = Target.of(Parameters.real("x"), x -> x[0] > 1 ? -x[0] : Double.NEGATIVE_INFINITY);
        Draws d = ChainRunner.of(RunSettings.of(2, 100, 100, 4)).run(t, Sweep.of(SliceStep.of(1)), Initializer.uniform(2));
        for (double x : d.pooled("x")) {
            assertTrue(x > 1);
        }
    }

    @Test
    void gibbsBlocksReproduceABivariateNormal() {
        // (a, b) standard bivariate normal with correlation r: a | b ~ N(r b, 1 - r^2) and vice versa.
        double r = 0.8;
        double sd = Math.sqrt(1 - r * r);
        Target t = Target.of(Parameters.real("a", "b"),
                x -> -0.5 * (x[0] * x[0] - 2 * r * x[0] * x[1] + x[1] * x[1]) / (1 - r * r));
        GibbsStep drawA = GibbsStep.of((x, rng) -> x[0] = r * x[1] + sd * ZigguratSampler.NormalizedGaussian.of(rng).sample());
        GibbsStep drawB = GibbsStep.of((x, rng) -> x[1] = r * x[0] + sd * ZigguratSampler.NormalizedGaussian.of(rng).sample());
        Draws d = ChainRunner.of(RunSettings.of(4, 100, 5000, 12)).run(t, Sweep.of(drawA, drawB), Initializer.uniform(2));
        MonteCarlo.assertMean(d.column("b"), 0.0, "gibbs b");
        MonteCarlo.assertSd(d.column("b"), 0.0, 1.0, "gibbs b");
        Draws withProduct = d.withDerived("ab", x -> x[0] * x[1]);
        MonteCarlo.assertMean(withProduct.column("ab"), r, "gibbs E[ab] = correlation");
    }
}
