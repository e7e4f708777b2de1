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
            Class.forName("org.duckdb.DuckDBDriver");
        } catch (ClassNotFoundException e) {
            throw new dev.cairn.models.InputException("cannot start the embedded SQL engine: its driver "
                    + "(org.duckdb:duckdb_jdbc) is not on the class path; run cairn-all.jar or ./cairn, or add the "
                    + "driver to the program's dependencies");
        }
        try {
            db = connect();
        } catch (UnsatisfiedLinkError | ExceptionInInitializerError | NoClassDefFoundError e) {
            throw new dev.cairn.models.InputException(missingLibrary());
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

    private static boolean loaded;

    /**
     * The first connection loads the engine's native library; when that fails, the driver prints its own stack
     * trace to standard error before throwing, which the one line of {@link #missingLibrary} replaces (standard
     * error is held back for that first attempt only; nothing else runs yet).
     */
    private static Connection connect() throws SQLException {
        synchronized (Engine.class) {
            if (!loaded) {
                java.io.PrintStream err = System.err;
                System.setErr(new java.io.PrintStream(java.io.OutputStream.nullOutputStream()));
                try {
                    Connection first = DriverManager.getConnection(URL);
                    loaded = true;
                    return first;
                } finally {
                    System.setErr(err);
                }
            }
        }
        return DriverManager.getConnection(URL);
    }

    /** What is missing and what to do, naming the file the driver looks for and the folder it looks in. */
    static String missingLibrary() {
        String os = System.getProperty("os.name", "").toLowerCase(java.util.Locale.ROOT);
        String arch = System.getProperty("os.arch", "");
        String file = "libduckdb_java.so_" + (os.contains("mac") ? "macos" : os.contains("win") ? "windows" : "linux") + "_"
                + (arch.equals("aarch64") || arch.equals("arm64") ? "arm64" : "amd64");
        String where = "the folder of the jar";
        try {
            java.security.CodeSource code = Engine.class.getProtectionDomain().getCodeSource();
            if (code != null) {
                where = Path.of(code.getLocation().toURI()).getParent().toString();
            }
        } catch (java.net.URISyntaxException | RuntimeException e) {
            // keep the general wording
        }
        return "cannot start the embedded SQL engine: its native library (" + file + " for this machine) is not in "
                + where + "; copy the libduckdb_java.so_* files from cli/target/ next to cairn-all.jar, or run ./cairn "
                + "from the repository";
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
