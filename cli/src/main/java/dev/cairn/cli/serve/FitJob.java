package dev.cairn.cli.serve;

import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.ProgressTally;
import java.util.concurrent.CompletableFuture;

/**
 * One fit the service was asked for: its state, progress and, once finished, the answer it gives (status and
 * JSON body). Thread-safe: the runner writes it, request threads read it.
 */
final class FitJob {
    /** Where a fit is. */
    enum State {
        QUEUED("queued"), RUNNING("running"), DONE("done"), FAILED("failed"), TIMED_OUT("timed-out"),
        CANCELLED("cancelled");

        final String word;

        State(String word) {
            this.word = word;
        }

        boolean finished() {
            return this == DONE || this == FAILED || this == TIMED_OUT || this == CANCELLED;
        }
    }

    /** The answer of a finished fit. */
    record Answer(int status, byte[] body) {
    }

    final String id;
    final long submittedMillis;
    final Cancellation cancellation;
    private final CompletableFuture<Answer> answer = new CompletableFuture<>();
    private volatile State state;
    private volatile long finishedMillis;
    private volatile boolean timedOut;
    private final ProgressTally tracker = new ProgressTally();

    FitJob(String id, long submittedMillis, long maxKeptValues) {
        this.id = id;
        this.submittedMillis = submittedMillis;
        this.cancellation = new Cancellation(maxKeptValues);
        this.state = State.QUEUED;
    }

    /** A finished fit read back from the store. */
    static FitJob finished(String id, long finishedMillis, Answer answer) {
        FitJob job = new FitJob(id, finishedMillis, 1);
        job.finish(answer.status() == 200 ? State.DONE : answer.status() == 503 ? State.TIMED_OUT : State.FAILED,
                answer, finishedMillis);
        return job;
    }

    State state() {
        return state;
    }

    void running() {
        state = State.RUNNING;
    }

    /** Marks the fit as stopped by the time limit (the runner then reports it as such). */
    void timeUp() {
        timedOut = true;
        cancellation.cancel();
    }

    boolean timedOut() {
        return timedOut;
    }

    void finish(State finalState, Answer a, long nowMillis) {
        finishedMillis = nowMillis;
        state = finalState;
        answer.complete(a);
    }

    /** {@return completes with the answer once the fit has finished} */
    CompletableFuture<Answer> answer() {
        return answer;
    }

    /** {@return the answer, or null while the fit is queued or running} */
    Answer answerNow() {
        return answer.getNow(null);
    }

    long finishedMillis() {
        return finishedMillis;
    }

    Progress progress() {
        return tracker;
    }

    /** {@return the fraction of the fit's iterations done, 0 to 1} */
    double fractionDone() {
        return state.finished() ? 1.0 : tracker.share();
    }
}
