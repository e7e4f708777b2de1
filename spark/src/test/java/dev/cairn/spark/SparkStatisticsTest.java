package dev.cairn.spark;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.InputException;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.data.CohortDays;
import dev.cairn.models.data.SegmentedSpendData;
import dev.cairn.models.data.SpendData;
import dev.cairn.models.data.SpendDataReader;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.models.spec.SpecReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Spark in local mode ({@code local[2]}) against the embedded engine on the same data: the model's
 * statistics equal to the last bit, on 1, 3 and 17 partitions, and the same result.
 */
class SparkStatisticsTest {
    @TempDir
    static Path dir;
    static SparkSession spark;

    @BeforeAll
    static void start() throws Exception {
        spark = SparkSession.builder().master("local[2]").appName("cairn-test")
                .config("spark.ui.enabled", false).config("spark.sql.shuffle.partitions", 4)
                .config("spark.driver.host", "127.0.0.1").getOrCreate();
        StringBuilder csv = new StringBuilder("user_id,variant,country,spend\n");
        SplittableRandom rng = new SplittableRandom(5);
        String[] countries = {"DE", "FR", "BR", "JP", "US"};
        for (int i = 0; i < 30_000; i++) {
            String arm = "ABC".substring(i % 3, i % 3 + 1);
            double spend = rng.nextDouble() < 0.04 ? Math.round(Math.exp(1 + 1.3 * rng.nextGaussian()) * 100) / 100.0 : 0;
            csv.append("u").append(i).append(',').append(arm).append(',').append(countries[rng.nextInt(5)]).append(',')
                    .append(String.format(Locale.ROOT, "%.2f", spend)).append('\n');
        }
        Files.writeString(dir.resolve("users.csv"), csv);
        Dataset<Row> users = spark.read().option("header", true).csv(dir.resolve("users.csv").toString());
        for (int n : new int[] {1, 3, 17}) {
            users.repartition(n).write().parquet(dir.resolve("users-" + n + ".parquet").toString());
        }
    }

