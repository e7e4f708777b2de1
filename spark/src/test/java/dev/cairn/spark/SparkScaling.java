package dev.cairn.spark;

import dev.cairn.models.data.SpendDataReader;
import dev.cairn.models.spec.DataSpec;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.Statement;
import java.util.Arrays;
import java.util.Locale;
import java.util.Map;
import org.apache.spark.sql.SparkSession;

/**
 * The statistics step on 10^6, 3 x 10^6 and 10^7 users (4 arms, Parquet written by the embedded engine): the embedded
 * engine, and Spark in local mode on 1 and on 2 cores (files split into parts of at most 8 MB, so that both
 * cores have tasks), each the median of 5 timed runs after 2 warm-up runs,
 * all in one process (compare ratios). Not part of the test suite; run with
 * {@code mvn -B -q -pl spark test-compile dependency:build-classpath -Dmdep.outputFile=/tmp/cp.txt} then
 * {@code java --add-opens=java.base/sun.nio.ch=ALL-UNNAMED ... -cp spark/target/classes:spark/target/test-classes:$(cat /tmp/cp.txt)
 * dev.cairn.spark.SparkScaling /tmp/cairn-scaling} (the README gives the whole line).
 */
public final class SparkScaling {
    private SparkScaling() {
    }

    static void write(Path file, long users) throws Exception {
        try (Connection db = DriverManager.getConnection("jdbc:duckdb:"); Statement s = db.createStatement()) {
            s.execute("SELECT setseed(0.42)");
            s.execute(("COPY (SELECT 'u' || i AS user_id, chr(65 + CAST(i %% 4 AS INTEGER)) AS store_variant, "
                    + "CASE WHEN random() < 0.03 THEN round(exp(1.5 + 1.2 * sqrt(-2 * ln(random())) * cos(2 * pi() * random())), 2) "
                    + "ELSE 0 END AS spend_d7 FROM range(%d) t(i)) TO '%s' (FORMAT parquet)").formatted(users, file));
        }
    }

    static double median(Runnable run) {
        for (int i = 0; i < 2; i++) {
            run.run();
        }
        double[] t = new double[5];
        for (int i = 0; i < t.length; i++) {
            long t0 = System.nanoTime();
            run.run();
            t[i] = (System.nanoTime() - t0) / 1e9;
        }
        Arrays.sort(t);
        return t[2];
    }

    public static void main(String[] args) throws Exception {
        Path dir = Path.of(args.length > 0 ? args[0] : "/tmp/cairn-scaling");
        Files.createDirectories(dir);
        Map<String, String> columns = Map.of("arm", "store_variant", "spend", "spend_d7");
        for (long users : new long[] {1_000_000, 3_000_000, 10_000_000}) {
            Path file = dir.resolve("users-" + users + ".parquet");
            if (!Files.exists(file)) {
                write(file, users);
            }
            DataSpec embedded = new DataSpec(file.getFileName().toString(), "users", columns, null);
            DataSpec spark = new DataSpec(file.getFileName().toString(), "users", columns, null, null, null, null, "spark", null);
            double e = median(() -> SpendDataReader.read(embedded, dir, false));
            double[] s = new double[2];
            for (int cores : new int[] {1, 2}) {
                SparkSession session = SparkSession.builder().master("local[" + cores + "]").appName("scaling")
                        .config("spark.ui.enabled", false).config("spark.sql.shuffle.partitions", 2 * cores)
                        .config("spark.sql.files.maxPartitionBytes", "8m")
                        .config("spark.driver.host", "127.0.0.1").getOrCreate();
                s[cores - 1] = median(() -> SpendDataReader.read(spark, dir, false));
                session.stop();
                SparkSession.clearActiveSession();
                SparkSession.clearDefaultSession();
            }
            System.out.printf(Locale.ROOT, "%,d users: embedded %.3f s; Spark local[1] %.2f s, local[2] %.2f s "
                    + "(1 -> 2 cores: %.2f x)%n", users, e, s[0], s[1], s[0] / s[1]);
        }
    }
}
