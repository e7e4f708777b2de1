package dev.cairn.samplers;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CancellationException;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Runs chains in parallel threads and collects their kept draws on the parameters' natural scale.
 *
 * <p>Chain c uses only {@link RandomStreams#forChain(long, int) the stream of (seed, c)} and writes only its
 * own slice of the output, so the draws are bit-identical whatever the number of threads.
 */
public final class ChainRunner {
    private final RunSettings settings;
    private final Progress progress;
    private final Cancellation cancellation;

    private ChainRunner(RunSettings settings, Progress progress, Cancellation cancellation) {
        this.settings = settings;
        this.progress = progress;
        this.cancellation = cancellation;
    }

    /**
     * @param settings chains, warmup, draws, thinning, seed and threads
     * @return a runner with no progress report and no cancellation
     */
    public static ChainRunner of(RunSettings settings) {
        if (settings == null) {
            throw new IllegalArgumentException("run settings must not be null");
        }
        return new ChainRunner(settings, Progress.NONE, new Cancellation());
    }

    /**
     * @param p told of iterations done, for a progress display
     * @return this runner reporting to {@code p}
     */
    public ChainRunner withProgress(Progress p) {
        return new ChainRunner(settings, p == null ? Progress.NONE : p, cancellation);
    }

    /**
     * @param c checked between iterations; the run stops when it is cancelled
     * @return this runner watching {@code c}
     */
    public ChainRunner withCancellation(Cancellation c) {
        return new ChainRunner(settings, progress, c == null ? new Cancellation() : c);
    }

    /** @return the run's settings */
    public RunSettings settings() {
        return settings;
    }

    /**
     * MCMC: warmup with adaptation, then kept (thinned) draws with tuning frozen. Chain c uses the random
     * stream of (seed, c) only, so the draws are the same on any number of threads.
     *
     * @param target the log density
     * @param sweep  the steps of one iteration
     * @param init   the chains' starting points (redrawn while their density is zero)
     * @return the kept draws of every coordinate, on the natural scale
     * @throws NoStartException when a chain finds no starting point of positive density
     */
    public Draws run(Target target, Sweep sweep, Initializer init) {
        return run(target, sweep, init, Recording.coordinates(target.parameters()));
    }

    /**
     * The same, keeping of each draw what {@code recording} computes from it (named quantities instead of
     * the coordinates, say), so that a model with many coordinates does not hold them all.
     *
     * @param target    the log density
     * @param sweep     the steps of one iteration
     * @param init      the chains' starting points (redrawn while their density is zero)
     * @param recording what is kept of each draw
     * @return the kept draws, one column per recorded name
     * @throws NoStartException when a chain finds no starting point of positive density
     * @throws RunTooLargeException when the draws would hold more values than the cancellation allows
     */
    public Draws run(Target target, Sweep sweep, Initializer init, Recording recording) {
        int d = recording.names().size();
        cancellation.admit(settings.chains(), settings.draws(), d);
        double[][][] out = new double[settings.chains()][d][settings.draws()];
        progress.start(settings.chains(), settings.iterationsPerChain());
        parallel((chain, stop) -> {
            UniformRandomProvider rng = RandomStreams.forChain(settings.seed(), chain);
            Chain ch = Chain.start(target, sweep, init, chain, rng);
            long total = settings.iterationsPerChain();
            long every = Math.max(1, total / 200);
            double[] kept = new double[d];
            Recording.Recorder recorder = recording.start();
            long done = 0;
            for (int t = 0; t < settings.warmup(); t++) {
                checkCancelled(stop);
                ch.iterate(true);
                if (++done % every == 0) {
                    progress.report(chain, done, total, true);
                }
            }
            for (int k = 0; k < settings.draws(); k++) {
                for (int s = 0; s < settings.thin(); s++) {
                    checkCancelled(stop);
                    ch.iterate(false);
                    if (++done % every == 0) {
                        progress.report(chain, done, total, false);
                    }
                }
                recorder.record(ch.state().point(), kept);
                for (int j = 0; j < d; j++) {
                    out[chain][j][k] = kept[j];
                }
            }
            progress.report(chain, total, total, false);
        });
        return Draws.adopt(recording.names(), out);
    }

    /**
     * Independent draws from a closed-form posterior; warmup and thinning do not apply.
     *
     * @param parameters the coordinates drawn
     * @param sampler    makes each chain's source of exact draws from its random stream
     * @return the draws
     */
    public Draws runExact(Parameters parameters, ExactSampler sampler) {
        int d = parameters.size();
        cancellation.admit(settings.chains(), settings.draws(), d);
        double[][][] out = new double[settings.chains()][d][settings.draws()];
        progress.start(settings.chains(), settings.draws());
        parallel((chain, stop) -> {
            ExactSampler.Source source = sampler.start(RandomStreams.forChain(settings.seed(), chain));
            double[] draw = new double[d];
            long every = Math.max(1, settings.draws() / 200);
            for (int k = 0; k < settings.draws(); k++) {
                checkCancelled(stop);
                source.draw(draw);
                for (int j = 0; j < d; j++) {
                    out[chain][j][k] = draw[j];
                }
                if ((k + 1) % every == 0) {
                    progress.report(chain, k + 1, settings.draws(), false);
                }
            }
        });
        return Draws.adopt(parameters.names(), out);
    }

    private interface ChainTask {
        void run(int chain, AtomicBoolean stop);
    }

    private void checkCancelled(AtomicBoolean stop) {
        if (stop.get() || cancellation.isCancelled()) {
            throw new CancellationException("run cancelled");
        }
    }

    private void parallel(ChainTask task) {
        int threads = Math.min(settings.threads(), settings.chains());
        AtomicBoolean stop = new AtomicBoolean();
        if (threads == 1) {
            for (int c = 0; c < settings.chains(); c++) {
                task.run(c, stop);
            }
            return;
        }
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "cairn-chain");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<?>> futures = new ArrayList<>();
            for (int c = 0; c < settings.chains(); c++) {
                final int chain = c;
                futures.add(pool.submit(() -> task.run(chain, stop)));
            }
            for (Future<?> f : futures) {
                try {
                    f.get();
                } catch (ExecutionException e) {
                    stop.set(true);
                    Throwable cause = e.getCause();
                    if (cause instanceof RuntimeException re) {
                        throw re;
                    }
                    if (cause instanceof Error err) {
                        throw err;
                    }
                    throw new IllegalStateException(cause);
                } catch (InterruptedException e) {
                    stop.set(true);
                    Thread.currentThread().interrupt();
                    throw new CancellationException("interrupted");
                }
            }
        } finally {
            pool.shutdownNow();
        }
    }
}