    private static long countParts(Path folder) {
        try (var files = Files.list(folder)) {
            return files.filter(f -> f.getFileName().toString().startsWith("part-")).count();
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    @AfterAll
    static void stop() {
        spark.stop();
    }

    private static DataSpec users(String path, String engine) {
        return new DataSpec(path, "users", Map.of("arm", "variant", "user", "user_id", "segment", "country"), null,
                null, null, null, engine, null);
    }

    @Test
    void usersStatisticsEqualTheEmbeddedEnginesOnAnyPartitioning() {
        SpendData embedded = SpendDataReader.read(users("users.csv", null), dir, false);
        SegmentedSpendData embeddedCells = SpendDataReader.readSegmented(users("users.csv", null), dir, false);
        for (int n : new int[] {1, 3, 17}) {
            assertEquals(n, countParts(dir.resolve("users-" + n + ".parquet")), "the data come in " + n + " files");
            SpendData onSpark = SpendDataReader.read(users("users-" + n + ".parquet", "spark"), dir, false);
            assertEquals(embedded.arms(), onSpark.arms(), n + " partitions");
            assertEquals(embedded.rows(), onSpark.rows());
            SegmentedSpendData cells = SpendDataReader.readSegmented(users("users-" + n + ".parquet", "spark"), dir, false);
            assertEquals(embeddedCells.cells(), cells.cells(), n + " partitions, segmented");
        }
        SpendData csvOnSpark = SpendDataReader.read(users("users.csv", "spark"), dir, false);
        assertEquals(embedded.arms(), csvOnSpark.arms(), "the CSV file read by Spark");
    }

    @Test
    void theSameResultFromEitherEngine() throws Exception {
        String spec = """
            {"model": "spend", "control": "A", "data": {"path": "%s", "layout": "users", %s
             "columns": {"arm": "variant", "spend": "spend"}}, "sampler": {"seed": 3}}
            """;
        var embedded = Cairn.fit(SpecReader.parse(spec.formatted("users.csv", ""), "spec.json"), dir, FitOptions.DEFAULT);
        ObjectMapper m = new ObjectMapper();
        String reference = null;
        for (int n : new int[] {1, 3, 17}) {
            var onSpark = Cairn.fit(SpecReader.parse(spec.formatted("users-" + n + ".parquet", "\"engine\": \"spark\","),
                    "spec.json"), dir, FitOptions.DEFAULT);
            ObjectNode a = (ObjectNode) m.readTree(ResultWriter.json(embedded.result()));
            ObjectNode b = (ObjectNode) m.readTree(ResultWriter.json(onSpark.result()));
            assertEquals(a.get("data").get("users"), b.get("data").get("users"));
            assertEquals(a.get("data").get("rows"), b.get("data").get("rows"));
            for (ObjectNode o : List.of(a, b)) {
                o.remove("run"); // seconds
                o.remove("data"); // the file's name (CSV here, Parquet there) and the embedded engine's SQL text
            }
            assertEquals(m.writeValueAsString(a), m.writeValueAsString(b), n + " partitions");
            String text = ResultWriter.json(onSpark.result()).replaceAll("\"seconds\" : [0-9.E-]+", "")
                    .replace("users-" + n + ".parquet", "users.parquet");
            if (reference == null) {
                reference = text;
            }
            assertEquals(reference, text, "result.json byte for byte on " + n + " partitions");
        }
    }

    @Test
    void summaryEstimatesAndActivityTables() throws Exception {
        Files.writeString(dir.resolve("summary.csv"), """
            arm,users,payers,log_spend_sum,log_spend_sq_sum
            A,5000,150,225.0,520.0
            B,5000,170,260.0,600.0
            """);
        assertEquals(SpendDataReader.read(new DataSpec("summary.csv", "summary", null, null), dir, false).arms(),
                SpendDataReader.read(new DataSpec("summary.csv", "summary", null, null, null, null, null, "spark", null), dir,
                        false).arms());
        StringBuilder activity = new StringBuilder("user,arm,installDate,activeDate\n");
        SplittableRandom rng = new SplittableRandom(2);
        java.time.LocalDate start = java.time.LocalDate.of(2026, 3, 2);
        for (int u = 0; u < 600; u++) {
            java.time.LocalDate install = start.plusDays(u % 9);
            String arm = u % 2 == 0 ? "A" : "B";
            activity.append("p").append(u).append(',').append(arm).append(',').append(install).append(',').append(install).append('\n');
            for (int t = 1; t < 12; t++) {
                if (rng.nextDouble() < 0.4 / Math.sqrt(t)) {
                    activity.append("p").append(u).append(',').append(arm).append(',').append(install).append(',')
                            .append(install.plusDays(t)).append('\n');
                }
            }
        }
        Files.writeString(dir.resolve("activity.csv"), activity);
        for (String period : new String[] {null, "week"}) {
            for (boolean survival : new boolean[] {false, true}) {
                CohortDays embedded = CohortDays.read(new DataSpec("activity.csv", "activity", null, null, null, period, null),
                        dir, survival);
                CohortDays onSpark = CohortDays.read(new DataSpec("activity.csv", "activity", null, null, null, period, null,
                        "spark", null), dir, survival);
                assertEquals(embedded.cohorts(), onSpark.cohorts());
                assertEquals(embedded.arms(), onSpark.arms());
                assertEquals(java.util.Arrays.deepToString(embedded.installs()), java.util.Arrays.deepToString(onSpark.installs()));
                assertEquals(embedded.active(), onSpark.active(), period + " survival " + survival);
            }
        }
    }

    @Test
    void theJobFitsAndWritesTheResult() throws Exception {
        Path spec = dir.resolve("job.json");
        Files.writeString(spec, """
            {"model": "spend", "control": "A", "sampler": {"seed": 2},
             "data": {"path": "users-3.parquet", "layout": "users", "engine": "spark",
                      "columns": {"arm": "variant", "spend": "spend"}}}
            """);
        assertEquals(0, CairnSparkJob.run(new String[] {spec.toString(), "--out", dir.resolve("job-out").toString()}));
        assertTrue(Files.readString(dir.resolve("job-out/result.json")).contains("\"converged\" : true"));
        assertTrue(Files.exists(dir.resolve("job-out/draws.csv")));
        Files.writeString(spec, Files.readString(spec).replace("\"engine\": \"spark\",", ""));
        assertEquals(2, CairnSparkJob.run(new String[] {spec.toString(), "--out", dir.resolve("job-out2").toString()}));
    }

    @Test
    void badRowsAreRefusedWithTheirLinesAsTheEmbeddedEngineNamesThem() throws Exception {
        String[][] tables = {
            {"summary", "arm,users,payers,log_spend_sum,log_spend_sq_sum\nA,100,5,5.0,9.0\nB,100,120,6.0,10.0\n"},
            {"cohort-days", "cohort,arm,day,installs,active\n2026-03-02,A,0,100,100\n2026-03-02,A,1,100,140\n"}};
        for (String[] t : tables) {
            Files.writeString(dir.resolve("bad-table.csv"), t[1]);
            String[] messages = new String[2];
            for (int k = 0; k < 2; k++) {
                DataSpec d = new DataSpec("bad-table.csv", t[0], null, null, null, null, null, k == 0 ? null : "spark", null);
                messages[k] = assertThrows(InputException.class, () -> {
                    if (t[0].equals("summary")) {
                        SpendDataReader.read(d, dir, false);
                    } else {
                        CohortDays.read(d, dir, false);
                    }
                }).getMessage();
            }
            assertEquals(messages[0], messages[1], t[0] + " table: the same line named by both engines");
            assertTrue(messages[0].startsWith("bad-table.csv: line 3, "), messages[0]);
        }
        Files.writeString(dir.resolve("bad.csv"), "variant,spend\nA,3.5\nB,-2\nA,1\nC,-1\n");
        for (String engine : new String[] {null, "spark"}) {
            InputException e = assertThrows(InputException.class, () -> SpendDataReader.read(
                    new DataSpec("bad.csv", "users", Map.of("arm", "variant"), null, null, null, null, engine, null), dir, false));
            assertEquals("bad.csv: lines 3, 5, column 'spend': spend must be >= 0 (0 for users who did not pay)",
                    e.getMessage(), "engine " + engine);
        }
        String[][] cases = {
            {"user,arm,installDate,activeDate\np1,A,2026-03-02,2026-03-02\np1,A,2026-03-02,2026-03-01\n",
                "bad-activity.csv: line 3, column 'activeDate': active before the install"},
            {"user,arm,installDate,activeDate\np1,A,2026-03-02,2026-03-02\np1,A,2026-3-2,2026-03-03\n",
                "bad-activity.csv: line 3, column 'installDate': not a date (YYYY-MM-DD)"},
            {"user,arm,installDate,activeDate\np1,A,2026-03-02,2026-03-02\np2,B,2026-03-02,2026-03-02\np1,B,2026-03-02,2026-03-03\n",
                "bad-activity.csv: lines 2, 4, column 'arm': user p1 appears in two arms (every row of a user must agree)"}};
        for (String[] c : cases) {
            Files.writeString(dir.resolve("bad-activity.csv"), c[0]);
            for (String engine : new String[] {null, "spark"}) {
                InputException e = assertThrows(InputException.class, () -> CohortDays.read(
                        new DataSpec("bad-activity.csv", "activity", null, null, null, null, null, engine, null), dir, false));
                assertEquals(c[1], e.getMessage(), "engine " + engine);
            }
        }
        InputException parquet = assertThrows(InputException.class, () -> SpendDataReader.read(
                new DataSpec("users-1.parquet", "users", Map.of("arm", "no_such_column"), null, null, null, null, "spark",
                        null), dir, false));
        assertTrue(parquet.getMessage().startsWith("users-1.parquet: missing column 'no_such_column' (data.columns.arm)"),
                parquet.getMessage());
        assertTrue(SpecReader.parse("""
            {"model": "spend", "data": {"table": "db.users", "layout": "users", "engine": "spark"}}
            """, "spec.json").data().table().equals("db.users"));
    }
}
