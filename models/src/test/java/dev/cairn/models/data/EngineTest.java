package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.spec.DataSpec;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The shared engine keeps connections apart: private temporary tables, and reads on many threads at once. */
class EngineTest {
    @TempDir
    Path dir;

    @Test
    void temporaryTablesArePrivateToTheirConnection() throws SQLException {
        try (Connection a = Engine.connect(); Connection b = Engine.connect()) {
            try (Statement s = a.createStatement()) {
                s.execute("CREATE TEMP TABLE inline_rows (x INTEGER)");
            }
            try (Statement s = b.createStatement()) {
                assertThrows(SQLException.class, () -> s.executeQuery("SELECT count(*) FROM inline_rows"));
            }
            try (Statement s = b.createStatement()) {
                s.execute("CREATE TEMP TABLE inline_rows (y VARCHAR)"); // the same name again, no clash
            }
        }
    }

    @Test
    void readsOnManyThreadsAtOnceAgreeWithOneRead() throws Exception {
        StringBuilder sb = new StringBuilder("arm,spend\n");
        java.util.Random random = new java.util.Random(3);
        for (int i = 0; i < 20_000; i++) {
            sb.append(i % 2 == 0 ? "A" : "B").append(',').append(random.nextDouble() < 0.1 ? random.nextDouble() * 9 : 0)
                    .append('\n');
        }
        Files.writeString(dir.resolve("u.csv"), sb.toString());
        DataSpec spec = new DataSpec("u.csv", "users", null, null);
        List<ArmStats> expected = SpendDataReader.read(spec, dir, false).arms();
        ExecutorService pool = Executors.newFixedThreadPool(4);
        try {
            List<Future<List<ArmStats>>> reads = new ArrayList<>();
            for (int k = 0; k < 12; k++) {
                reads.add(pool.submit(() -> SpendDataReader.read(spec, dir, false).arms()));
            }
            for (Future<List<ArmStats>> f : reads) {
                assertEquals(expected, f.get());
            }
        } finally {
            pool.shutdown();
        }
    }
    /** Engines spill to a temporary folder of the process, never to the working directory. */
    @Test
    void enginesSpillOutsideTheWorkingDirectory() throws SQLException {
        for (Connection db : new Connection[] {Engine.connect(), Engine.ordered()}) {
            try (db; Statement s = db.createStatement();
                 java.sql.ResultSet r = s.executeQuery("SELECT current_setting('temp_directory')")) {
                r.next();
                Path temp = Path.of(r.getString(1));
                assertTrue(temp.isAbsolute() && temp.startsWith(Path.of(System.getProperty("java.io.tmpdir"))), temp.toString());
            }
        }
    }
}
