package dev.cairn.bench;

import dev.cairn.cli.serve.Service;
import dev.cairn.cli.serve.ServiceSettings;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;

/**
 * A load on {@code cairn serve} over loopback: {@code n} requests sent at once (summary spend fits of 2-4
 * arms, one in ten a bad spec), every answer checked to be well-formed JSON with status 200, 202, 400 or
 * 429. Refused fits (429) are sent again after their Retry-After, 202s are polled, until every good spec
 * has its result (bounded in time). Reports the first answers' statuses and latency, the time to each
 * result, the fits per second, and the server's heap after a collection.
 * Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.ServiceLoad [n]}
 */
public final class ServiceLoad {
    static {
        // The client lets an idle connection go after 10 s, before the server's 30 s idle timeout closes it:
        // otherwise a request sent just as the server closes a pooled connection is lost in between (a race
        // of every HTTP/1.1 keep-alive client, not of the service).
        if (System.getProperty("jdk.httpclient.keepalive.timeout") == null) {
            System.setProperty("jdk.httpclient.keepalive.timeout", "10");
        }
    }

    private ServiceLoad() {
    }

    /** One request of the load: its spec and whether it is meant to be refused. */
    record Job(String spec, boolean bad) {
    }

    /** What a load run saw. */
    public record Report(int requests, Map<Integer, Integer> firstStatuses, double[] firstSeconds, double[] resultSeconds,
                         double wallSeconds, int fitted, int refusedAsBad, List<String> problems) {
        /** {@return the first answers' median latency in seconds} */
        public double firstP50() {
            return quantile(firstSeconds, 0.50);
        }

        /** {@return the first answers' 99th-percentile latency in seconds} */
        public double firstP99() {
            return quantile(firstSeconds, 0.99);
        }

        /** {@return the median time from sending to holding the result} */
        public double resultP50() {
            return quantile(resultSeconds, 0.50);
        }

        /** {@return the 99th-percentile time from sending to holding the result} */
        public double resultP99() {
            return quantile(resultSeconds, 0.99);
        }

        /** {@return results per second of the whole run} */
        public double fitsPerSecond() {
            return fitted / wallSeconds;
        }

        @Override
        public String toString() {
            return String.format(Locale.ROOT, "%,d requests at once: first answers %s; first answer p50 %.3f s, p99 %.3f s;"
                    + " result p50 %.2f s, p99 %.2f s; %d fitted, %d bad specs refused, %.1f fits/s over %.1f s%s",
                    requests, firstStatuses, firstP50(), firstP99(), resultP50(), resultP99(), fitted, refusedAsBad,
                    fitsPerSecond(), wallSeconds, problems.isEmpty() ? "" : "; PROBLEMS: " + problems);
        }
    }

    static double quantile(double[] values, double q) {
        if (values.length == 0) {
            return Double.NaN;
        }
        double[] v = values.clone();
        Arrays.sort(v);
        return v[Math.max(0, (int) Math.ceil(q * v.length) - 1)];
    }

