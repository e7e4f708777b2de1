package dev.cairn.bench;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.data.ArmStats;
import dev.cairn.models.data.SpendData;
import dev.cairn.models.spend.SpendPosterior;
import dev.cairn.models.spend.SpendPriors;
import dev.cairn.samplers.Cancellation;
import dev.cairn.samplers.Progress;
import dev.cairn.samplers.RandomStreams;
import dev.cairn.samplers.RunSettings;
import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Spend-model scaling, compared as ratios within one run (machines are noisy):
 * <ol>
 *   <li>10 million users in 4 arms as CSV: {@code fit} wall time against the bare aggregation query an
 *       analyst would run for ARPU on the same file (users, payers and revenue per arm) in an open session,
 *       best of 9 interleaved rounds each after 5 warm-up rounds; the plainest query (count and sum per arm) is shown too;</li>
 *   <li>the same data as Parquet: fit time CSV / Parquet;</li>
 *   <li>peak resident memory of {@code cairn fit} on the CSV in a child process (needs /usr/bin/time);</li>
 *   <li>sampling time (slice, 4 chains x 2,000 iterations) for 10^4 .. 10^7 users: it sees only
 *       sufficient statistics, so it should not grow.</li>
 * </ol>
 * Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.SpendScaling [DIR]} (DIR keeps the data).
 */
public final class SpendScaling {
    private static final int USERS = 10_000_000;
    private static final String[] ARMS = {"A", "B", "C", "D"};
    /** Rounds of the interleaved measures; the best of each is kept. */
    private static final int ROUNDS = 9;
    /** Rounds run first and not counted, so that the JIT has compiled the fit's code (steady state, as JMH). */
    private static final int WARMUP_ROUNDS = 5;
    private static final String[] COUNTRIES = {"DE", "US", "BR", "JP", "FR", "IN", "KR"};

    private SpendScaling() {
    }

    public static void main(String[] args) throws Exception {
        Path dir = Path.of(args.length > 0 ? args[0] : "bench-data");
        Files.createDirectories(dir);
        Path csv = dir.resolve("users-10m.csv");
        Path parquet = dir.resolve("users-10m.parquet");
        if (!Files.exists(csv)) {
            generate(csv);
        }
        if (!Files.exists(parquet)) {
            try (Connection db = DriverManager.getConnection("jdbc:duckdb:"); Statement s = db.createStatement()) {
                s.execute("COPY (SELECT * FROM read_csv('" + csv + "', header = true)) TO '" + parquet + "' (FORMAT PARQUET)");
            }
        }
        System.out.printf(Locale.ROOT, "data: %s (%.0f MB), %s (%.0f MB)%n", csv, Files.size(csv) / 1e6, parquet,
                Files.size(parquet) / 1e6);
        Path csvSpec = spec(dir, "spec-csv.json", csv.getFileName().toString());
        Path parquetSpec = spec(dir, "spec-parquet.json", parquet.getFileName().toString());

        dev.cairn.models.spec.Spec csvS = dev.cairn.models.spec.SpecReader.read(csvSpec);
        dev.cairn.models.spec.Spec parquetS = dev.cairn.models.spec.SpecReader.read(parquetSpec);
        // The measures take turns, round after round, so that a slow spell of the machine falls on all of
        // them alike; each keeps its best round.
        String[] names = {"plain", "bare", "bareParquet", "fitCsv", "fitParquet", "readCsv", "readParquet"};
        Work[] work = {
            () -> query(csv, "count(*), sum(spend_d7)"),
            () -> query(csv, "count(*), count_if(spend_d7 > 0), sum(spend_d7)"),
            () -> query(parquet, "count(*), count_if(spend_d7 > 0), sum(spend_d7)"),
            () -> Cairn.fit(csvSpec, FitOptions.DEFAULT),
            () -> Cairn.fit(parquetSpec, FitOptions.DEFAULT),
            () -> dev.cairn.models.data.SpendDataReader.read(csvS.data(), dir, false),
            () -> dev.cairn.models.data.SpendDataReader.read(parquetS.data(), dir, false),
        };
        double[] best = new double[work.length];
        java.util.Arrays.fill(best, Double.MAX_VALUE);
        for (int round = -WARMUP_ROUNDS; round < ROUNDS; round++) {
            for (int k = 0; k < work.length; k++) {
                long t0 = System.nanoTime();
                work[k].run();
                if (round >= 0) {
                    best[k] = Math.min(best[k], (System.nanoTime() - t0) / 1e9);
                }
            }
        }
        java.util.Map<String, Double> times = new java.util.HashMap<>();
        for (int k = 0; k < names.length; k++) {
            times.put(names[k], best[k]);
        }
        double bare = times.get("bare");
        double fitCsv = times.get("fitCsv");
        double fitParquet = times.get("fitParquet");
        System.out.printf(Locale.ROOT, "plainest query on CSV (count, sum): %.2f s%n", times.get("plain"));
        System.out.printf(Locale.ROOT, "bare aggregation query on CSV (users, payers, revenue): %.2f s; on Parquet %.3f s%n",
                bare, times.get("bareParquet"));
        System.out.printf(Locale.ROOT, "fit on CSV:     %.3f s   ratio to bare query %.2f (target <= 1.3)%n", fitCsv, fitCsv / bare);
        System.out.printf(Locale.ROOT, "fit on Parquet: %.3f s   CSV / Parquet %.2f x (target >= 5)%n", fitParquet, fitCsv / fitParquet);
        System.out.printf(Locale.ROOT, "statistics (validation + sufficient statistics) alone: CSV %.3f s, Parquet %.3f s: %.2f x%n",
                times.get("readCsv"), times.get("readParquet"), times.get("readCsv") / times.get("readParquet"));
        peakMemory(csvSpec, dir);

        SpendPriors priors = new SpendPriors(SpendPriors.DEFAULT_PAYER_RATE, null,
                new dev.cairn.models.prior.Normal(0, 10), new dev.cairn.models.prior.HalfNormal(3), "default", null);
        double first = 0;
        for (long n = 10_000; n <= 10_000_000; n *= 10) {
            SpendData data = syntheticStats(n);
            double t = best(() -> SpendPosterior.mcmc(data, priors, true, RunSettings.of(4, 1000, 1000, 1),
                    Progress.NONE, new Cancellation()));
            first = first == 0 ? t : first;
            System.out.printf(Locale.ROOT, "sampling, %,d users: %.3f s   ratio to 10^4 users %.2f%n", n, t, t / first);
        }
    }

