package dev.cairn.models.data;

import dev.cairn.models.InputException;
import java.io.IOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.FileSystemException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.regex.Pattern;

/**
 * A file a spec names, taken literally: resolved against the spec's folder with links followed, required
 * to be a readable regular file with an extension its field accepts, and handed to the SQL engine under a
 * name the engine cannot read as a pattern. (The engine expands {@code * ? [ ]} in paths; a file whose
 * path holds one of them is read through a link with a plain name in a private folder of this process.)
 * The engine is then allowed to open only these files ({@link Engine#open}).
 */
public final class DataFile {
    /** What the engine would read as a pattern. */
    private static final Pattern PATTERN = Pattern.compile("[*?\\[\\]{}]");
    private static final AtomicInteger LINKS = new AtomicInteger();
    private static Path linkFolder;

    /** The path as the spec wrote it (relative to the spec): what messages and results show. */
    public final String written;
    /** The file itself, links resolved. */
    public final Path real;
    /** The path the engine is given. */
    final String engineName;
    /** True for Parquet, false for CSV. */
    public final boolean parquet;

    private DataFile(String written, Path real, String engineName, boolean parquet) {
        this.written = written;
        this.real = real;
        this.engineName = engineName;
        this.parquet = parquet;
    }

    /**
     * Resolves a path from the spec.
     *
     * @param written the path as written in the spec
     * @param baseDir the spec's folder
     * @param field   the spec field, for messages ("data.path")
     * @return the file
     * @throws InputException naming the path and field when it is not a readable CSV or Parquet file
     */
    public static DataFile of(String written, Path baseDir, String field) {
        if (written == null || written.isBlank()) {
            throw new InputException(field + ": the path is empty");
        }
        Path given = baseDir.resolve(written).normalize();
        Path real;
        try {
            real = given.toRealPath();
        } catch (NoSuchFileException e) {
            throw new InputException(written + ": no such file (" + field + ", resolved to " + given + ")");
        } catch (AccessDeniedException e) {
            throw new InputException(written + ": cannot be read: permission denied (" + field + ")");
        } catch (FileSystemException e) {
            String reason = e.getReason() == null ? "" : e.getReason();
            throw new InputException(written + ": cannot be opened (" + field + "): "
                    + (reason.toLowerCase(Locale.ROOT).contains("symbolic links") ? "a loop of symbolic links" : reason));
        } catch (IOException e) {
            throw new InputException(written + ": cannot be opened (" + field + "): " + e.getMessage());
        }
        if (Files.isDirectory(real)) {
            throw new InputException(written + ": is a folder, expected a CSV or Parquet file (" + field + ")");
        }
        if (!Files.isRegularFile(real)) {
            throw new InputException(written + ": is not a regular file (" + field + ")");
        }
        String lower = written.toLowerCase(Locale.ROOT);
        boolean parquet = lower.endsWith(".parquet") || lower.endsWith(".pq");
        if (!parquet && !lower.endsWith(".csv")) {
            throw new InputException(written + ": " + field + " must end in .csv or .parquet");
        }
        if (!Files.isReadable(real)) {
            throw new InputException(written + ": cannot be read: permission denied (" + field + ")");
        }
        String engineName = real.toString();
        if (PATTERN.matcher(engineName).find()) {
            engineName = link(real, parquet ? ".parquet" : ".csv", written, field).toString();
        }
        return new DataFile(written, real, engineName, parquet);
    }

    /** The engine's path quoted as an SQL literal. */
    String literal() {
        return Sql.literal(engineName);
    }

    /** An SQL text with this file's engine path replaced by the path as written (for results). */
    String shown(String sql) {
        return sql == null ? null : sql.replace(literal(), Sql.literal(written));
    }

    static List<String> engineNames(DataFile... files) {
        return java.util.Arrays.stream(files).filter(java.util.Objects::nonNull).map(f -> f.engineName).toList();
    }

    private static synchronized Path link(Path real, String extension, String written, String field) {
        try {
            if (linkFolder == null) {
                linkFolder = Files.createTempDirectory("cairn-files-");
                linkFolder.toFile().deleteOnExit();
            }
            Path link = linkFolder.resolve("file-" + LINKS.incrementAndGet() + extension);
            Files.createSymbolicLink(link, real);
            link.toFile().deleteOnExit();
            return link;
        } catch (IOException | UnsupportedOperationException e) {
            throw new InputException(written + ": a path with * ? [ ] { } cannot be read here (" + field
                    + "); rename the file or its folder");
        }
    }
}
