package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class SpendDataReaderTest {
    @TempDir
    Path dir;

    static final String USERS = """
            uid,variant,spend
            1,A,0
            2,A,4.0
            3,B,0
            4,B,2.5
            5,A,10.0
            6,B,0
            7, B ,1.0
            """;

    @Test
    void sufficientStatisticsByHand() throws IOException {
        Files.writeString(dir.resolve("u.csv"), USERS);
        SpendData d = SpendDataReader.read(new DataSpec("u.csv", "users", Map.of("arm", "variant"), null), dir, false);
        assertEquals(List.of("A", "B"), d.armNames(), "arm values are trimmed");
        ArmStats a = d.arm("A");
        assertEquals(3, a.users());
        assertEquals(2, a.payers());
        // log spend is summed in whole quanta of 2^-32 (ExactSums): each term is within 1.2e-10 of its log
        assertEquals(Math.log(4) + Math.log(10), a.logSpendSum(), 3e-10);
        assertEquals(Math.log(4) * Math.log(4) + Math.log(10) * Math.log(10), a.logSpendSqSum(), 2e-9);
        assertEquals(14.0 / 3, a.spendSum() / a.users(), 1e-12);
        assertEquals(10.0, a.spendMax(), 0);
        ArmStats b = d.arm("B");
        assertEquals(4, b.users());
        assertEquals(2, b.payers());
        assertTrue(d.hasSpend());
        assertTrue(d.query().contains("GROUP BY arm"));
    }

    @Test
    void parquetAndInlineRowsGiveTheSameStatisticsAsCsv() throws IOException, SQLException {
        Path csv = dir.resolve("u.csv");
        Files.writeString(csv, USERS);
        Path parquet = dir.resolve("u.parquet");
        try (Connection db = DriverManager.getConnection("jdbc:duckdb:"); Statement s = db.createStatement()) {
            s.execute("COPY (SELECT * FROM read_csv('" + csv + "', header = true)) TO '" + parquet + "' (FORMAT PARQUET)");
        }
        Map<String, String> columns = Map.of("arm", "variant");
        SpendData fromCsv = SpendDataReader.read(new DataSpec("u.csv", "users", columns, null), dir, false);
        SpendData fromParquet = SpendDataReader.read(new DataSpec("u.parquet", "users", columns, null), dir, false);
        List<JsonNode> rows = new ArrayList<>();
        ObjectMapper m = new ObjectMapper();
        USERS.lines().skip(1).forEach(l -> {
            String[] c = l.split(",");
            rows.add(m.createObjectNode().put("variant", c[1]).put("spend", Double.parseDouble(c[2])));
        });
        SpendData inline = SpendDataReader.read(new DataSpec(null, "users", columns, rows), dir, false);
        assertEquals(fromCsv.arms(), fromParquet.arms());
        assertEquals(fromCsv.arms(), inline.arms());
    }

    @Test
    void duplicateUserIdsWarnOrFailUnderStrict() throws IOException {
        Files.writeString(dir.resolve("u.csv"), "uid,arm,spend\n1,A,0\n1,B,2\n2,A,0\n2,B,1\n3,A,0\n");
        DataSpec spec = new DataSpec("u.csv", "users", Map.of("user", "uid"), null);
        SpendData d = SpendDataReader.read(spec, dir, false);
        assertEquals(1, d.warnings().size());
        assertTrue(d.warnings().get(0).contains("2 duplicate user ids"), d.warnings().get(0));
        InputException e = assertThrows(InputException.class, () -> SpendDataReader.read(spec, dir, true));
        assertTrue(e.getMessage().contains("strict"));
    }

    @Test
    void conversionColumnGivesTheBetaBinomialCase() throws IOException {
        Files.writeString(dir.resolve("c.csv"), "arm,converted\nA,1\nA,0\nB,true\nB,false\nB,1\n");
        SpendData d = SpendDataReader.read(new DataSpec("c.csv", "users", null, null), dir, false);
        assertFalse(d.hasSpend());
        assertEquals(1, d.arm("A").payers());
        assertEquals(2, d.arm("B").payers());
        assertEquals(3, d.arm("B").users());
    }

    @Test
    void badRowsAreCountedAndTheFirstOnesNamed() throws IOException {
        StringBuilder sb = new StringBuilder("arm,spend\n");
        for (int i = 0; i < 10; i++) {
            sb.append(i % 2 == 0 ? "A" : "B").append(',').append(i >= 5 ? "-1" : "1").append('\n');
        }
        Files.writeString(dir.resolve("n.csv"), sb.toString());
        InputException e = assertThrows(InputException.class,
                () -> SpendDataReader.read(new DataSpec("n.csv", "users", null, null), dir, false));
        assertTrue(e.getMessage().startsWith("n.csv: lines 7, 8, 9 and 2 more, column 'spend': spend must be >= 0"),
                e.getMessage());
    }
    /** Payer quantiles are the k-th smallest payer spend, k = floor(q (m - 1)) + 1, checked against a sort. */
    @Test
    void payerQuantilesAreTheOrderStatisticsTheChecksReplicate() throws IOException {
        java.util.Random random = new java.util.Random(11);
        StringBuilder sb = new StringBuilder("arm,spend\n");
        List<Double> payersA = new ArrayList<>();
        for (int i = 0; i < 5_000; i++) {
            boolean payer = random.nextDouble() < 0.2;
            // cents, so that amounts repeat as real prices do
            double spend = payer ? Math.round(Math.exp(1 + random.nextGaussian()) * 100) / 100.0 + 0.01 : 0;
            String arm = i % 2 == 0 ? "A" : "B";
            sb.append(arm).append(',').append(spend).append('\n');
            if (payer && arm.equals("A")) {
                payersA.add(spend);
            }
        }
        Files.writeString(dir.resolve("q.csv"), sb.toString());
        ArmStats a = SpendDataReader.read(new DataSpec("q.csv", "users", null, null), dir, false).arm("A");
        double[] sorted = payersA.stream().mapToDouble(Double::doubleValue).sorted().toArray();
        int m = sorted.length;
        assertEquals(m, a.payers());
        assertEquals(sorted[(int) Math.floor(0.5 * (m - 1))], a.payerP50(), 0);
        assertEquals(sorted[(int) Math.floor(0.9 * (m - 1))], a.payerP90(), 0);
        assertEquals(sorted[(int) Math.floor(0.99 * (m - 1))], a.payerP99(), 0);
        assertEquals(sorted[m - 1], a.spendMax(), 0);
        double s1 = 0;
        for (double y : sorted) {
            s1 += Math.log(y);
        }
        assertEquals(s1, a.logSpendSum(), 1e-9 * Math.abs(s1));
    }

    /**
     * A file the engine reads on several threads (many Parquet row groups) gives bit-identical statistics on
     * every read: parallel floating-point sums would differ in their last bits from run to run.
     */
    @Test
    void statisticsOfAParallelReadAreBitIdentical() throws IOException, SQLException {
        java.util.Random random = new java.util.Random(5);
        StringBuilder sb = new StringBuilder("arm,spend\n");
        for (int i = 0; i < 200_000; i++) {
            double spend = random.nextDouble() < 0.3 ? Math.exp(random.nextGaussian()) : 0;
            sb.append((char) ('A' + i % 3)).append(',').append(spend).append('\n');
        }
        Path csv = dir.resolve("p.csv");
        Files.writeString(csv, sb.toString());
        Path parquet = dir.resolve("p.parquet");
        try (Connection db = DriverManager.getConnection("jdbc:duckdb:"); Statement s = db.createStatement()) {
            s.execute("COPY (SELECT * FROM read_csv('" + csv + "', header = true)) TO '" + parquet
                    + "' (FORMAT PARQUET, ROW_GROUP_SIZE 2048)");
        }
        DataSpec spec = new DataSpec("p.parquet", "users", null, null);
        List<ArmStats> first = SpendDataReader.read(spec, dir, false).arms();
        for (int run = 0; run < 8; run++) {
            assertEquals(first, SpendDataReader.read(spec, dir, false).arms(), "read " + run);
        }
    }
    /**
     * What the bit-identical statistics rest on: the engine adds a floating-point sum in the order its
     * ORDER BY asks (1e16 plus a thousand ones is 1e16 + 1000 from the smallest up, 1e16 from the largest).
     */
    @Test
    void theEngineSumsInTheOrderAsked() throws SQLException {
        try (Connection db = Engine.open(false); Statement s = db.createStatement()) {
            s.execute("CREATE TEMP TABLE t AS SELECT 1.0::DOUBLE AS x FROM range(1000) UNION ALL SELECT 1e16::DOUBLE");
            try (java.sql.ResultSet r = s.executeQuery("SELECT sum(x ORDER BY x), sum(x ORDER BY x DESC) FROM t")) {
                r.next();
                assertEquals(1e16 + 1000, r.getDouble(1), 0);
                assertEquals(1e16, r.getDouble(2), 0);
            }
        }
    }
    /** An arm where nobody pays and one where everybody pays: counts, sums, extremes and quantiles hold. */
    @Test
    void armsWithoutPayersAndWithoutZerosAreRead() throws IOException {
        Files.writeString(dir.resolve("e.csv"), "arm,spend\nA,0\nA,0\nB,3\nB,1\nB,2\n");
        SpendData d = SpendDataReader.read(new DataSpec("e.csv", "users", null, null), dir, false);
        ArmStats a = d.arm("A");
        assertEquals(2, a.users());
        assertEquals(0, a.payers());
        assertEquals(0, a.logSpendSum(), 0);
        assertEquals(0, a.spendMax(), 0);
        assertTrue(Double.isNaN(a.payerP50()));
        ArmStats b = d.arm("B");
        assertEquals(3, b.payers());
        assertEquals(3, b.spendMax(), 0);
        assertEquals(6, b.spendSum(), 0);
        assertEquals(2, b.payerP50(), 0, "k = floor(0.5 * 2) + 1 = 2nd of 1, 2, 3");
        assertEquals(2, b.payerP90(), 0, "k = floor(0.9 * 2) + 1 = 2nd");
        assertEquals(Math.log(6), b.logSpendSum(), 1.2e-10, "one quantum of 2^-32 at most (ExactSums)");
    }

    /** With data.missingSpend "zero" a blank spend is a non-payer: the same statistics as writing 0, and said. */
    @Test
    void blankSpendReadAsZeroWhenAskedAndSaid() throws IOException {
        Files.writeString(dir.resolve("blank.csv"), "arm,spend\nA,\nA,4\nB,\nB,\nB,2\n");
        Files.writeString(dir.resolve("zero.csv"), "arm,spend\nA,0\nA,4\nB,0\nB,0\nB,2\n");
        InputException refused = assertThrows(InputException.class,
                () -> SpendDataReader.read(new DataSpec("blank.csv", "users", null, null), dir, false));
        assertTrue(refused.getMessage().contains("lines 2, 4, 5, column 'spend': spend is empty (if a blank "
                + "means the user did not pay, set data.missingSpend to \"zero\")"), refused.getMessage());
        SpendData blank = SpendDataReader.read(new DataSpec("blank.csv", "users", null, null, "zero"), dir, false);
        SpendData zero = SpendDataReader.read(new DataSpec("zero.csv", "users", null, null), dir, false);
        assertEquals(zero.arms(), blank.arms());
        assertEquals(List.of("blank.csv, column 'spend': 3 blank spend cells read as 0 (data.missingSpend is \"zero\")"),
                blank.warnings());
        assertEquals(List.of(), zero.warnings());
    }

    /** A fit without spend says what it leaves out, for both layouts. */
    @Test
    void conversionOnlyDataAreSaidToBeSo() throws IOException {
        Files.writeString(dir.resolve("c.csv"), "arm,converted\nA,1\nA,0\nB,0\n");
        Files.writeString(dir.resolve("s.csv"), "arm,users,payers\nA,10,2\nB,10,3\n");
        String users = SpendDataReader.read(new DataSpec("c.csv", "users", null, null), dir, false).warnings().get(0);
        String summary = SpendDataReader.read(new DataSpec("s.csv", "summary", null, null), dir, false).warnings().get(0);
        assertEquals("c.csv has no spend column ('spend'): a conversion-only fit — payer rate alone; ARPU and ARPPU "
                + "are not estimated", users);
        assertTrue(summary.startsWith("s.csv has no log-spend sums ('log_spend_sum', 'log_spend_sq_sum'): a "
                + "conversion-only fit"), summary);
    }

    /** A misnamed statistics column is refused, naming the expected column it most likely is. */
    @Test
    void summaryColumnsTheLayoutDoesNotReadAreRefusedWithTheNearestName() throws IOException {
        Files.writeString(dir.resolve("s.csv"), "arm,users,payers,revenue_sum,log_spend_sq_sum\nA,10,2,1,1\nB,10,3,1,1\n");
        InputException e = assertThrows(InputException.class,
                () -> SpendDataReader.read(new DataSpec("s.csv", "summary", null, null), dir, false));
        assertEquals("s.csv: column 'revenue_sum' is not one the summary layout reads (did you mean 'log_spend_sum'?); "
                + "expected arm, users, payers, log_spend_sum, log_spend_sq_sum (rename the column, map it in "
                + "data.columns, or remove it)", e.getMessage());
    }

    /** Summary mapping keys may be written as the README's column names or as the logical names. */
    @Test
    void summaryMappingKeysAcceptTheColumnNames() throws IOException {
        Files.writeString(dir.resolve("s.csv"), "arm,users,payers,s1,s2\nA,10,2,1.5,2.5\nB,10,3,2,3\n");
        SpendData snake = SpendDataReader.read(new DataSpec("s.csv", "summary",
                Map.of("log_spend_sum", "s1", "log_spend_sq_sum", "s2"), null), dir, false);
        SpendData camel = SpendDataReader.read(new DataSpec("s.csv", "summary",
                Map.of("logSpendSum", "s1", "logSpendSqSum", "s2"), null), dir, false);
        assertTrue(snake.hasSpend());
        assertEquals(camel.arms(), snake.arms());
        assertEquals(1.5, snake.arm("A").logSpendSum(), 0);
    }

    /** The header is RFC 4180 CSV: a quoted name may hold a comma or a quote. */
    @Test
    void quotedHeaderNamesAreReadWhole() throws IOException {
        Files.writeString(dir.resolve("q.csv"), "\"store, variant\",\"spend \"\"d7\"\"\"\nA,0\nA,2\nB,3\n");
        SpendData d = SpendDataReader.read(new DataSpec("q.csv", "users",
                Map.of("arm", "store, variant", "spend", "spend \"d7\""), null), dir, false);
        assertEquals(List.of("A", "B"), d.armNames());
        assertEquals(1, d.arm("A").payers());
    }
}
