package dev.cairn.cli.serve;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.spec.Spec;
import dev.cairn.models.spec.SpecReader;
import java.nio.charset.StandardCharsets;
import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.CancellationException;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.Executors;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.ScheduledFuture;
import java.util.concurrent.SynchronousQueue;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * The fits behind {@code cairn serve}, without HTTP: a spec is checked on the caller's thread (so bad input
 * is answered at once), then queued for one of a fixed number of runners; a full queue refuses it with a
 * suggested wait. A running fit is stopped at the time limit. Finished answers are kept for a while (and
 * written to the store, when there is one), then forgotten oldest first.
 */
final class FitService implements AutoCloseable {
    /** The queue is full: ask again after {@code retryAfterSeconds}. */
    static final class Busy extends RuntimeException {
        final long retryAfterSeconds;

        Busy(long retryAfterSeconds, String message) {
            super(message);
            this.retryAfterSeconds = retryAfterSeconds;
        }
    }

    private final ServiceSettings settings;
    private final DataAccess access;
    private final ResultStore store;
    private final ThreadPoolExecutor runners;
    private final ScheduledExecutorService clock;
    private final Map<String, FitJob> jobs = new ConcurrentHashMap<>();
    private final Map<String, Runnable> waiting = new ConcurrentHashMap<>();
    private final AtomicInteger runningNow = new AtomicInteger();
    private final SecureRandom ids = new SecureRandom();
    private volatile double meanSeconds = Double.NaN; // of recent fits (a moving average), for Retry-After

    FitService(ServiceSettings settings) {
        this.settings = settings;
        this.access = DataAccess.of(settings.dataRoot());
        this.store = settings.store() == null ? null : ResultStore.open(settings.store());
        BlockingQueue<Runnable> queue = settings.queued() == 0 ? new SynchronousQueue<>()
                : new ArrayBlockingQueue<>(settings.queued());
        AtomicInteger n = new AtomicInteger();
        this.runners = new ThreadPoolExecutor(settings.running(), settings.running(), 0, TimeUnit.SECONDS, queue,
                r -> daemon(r, "cairn-fit-" + n.incrementAndGet()));
        this.clock = Executors.newSingleThreadScheduledExecutor(r -> daemon(r, "cairn-service-clock"));
        if (store != null) {
            for (ResultStore.Stored s : store.readAll()) {
                jobs.put(s.id(), FitJob.finished(s.id(), s.finishedMillis(), s.answer()));
            }
        }
        long sweepMillis = Math.max(100, Math.min(10_000, settings.keepFor().toMillis() / 4));
        clock.scheduleWithFixedDelay(this::forgetOld, 0, sweepMillis, TimeUnit.MILLISECONDS);
    }

    private static Thread daemon(Runnable r, String name) {
        Thread t = new Thread(r, name);
        t.setDaemon(true);
        return t;
    }

    ServiceSettings settings() {
        return settings;
    }

    /**
     * Checks a spec and queues its fit.
     *
     * @param body the spec's JSON text
     * @return the queued fit
     * @throws InputException naming the field of a bad spec, or a limit it passes
     * @throws Busy           when every runner is busy and the queue is full
     */
    FitJob submit(String body) {
        Spec spec = SpecReader.parse(body, "request");
        if (spec.data() != null && spec.data().rows() != null && spec.data().rows().size() > settings.maxRows()) {
            throw new InputException(String.format(Locale.ROOT, "/data/rows: %,d inline rows, more than the %,d this "
                    + "service takes (--max-rows)", spec.data().rows().size(), settings.maxRows()));
        }
        access.check(spec.tree());
        FitJob job = new FitJob(newId(), System.currentTimeMillis(), settings.maxKeptValues());
        Runnable task = () -> run(job, spec);
        jobs.put(job.id, job);
        waiting.put(job.id, task);
        try {
            runners.execute(task);
        } catch (RejectedExecutionException e) {
            jobs.remove(job.id);
            waiting.remove(job.id);
            long after = retryAfterSeconds();
            throw new Busy(after, String.format(Locale.ROOT, "every runner is busy and %d fits are waiting (--running %d, "
                    + "--queued %d); ask again in about %d s", settings.queued(), settings.running(), settings.queued(), after));
        }
        return job;
    }

    private String newId() {
        byte[] b = new byte[16];
        ids.nextBytes(b);
        return HexFormat.of().formatHex(b);
    }

    /** About how long until a queue slot frees: the queue ahead, over the runners, at the recent mean fit time. */
    private long retryAfterSeconds() {
        if (Double.isNaN(meanSeconds)) {
            return 1; // no fit has finished yet to tell how long they take; asking again is cheap
        }
        double ahead = (runners.getQueue().size() + (double) runningNow.get()) / settings.running();
        return Math.max(1, Math.min(3600, (long) Math.ceil(ahead * meanSeconds)));
    }

