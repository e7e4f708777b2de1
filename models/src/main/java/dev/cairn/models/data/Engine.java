package dev.cairn.models.data;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;

/**
 * Connections to the embedded SQL engine (DuckDB, in memory).
 *
 * <p>Each read opens its own engine instance that may open only the files the spec names ({@link DataFile}):
 * the engine's external access is switched off with those files (and this process's spill folder) as the
 * only exceptions, and its configuration is locked, so no query text, column name or file name can make it
 * read, list or write anything else. An instance starts in about 15 ms.
 *
 * <p>{@code ordered} instances run one thread, for the reads that number rows in file order
 * ({@code row_number() OVER ()} follows the file only on one thread): naming bad rows and reading small
 * retention tables.
 *
 * <p>Every instance spills to a temporary folder of this process, never to the working directory (the
 * engine's default for in-memory databases).
 */
public final class Engine {
    private static final String URL = "jdbc:duckdb:";
    private static Path spill;

    private Engine() {
    }

    /**
     * A new engine that may read only {@code files} (null entries are skipped: inline rows need none).
     *
     * @param ordered one thread, so rows are numbered in file order
     * @param files   the files it may read
     * @return the connection; closing it ends the engine
     * @throws SQLException when the engine cannot start
     */
    public static Connection open(boolean ordered, DataFile... files) throws SQLException {
        Connection db;
        try {
            db = DriverManager.getConnection(URL);
        } catch (UnsatisfiedLinkError | ExceptionInInitializerError | NoClassDefFoundError e) {
            throw new dev.cairn.models.InputException("cannot start the embedded SQL engine: its native library does not "
                    + "load on this machine (" + e.getClass().getSimpleName() + ": " + e.getMessage() + ")");
        }
        try (Statement s = db.createStatement()) {
            String folder = spillFolder();
            s.execute("SET temp_directory = " + Sql.literal(folder));
            if (ordered) {
                s.execute("SET threads = 1");
            }
            StringBuilder paths = new StringBuilder("[");
            for (String f : DataFile.engineNames(files)) {
                paths.append(paths.length() > 1 ? ", " : "").append(Sql.literal(f));
            }
            s.execute("SET allowed_paths = " + paths + "]");
            s.execute("SET allowed_directories = [" + Sql.literal(folder + java.io.File.separator) + "]");
            s.execute("SET enable_external_access = false");
            s.execute("SET lock_configuration = true");
        } catch (SQLException e) {
            db.close();
            throw e;
        }
        return db;
    }

    private static synchronized String spillFolder() throws SQLException {
        if (spill == null) {
            try {
                spill = Files.createTempDirectory("cairn-engine-");
            } catch (IOException e) {
                throw new SQLException("cannot make a temporary folder for the SQL engine: " + e.getMessage(), e);
            }
            spill.toFile().deleteOnExit();
        }
        return spill.toString();
    }
}