    /**
     * The load's requests, the same for a seed: good summary specs (conversion only, or with log-spend sums)
     * and, one in ten, a spec with a mistake a caller makes.
     *
     * @param n    requests
     * @param seed the generator's seed
     * @return the specs
     */
    static List<Job> jobs(int n, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        String[] bad = {
            "{\"model\": \"spend\"}",
            "{\"model\": \"spend\", \"data\": {\"layout\": \"summary\", \"rows\": [{\"arm\": \"A\", \"users\": -5, \"payers\": 0}]}}",
            "{\"model\": \"spend\", \"data\": {\"layout\": \"summary\", \"rows\": [{\"arm\": \"A\", \"users\": 10, \"payers\": 11}]}}",
            "{\"model\": \"spnd\", \"data\": {\"layout\": \"summary\", \"rows\": []}}",
            "{\"model\": \"spend\", \"data\": ",
        };
        List<Job> jobs = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            if (i % 10 == 9) {
                jobs.add(new Job(bad[rng.nextInt(bad.length)], true));
                continue;
            }
            int arms = 2 + rng.nextInt(3);
            boolean revenue = rng.nextBoolean();
            StringBuilder rows = new StringBuilder();
            for (int a = 0; a < arms; a++) {
                int users = 1_000 + rng.nextInt(49_000);
                int payers = Math.max(2, (int) Math.round(users * (0.02 + 0.03 * rng.nextDouble())));
                rows.append(a == 0 ? "" : ", ").append(String.format(Locale.ROOT,
                        "{\"arm\": \"%c\", \"users\": %d, \"payers\": %d", (char) ('A' + a), users, payers));
                if (revenue) {
                    double mean = 1.2 + 0.4 * rng.nextDouble();
                    double sd = 0.8 + 0.4 * rng.nextDouble();
                    rows.append(String.format(Locale.ROOT, ", \"log_spend_sum\": %.4f, \"log_spend_sq_sum\": %.4f",
                            payers * mean, payers * (mean * mean + sd * sd)));
                }
                rows.append('}');
            }
            jobs.add(new Job(String.format(Locale.ROOT, "{\"model\": \"spend\", \"currency\": \"EUR\", \"sampler\": "
                    + "{\"seed\": %d}, \"data\": {\"layout\": \"summary\", \"rows\": [%s]}}", i, rows), false));
        }
        return jobs;
    }

    /**
     * Sends {@code n} requests at once and follows each to its end.
     *
     * @param base  the service's address
     * @param n     requests
     * @param bound the longest the whole run may take
     * @return what was seen
     */
    public static Report run(URI base, int n, Duration bound) {
        HttpClient client = HttpClient.newBuilder().version(HttpClient.Version.HTTP_1_1)
                .connectTimeout(Duration.ofSeconds(30)).build();
        List<Job> jobs = jobs(n, 20261202L);
        List<String> problems = java.util.Collections.synchronizedList(new ArrayList<>());
        Map<Integer, Integer> first = new TreeMap<>();
        double[] firstSeconds = new double[n];
        double[] resultSeconds = new double[n];
        int[] ends = new int[n]; // 1 fitted, 2 refused as bad
        long deadline = System.nanoTime() + bound.toNanos();
        long t0 = System.nanoTime();
        List<CompletableFuture<Void>> all = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            int k = i;
            long sent = System.nanoTime();
            all.add(post(client, base, jobs.get(k).spec()).thenCompose(r -> {
                firstSeconds[k] = (System.nanoTime() - sent) / 1e9;
                synchronized (first) {
                    first.merge(r.statusCode(), 1, Integer::sum);
                }
                return follow(client, base, jobs.get(k), r, deadline, problems, k);
            }).thenAccept(end -> {
                resultSeconds[k] = (System.nanoTime() - sent) / 1e9;
                ends[k] = end;
            }).exceptionally(e -> {
                problems.add("request " + k + ": " + e);
                return null;
            }));
        }
        try {
            CompletableFuture.allOf(all.toArray(CompletableFuture[]::new))
                    .get(Math.max(1, deadline - System.nanoTime()), TimeUnit.NANOSECONDS);
        } catch (Exception e) {
            problems.add("not every request finished within " + bound.toSeconds() + " s: " + e);
        }
        double wall = (System.nanoTime() - t0) / 1e9;
        int fitted = 0;
        int refused = 0;
        List<Double> toResult = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            if (ends[i] == 1) {
                fitted++;
                toResult.add(resultSeconds[i]);
            } else if (ends[i] == 2) {
                refused++;
            } else {
                problems.add("request " + i + " has no final answer");
            }
        }
        return new Report(n, first, firstSeconds, toResult.stream().mapToDouble(Double::doubleValue).toArray(), wall,
                fitted, refused, new ArrayList<>(problems));
    }

    private static CompletableFuture<HttpResponse<String>> post(HttpClient client, URI base, String spec) {
        HttpRequest r = HttpRequest.newBuilder(base.resolve("/v1/fits")).timeout(Duration.ofSeconds(120))
                .header("Content-Type", "application/json").POST(HttpRequest.BodyPublishers.ofString(spec)).build();
        return client.sendAsync(r, HttpResponse.BodyHandlers.ofString());
    }

    /** Follows an answer to its end: 1 when the good spec has its result, 2 when the bad one is refused. */
    private static CompletableFuture<Integer> follow(HttpClient client, URI base, Job job, HttpResponse<String> r,
                                                     long deadline, List<String> problems, int k) {
        int status = r.statusCode();
        boolean json = r.headers().firstValue("content-type").orElse("").startsWith("application/json")
                && (r.body().startsWith("{") && r.body().strip().endsWith("}"));
        if (!json) {
            problems.add("request " + k + ": not a JSON answer: " + status + " " + r.body());
            return CompletableFuture.completedFuture(0);
        }
        if (System.nanoTime() > deadline) {
            problems.add("request " + k + ": out of time at status " + status);
            return CompletableFuture.completedFuture(0);
        }
        switch (status) {
            case 200 -> {
                boolean ok = !job.bad() && r.body().contains("\"converged\"");
                if (!ok) {
                    problems.add("request " + k + ": 200 for a bad spec or without a result");
                }
                return CompletableFuture.completedFuture(ok ? 1 : 0);
            }
            case 400 -> {
                boolean ok = job.bad() && r.body().contains("\"message\"");
                if (!ok) {
                    problems.add("request " + k + ": 400 for a good spec: " + r.body());
                }
                return CompletableFuture.completedFuture(ok ? 2 : 0);
            }
            case 202 -> {
                String location = r.headers().firstValue("location").orElse(null);
                return later(200).thenCompose(x -> client.sendAsync(HttpRequest.newBuilder(base.resolve(location)).GET()
                        .timeout(Duration.ofSeconds(120)).build(), HttpResponse.BodyHandlers.ofString()))
                        .thenCompose(next -> follow(client, base, job, next, deadline, problems, k));
            }
            case 429 -> {
                long after = Long.parseLong(r.headers().firstValue("retry-after").orElse("1"));
                return later(after * 1000).thenCompose(x -> post(client, base, job.spec()))
                        .thenCompose(next -> follow(client, base, job, next, deadline, problems, k));
            }
            default -> {
                problems.add("request " + k + ": unexpected status " + status + " " + r.body());
                return CompletableFuture.completedFuture(0);
            }
        }
    }

    private static CompletableFuture<Void> later(long millis) {
        return CompletableFuture.runAsync(() -> { }, CompletableFuture.delayedExecutor(millis, TimeUnit.MILLISECONDS));
    }

    /** {@return the heap in use after a full collection, in MB} */
    public static double heapMegabytes() {
        for (int i = 0; i < 3; i++) {
            System.gc();
        }
        Runtime rt = Runtime.getRuntime();
        return (rt.totalMemory() - rt.freeMemory()) / 1e6;
    }

    public static void main(String[] args) throws Exception {
        int n = args.length > 0 ? Integer.parseInt(args[0]) : 1000;
        try (Service service = Service.start(ServiceSettings.DEFAULT.toBuilder().port(0).build())) {
            double before = heapMegabytes();
            Report warm = run(service.address(), 100, Duration.ofMinutes(5)); // the JIT's warm-up
            System.out.println("warm-up: " + warm);
            Report r = run(service.address(), n, Duration.ofMinutes(10));
            System.out.println(r);
            System.out.printf(Locale.ROOT, "heap after a collection (server and client in one process): %.0f MB before, "
                    + "%.0f MB after%n", before, heapMegabytes());
            if (args.length > 1) { // seconds to stay up, e.g. for a heap histogram
                Thread.sleep(Long.parseLong(args[1]) * 1000);
            }
        }
    }
}
