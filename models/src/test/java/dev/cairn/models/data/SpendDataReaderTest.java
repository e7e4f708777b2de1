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
        assertEquals(Math.log(4) + Math.log(10), a.logSpendSum(), 1e-12);
        assertEquals(Math.log(4) * Math.log(4) + Math.log(10) * Math.log(10), a.logSpendSqSum(), 1e-12);
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
}
