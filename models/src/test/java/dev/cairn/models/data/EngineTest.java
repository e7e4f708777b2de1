package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.InputException;
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

/** Engines are private to their read, may open only the files the spec names, and agree across threads. */
class EngineTest {
    @TempDir
    Path dir;

    @Test
    void temporaryTablesArePrivateToTheirConnection() throws SQLException {
        try (Connection a = Engine.open(false); Connection b = Engine.open(false)) {
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

    /** An engine reads the files it was opened with and nothing else: no other file, no listing, no writing. */
    @Test
    void anEngineReadsOnlyTheFilesTheSpecNames() throws Exception {
        Files.writeString(dir.resolve("named.csv"), "a\n1\n");
        Files.writeString(dir.resolve("other.csv"), "a\n2\n");
        DataFile named = DataFile.of("named.csv", dir, "data.path");
        try (Connection db = Engine.open(false, named)) {
            try (Statement s = db.createStatement(); java.sql.ResultSet r = s.executeQuery(
                    "SELECT sum(a) FROM read_csv(" + named.literal() + ")")) {
                r.next();
                assertEquals(1, r.getLong(1));
            }
            for (String sql : new String[] {
                "SELECT * FROM read_csv(" + Sql.literal(dir.resolve("other.csv").toString()) + ")",
                "SELECT * FROM glob(" + Sql.literal(dir + "/*") + ")",
                "COPY (SELECT 1) TO " + Sql.literal(dir.resolve("out.csv").toString()),
                "SET enable_external_access = true"}) {
                try (Statement s = db.createStatement()) {
                    assertThrows(SQLException.class, () -> s.execute(sql), sql);
                }
            }
        }
        assertFalse(Files.exists(dir.resolve("out.csv")));
    }

    /** Paths are literal: "users[1].csv" is that file, not users1.csv; "u*.csv" is refused as missing. */
    @Test
    void pathsAreLiteralNotPatterns() throws Exception {
        Files.writeString(dir.resolve("users[1].csv"), "arm,spend\nA,1\nB,0\n");
        Files.writeString(dir.resolve("users1.csv"), "arm,spend\nA,5\nA,5\nB,0\nB,0\n");
        SpendData d = SpendDataReader.read(new DataSpec("users[1].csv", "users", null, null), dir, false);
        assertEquals(2, d.rows());
        InputException e = assertThrows(InputException.class,
                () -> SpendDataReader.read(new DataSpec("u*.csv", "users", null, null), dir, false));
        assertTrue(e.getMessage().startsWith("u*.csv: no such file"), e.getMessage());
        assertFalse(d.query().contains(dir.toString()), "the result names the file as the spec does: " + d.query());
    }

    /** Links are followed to their file; a loop of links and an unreadable file say so. */
    @Test
    void linksLoopsAndPermissionsAreNamed() throws Exception {
        Files.writeString(dir.resolve("real.csv"), "arm,spend\nA,1\nB,0\n");
        Files.createSymbolicLink(dir.resolve("link.csv"), dir.resolve("real.csv"));
        assertEquals(dir.resolve("real.csv").toRealPath(), DataFile.of("link.csv", dir, "data.path").real);
        Files.createSymbolicLink(dir.resolve("loop1.csv"), dir.resolve("loop2.csv"));
        Files.createSymbolicLink(dir.resolve("loop2.csv"), dir.resolve("loop1.csv"));
        InputException loop = assertThrows(InputException.class, () -> DataFile.of("loop1.csv", dir, "data.path"));
        assertTrue(loop.getMessage().contains("loop of symbolic links"), loop.getMessage());
        assertThrows(InputException.class, () -> DataFile.of("real.txt", dir, "data.path"));
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
        for (Connection db : new Connection[] {Engine.open(false), Engine.open(true)}) {
            try (db; Statement s = db.createStatement();
                 java.sql.ResultSet r = s.executeQuery("SELECT current_setting('temp_directory')")) {
                r.next();
                Path temp = Path.of(r.getString(1));
                assertTrue(temp.isAbsolute() && temp.startsWith(Path.of(System.getProperty("java.io.tmpdir"))), temp.toString());
            }
        }
    }

    /** A file written to while it is read: the statistics (or the error they raised) are refused, saying so. */
    @Test
    void aFileChangedWhileReadIsRefused() throws IOException {
        Path table = dir.resolve("history.csv");
        Files.writeString(table, "users,payers\n100,3\n120,5\n");
        InputException grown = assertThrows(InputException.class, () -> SideTable.read("history.csv", dir,
                "priors.fromHistory.path", java.util.Map.of("users", "DOUBLE", "payers", "DOUBLE"),
                relation -> "SELECT count(*) FROM " + relation, rows -> {
                    try {
                        Files.writeString(table, "130,4\n", java.nio.file.StandardOpenOption.APPEND);
                    } catch (IOException e) {
                        throw new java.io.UncheckedIOException(e);
                    }
                    rows.next();
                    return rows.getLong(1);
                }));
        assertEquals("history.csv: changed while it was read (size 25 -> 31 bytes); fit again once it is complete",
                grown.getMessage());
        DataFile file = DataFile.of("history.csv", dir, "data.path");
        Files.writeString(table, "users,payers\n100,3\n");
        InputException cut = assertThrows(InputException.class, () -> DataFile.whole(() -> {
            throw new InputException("history.csv: line 3, column 'users': a whole number is needed");
        }, file));
        assertTrue(cut.getMessage().startsWith("history.csv: changed while it was read (size 31 -> 19 bytes)"),
                "a truncated file's misleading error gives way to the cause: " + cut.getMessage());
        DataFile same = DataFile.of("history.csv", dir, "data.path");
        assertEquals(7, DataFile.whole(() -> 7, same), "an unchanged file passes");
    }
}
