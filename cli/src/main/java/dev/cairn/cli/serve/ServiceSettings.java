package dev.cairn.cli.serve;

import java.nio.file.Path;
import java.time.Duration;

/**
 * How {@code cairn serve} runs: where it listens, what a request may ask for, and how long results are kept.
 * Every limit is an option of {@code cairn serve}; the README lists them with their defaults.
 *
 * @param host            the address listened on (loopback by default)
 * @param port            the TCP port (0: any free port)
 * @param dataRoot        the only folder whose files a spec's paths may name; null: no file may be read
 * @param store           a folder where finished results are kept across restarts; null: memory only
 * @param waitFor         how long {@code POST /v1/fits} waits for the result before answering 202
 * @param maxBodyBytes    the largest request body
 * @param maxRows         the most inline data rows in one spec
 * @param maxKeptValues   the most values one fit may keep (chains x draws x recorded quantities)
 * @param running         fits that run at once
 * @param queued          fits that may wait for a free runner; beyond them requests get 429
 * @param timeLimit       the longest a fit may run; it is then stopped and answered 503
 * @param keepFor         how long a finished result is kept
 * @param keepCount       the most finished results kept (the oldest go first)
 * @param keepBytes       the most bytes of finished results kept (the oldest go first)
 * @param threadsPerFit   threads one fit's chains run on (results do not depend on it)
 */
public record ServiceSettings(String host, int port, Path dataRoot, Path store, Duration waitFor, long maxBodyBytes,
                              int maxRows, long maxKeptValues, int running, int queued, Duration timeLimit,
                              Duration keepFor, int keepCount, long keepBytes, int threadsPerFit) {

    /** The defaults of {@code cairn serve}. */
    public static final ServiceSettings DEFAULT = new ServiceSettings("127.0.0.1", 8731, null, null,
            Duration.ofSeconds(30), 16L << 20, 100_000, 50_000_000L, Math.max(1, Runtime.getRuntime().availableProcessors()),
            64, Duration.ofMinutes(10), Duration.ofHours(1), 1_000, 256L << 20, 1);

    public ServiceSettings {
        require(port >= 0 && port <= 65_535, "--port must be 0..65535, was " + port);
        require(!waitFor.isNegative(), "--wait must be >= 0, was " + waitFor.toSeconds());
        require(maxBodyBytes >= 1, "--max-body must be >= 1, was " + maxBodyBytes);
        require(maxRows >= 1, "--max-rows must be >= 1, was " + maxRows);
        require(maxKeptValues >= 1, "--max-kept-values must be >= 1, was " + maxKeptValues);
        require(running >= 1, "--running must be >= 1, was " + running);
        require(queued >= 0, "--queued must be >= 0, was " + queued);
        require(timeLimit.toMillis() >= 1, "--time-limit must be > 0");
        require(keepFor.toMillis() >= 1, "--keep-for must be > 0");
        require(keepCount >= 1, "--keep-count must be >= 1, was " + keepCount);
        require(keepBytes >= 1, "--keep-bytes must be >= 1, was " + keepBytes);
        require(threadsPerFit >= 1, "--threads-per-fit must be >= 1, was " + threadsPerFit);
    }

    private static void require(boolean ok, String message) {
        if (!ok) {
            throw new IllegalArgumentException(message);
        }
    }

    /** {@return a builder starting from these settings} */
    public Builder toBuilder() {
        return new Builder(this);
    }

    /** Settings changed one at a time (checked when built). */
    public static final class Builder {
        private String host;
        private int port;
        private Path dataRoot;
        private Path store;
        private Duration wait;
        private long maxBodyBytes;
        private int maxRows;
        private long maxKeptValues;
        private int running;
        private int queued;
        private Duration timeLimit;
        private Duration keepFor;
        private int keepCount;
        private long keepBytes;
        private int threadsPerFit;

        private Builder(ServiceSettings s) {
            host = s.host;
            port = s.port;
            dataRoot = s.dataRoot;
            store = s.store;
            wait = s.waitFor;
            maxBodyBytes = s.maxBodyBytes;
            maxRows = s.maxRows;
            maxKeptValues = s.maxKeptValues;
            running = s.running;
            queued = s.queued;
            timeLimit = s.timeLimit;
            keepFor = s.keepFor;
            keepCount = s.keepCount;
            keepBytes = s.keepBytes;
            threadsPerFit = s.threadsPerFit;
        }

        /** @param v the address listened on @return this builder */
        public Builder host(String v) {
            host = v;
            return this;
        }

        /** @param v the port (0: any free port) @return this builder */
        public Builder port(int v) {
            port = v;
            return this;
        }

        /** @param v the folder spec paths may name (null: none) @return this builder */
        public Builder dataRoot(Path v) {
            dataRoot = v;
            return this;
        }

        /** @param v the folder results are kept in (null: memory only) @return this builder */
        public Builder store(Path v) {
            store = v;
            return this;
        }

        /** @param v how long a POST waits for its result @return this builder */
        public Builder waitFor(Duration v) {
            wait = v;
            return this;
        }

        /** @param v the largest request body @return this builder */
        public Builder maxBodyBytes(long v) {
            maxBodyBytes = v;
            return this;
        }

        /** @param v the most inline rows @return this builder */
        public Builder maxRows(int v) {
            maxRows = v;
            return this;
        }

        /** @param v the most values a fit keeps @return this builder */
        public Builder maxKeptValues(long v) {
            maxKeptValues = v;
            return this;
        }

        /** @param v fits running at once @return this builder */
        public Builder running(int v) {
            running = v;
            return this;
        }

        /** @param v fits waiting for a runner @return this builder */
        public Builder queued(int v) {
            queued = v;
            return this;
        }

        /** @param v the longest a fit may run @return this builder */
        public Builder timeLimit(Duration v) {
            timeLimit = v;
            return this;
        }

        /** @param v how long finished results are kept @return this builder */
        public Builder keepFor(Duration v) {
            keepFor = v;
            return this;
        }

        /** @param v the most finished results kept @return this builder */
        public Builder keepCount(int v) {
            keepCount = v;
            return this;
        }

        /** @param v the most bytes of finished results kept @return this builder */
        public Builder keepBytes(long v) {
            keepBytes = v;
            return this;
        }

        /** @param v threads per fit @return this builder */
        public Builder threadsPerFit(int v) {
            threadsPerFit = v;
            return this;
        }

        /**
         * @return the settings
         * @throws IllegalArgumentException naming the option of a value out of range
         */
        public ServiceSettings build() {
            return new ServiceSettings(host, port, dataRoot, store, wait, maxBodyBytes, maxRows, maxKeptValues, running,
                    queued, timeLimit, keepFor, keepCount, keepBytes, threadsPerFit);
        }
    }
}
