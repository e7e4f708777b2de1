package dev.cairn.models.data;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import org.duckdb.DuckDBConnection;

/**
 * Connections to the embedded SQL engine (DuckDB, in memory).
 *
 * <p>{@link #connect()} hands out a connection to one engine instance shared by the whole process. Starting
 * an instance costs about 15 ms, as much as a sixth of reading ten million users from Parquet, and a tool
 * that calls cairn as a library fits again and again; a connection to the running instance costs well
 * under a millisecond. Each connection has its own temporary tables, and nothing here changes the shared
 * instance's settings, so fits on several threads do not see each other.
 *
 * <p>{@link #ordered()} starts a private single-threaded instance instead, for the few reads that number
 * rows in file order ({@code row_number() OVER ()} follows the file only on one thread): naming bad rows
 * and reading small retention tables.
 *
 * <p>Every instance spills to a temporary folder of this process, never to the working directory (the
 * engine's default for in-memory databases).
 */
public final class Engine {
    private static final String URL = "jdbc:duckdb:";
    private static DuckDBConnection shared;
    private static Path spill;

    private Engine() {
    }

    /** A new connection to the shared engine; close it when done (the engine itself stays). */
    public static synchronized Connection connect() throws SQLException {
        if (shared == null || shared.isClosed()) {
            shared = (DuckDBConnection) start(null);
        }
        return shared.duplicate();
    }

    /** A connection to a private engine that runs one thread, so rows are numbered in file order. */
    public static Connection ordered() throws SQLException {
        return start("SET threads = 1");
    }

    private static Connection start(String setting) throws SQLException {
        Connection db = DriverManager.getConnection(URL);
        try (Statement s = db.createStatement()) {
            s.execute("SET temp_directory = " + Sql.literal(spillFolder()));
            if (setting != null) {
                s.execute(setting);
            }
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