    private interface Work {
        void run() throws Exception;
    }

    private static double best(Work w) throws Exception {
        double best = Double.MAX_VALUE;
        for (int i = 0; i < 5; i++) {
            long t0 = System.nanoTime();
            w.run();
            best = Math.min(best, (System.nanoTime() - t0) / 1e9);
        }
        return best;
    }

    /** The analyst's session: one engine kept open, as {@code fit} keeps its own (see Engine). */
    private static Connection session;

    private static void query(Path file, String aggregates) throws SQLException {
        String relation = file.toString().endsWith(".csv") ? "read_csv('" + file + "', header = true)"
                : "read_parquet('" + file + "')";
        if (session == null) {
            session = DriverManager.getConnection("jdbc:duckdb:");
        }
        try (Statement s = session.createStatement();
             ResultSet r = s.executeQuery("SELECT store_variant, " + aggregates + " FROM " + relation
                     + " GROUP BY store_variant")) {
            while (r.next()) {
                r.getLong(2);
            }
        }
    }

    private static Path spec(Path dir, String name, String data) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, """
                {"model": "spend", "data": {"path": "%s", "layout": "users",
                 "columns": {"arm": "store_variant", "spend": "spend_d7"}}, "control": "A"}
                """.formatted(data));
        return p;
    }

    private static void peakMemory(Path spec, Path dir) throws Exception {
        Path time = Path.of("/usr/bin/time");
        Path jar = Path.of("cli", "target", "cairn-all.jar");
        if (!Files.isExecutable(time) || !Files.exists(jar)) {
            System.out.println("peak memory: skipped (needs /usr/bin/time and cli/target/cairn-all.jar)");
            return;
        }
        List<String> cmd = new ArrayList<>(List.of(time.toString(), "-f", "%M", "java"));
        String opts = System.getenv("CAIRN_JAVA_OPTS");
        if (opts != null && !opts.isBlank()) {
            cmd.addAll(List.of(opts.trim().split("\\s+")));
        } else {
            cmd.addAll(LauncherOptions.DEFAULT);
        }
        cmd.addAll(List.of("-jar", jar.toString(), "fit", spec.toString(), "--out", dir.resolve("out").toString(), "--quiet"));
        Process p = new ProcessBuilder(cmd).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        String err = new String(p.getErrorStream().readAllBytes(), StandardCharsets.UTF_8).strip();
        p.waitFor();
        String last = err.lines().reduce((a, b) -> b).orElse("?");
        System.out.printf(Locale.ROOT, "peak resident memory of cairn fit on the CSV: %s MB (target <= 512)%n",
                String.format(Locale.ROOT, "%.0f", Double.parseDouble(last) / 1024));
    }

    /** The JVM options the ./cairn launcher uses. */
    static final class LauncherOptions {
        static final List<String> DEFAULT = List.of("-Xmx512m", "-XX:+UseSerialGC");
    }

    /** Sufficient statistics of n users per arm as the data would give them: 3% payers, log spend N(1.6, 1.1). */
    private static SpendData syntheticStats(long n) {
        List<ArmStats> arms = new ArrayList<>();
        for (String a : ARMS) {
            long m = Math.round(0.03 * n);
            double s1 = m * 1.6;
            double s2 = m * (1.6 * 1.6 + 1.21);
            arms.add(ArmStats.summary(a, n, m, s1, s2));
        }
        return new SpendData(arms, true, "synthetic", 4 * n, List.of(), "");
    }

    private static void generate(Path csv) throws IOException {
        UniformRandomProvider rng = RandomStreams.forChain(20261202L, 1);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        try (BufferedWriter w = Files.newBufferedWriter(csv, StandardCharsets.UTF_8)) {
            w.write("user_id,store_variant,country,spend_d7\n");
            StringBuilder sb = new StringBuilder(64);
            for (int i = 0; i < USERS; i++) {
                sb.setLength(0);
                sb.append(100_000_000 + i).append(',').append(ARMS[i % 4]).append(',').append(COUNTRIES[i % 7]).append(',');
                if (rng.nextDouble() < 0.03) {
                    sb.append(String.format(Locale.ROOT, "%.2f", Math.max(0.01, Math.exp(1.6 + 1.1 * g.sample()))));
                } else {
                    sb.append('0');
                }
                sb.append('\n');
                w.write(sb.toString());
            }
        }
    }
}
