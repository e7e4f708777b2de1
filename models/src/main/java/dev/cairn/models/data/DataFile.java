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
    /** Size and modification time when the spec named it, to notice a file changed while read. */
    private final Stamp stamp;

    private record Stamp(long size, java.nio.file.attribute.FileTime modified, Object key) {
    }

    private DataFile(String written, Path real, String engineName, boolean parquet, Stamp stamp) {
        this.written = written;
        this.real = real;
        this.engineName = engineName;
        this.parquet = parquet;
        this.stamp = stamp;
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
        return new DataFile(written, real, engineName, parquet, stamp(real, written));
    }

    private static Stamp stamp(Path real, String written) {
        try {
            var a = Files.readAttributes(real, java.nio.file.attribute.BasicFileAttributes.class);
            return new Stamp(a.size(), a.lastModifiedTime(), a.fileKey());
        } catch (IOException e) {
            throw new InputException(written + ": cannot be read (" + e.getMessage() + ")");
        }
    }

    /**
     * Runs a read of {@code files} and refuses what it gave, or the error it raised, if a file changed
     * meanwhile: a half-written file makes misleading errors as well as wrong statistics.
     */
    static <T> T whole(java.util.function.Supplier<T> read, DataFile... files) {
        T result;
        try {
            result = read.get();
        } catch (RuntimeException e) {
            requireUnchanged(files);
            throw e;
        }
        requireUnchanged(files);
        return result;
    }

    /**
     * Refuses statistics read from a file that was written to, replaced or truncated while they were read:
     * its size or modification time now differ from when the read began.
     *
     * @param files the files a read used (null entries skipped)
     */
    static void requireUnchanged(DataFile... files) {
        for (DataFile f : files) {
            if (f == null) {
                continue;
            }
            Stamp now;
            try {
                now = stamp(f.real, f.written);
            } catch (InputException e) {
                throw new InputException(f.written + ": changed while it was read (it is gone or unreadable now); "
                        + "fit again once it is complete");
            }
            if (!now.equals(f.stamp)) {
                throw new InputException(f.written + ": changed while it was read (" + (now.size() != f.stamp.size()
                        ? "size " + f.stamp.size() + " -> " + now.size() + " bytes" : "modified again")
                        + "); fit again once it is complete");
            }
        }
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