    private void run(FitJob job, Spec spec) {
        if (waiting.remove(job.id) == null || job.cancellation.isCancelled()) {
            return; // deleted while it waited
        }
        runningNow.incrementAndGet();
        job.running();
        long start = System.nanoTime();
        ScheduledFuture<?> limit = clock.schedule(job::timeUp, settings.timeLimit().toMillis(), TimeUnit.MILLISECONDS);
        FitJob.State state;
        FitJob.Answer answer;
        try {
            FitOptions options = new FitOptions(job.progress(), job.cancellation, settings.threadsPerFit());
            FitOutcome outcome = Cairn.fit(spec, access.base(), options);
            state = FitJob.State.DONE;
            answer = new FitJob.Answer(200, ResultWriter.json(outcome.result()).getBytes(StandardCharsets.UTF_8));
        } catch (InputException e) {
            state = FitJob.State.FAILED;
            answer = new FitJob.Answer(400, ErrorBody.of(400, e.getMessage()));
        } catch (CancellationException e) {
            if (job.timedOut()) {
                state = FitJob.State.TIMED_OUT;
                String m = String.format(Locale.ROOT, "the fit ran past the time limit of %d s per fit (--time-limit) and "
                        + "was stopped; ask for fewer draws or a smaller table", settings.timeLimit().toSeconds());
                answer = new FitJob.Answer(503, ErrorBody.of(503, m));
            } else {
                state = FitJob.State.CANCELLED;
                answer = new FitJob.Answer(410, ErrorBody.of(410, "the fit was cancelled"));
            }
        } catch (OutOfMemoryError e) {
            state = FitJob.State.FAILED;
            answer = new FitJob.Answer(503, ErrorBody.of(503, "the fit needed more memory than the service has; ask "
                    + "for fewer draws or a smaller table"));
        } catch (RuntimeException e) {
            state = FitJob.State.FAILED;
            answer = new FitJob.Answer(500, ErrorBody.of(500, "internal error: " + e));
        } finally {
            limit.cancel(false);
            runningNow.decrementAndGet();
        }
        double took = (System.nanoTime() - start) / 1e9;
        meanSeconds = Double.isNaN(meanSeconds) ? took : 0.8 * meanSeconds + 0.2 * took;
        long now = System.currentTimeMillis();
        if (state != FitJob.State.CANCELLED && store != null && jobs.containsKey(job.id)) {
            try {
                store.write(job.id, answer, now);
            } catch (java.io.UncheckedIOException e) {
                answer = new FitJob.Answer(500, ErrorBody.of(500, e.getMessage()));
            }
        }
        job.finish(state, answer, now);
        forgetOld();
    }

    /**
     * @param id a fit's id
     * @return the fit, or null when there is none of that id (never was, deleted, or forgotten)
     */
    FitJob get(String id) {
        return jobs.get(id);
    }

    /**
     * Cancels a fit that has not finished, and forgets it (and its stored answer) either way.
     *
     * @param id a fit's id
     * @return the fit as it was, or null when there is none of that id
     */
    FitJob delete(String id) {
        FitJob job = jobs.remove(id);
        if (job == null) {
            return null;
        }
        Runnable task = waiting.remove(id);
        if (task != null) {
            runners.remove(task);
            job.finish(FitJob.State.CANCELLED, new FitJob.Answer(410, ErrorBody.of(410, "the fit was cancelled")),
                    System.currentTimeMillis());
        }
        job.cancellation.cancel();
        if (store != null) {
            store.delete(id);
        }
        return job;
    }

    /** {@return fits running now} */
    int running() {
        return runningNow.get();
    }

    /** {@return fits waiting for a runner} */
    int queued() {
        return runners.getQueue().size();
    }

    /** {@return finished answers kept} */
    int kept() {
        int n = 0;
        for (FitJob j : jobs.values()) {
            if (j.state().finished()) {
                n++;
            }
        }
        return n;
    }

    /** Forgets finished answers past the keeping time, then the oldest beyond the count and byte limits. */
    synchronized void forgetOld() {
        long now = System.currentTimeMillis();
        List<FitJob> finished = new ArrayList<>();
        for (FitJob j : jobs.values()) {
            if (j.state().finished() && j.answerNow() != null) {
                finished.add(j);
            }
        }
        finished.sort(Comparator.comparingLong(FitJob::finishedMillis));
        long bytes = 0;
        for (FitJob j : finished) {
            bytes += j.answerNow().body().length;
        }
        int count = finished.size();
        for (FitJob j : finished) {
            boolean old = now - j.finishedMillis() > settings.keepFor().toMillis();
            if (!old && count <= settings.keepCount() && bytes <= settings.keepBytes()) {
                break;
            }
            if (jobs.remove(j.id, j)) {
                count--;
                bytes -= j.answerNow().body().length;
                if (store != null) {
                    store.delete(j.id);
                }
            }
        }
    }

    @Override
    public void close() {
        for (FitJob j : jobs.values()) {
            j.cancellation.cancel();
        }
        runners.shutdownNow();
        clock.shutdownNow();
        try {
            runners.awaitTermination(10, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
