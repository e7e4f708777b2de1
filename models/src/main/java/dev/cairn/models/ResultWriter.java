package dev.cairn.models;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import dev.cairn.models.result.FitResult;
import dev.cairn.samplers.DrawsCsv;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;

/**
 * Writes result.json and draws.csv into a folder, each through a temporary file renamed into place, so
 * a reader never sees a half-written file and an interrupted run leaves the old files intact.
 */
public final class ResultWriter {
    public static final String RESULT = "result.json";
    public static final String DRAWS = "draws.csv";
    private static final ObjectMapper MAPPER = new ObjectMapper()
            .enable(SerializationFeature.INDENT_OUTPUT)
            .disable(JsonGenerator.Feature.AUTO_CLOSE_TARGET);

    private ResultWriter() {
    }

    /**
     * Any part of a result as the JSON result.json writes for it.
     *
     * @param part a record of the result
     * @return the text
     */
    public static String jsonOf(Object part) {
        try {
            return MAPPER.writeValueAsString(part);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    /**
     * The same JSON with every non-ASCII character escaped (\\uXXXX): identical once parsed, and readable
     * whatever encoding a reader of a pipe assumes.
     *
     * @param result a model's result
     * @return the text, ASCII only, with a final newline
     */
    public static String asciiJson(FitResult result) {
        try {
            return MAPPER.writer().with(com.fasterxml.jackson.core.json.JsonWriteFeature.ESCAPE_NON_ASCII)
                    .writeValueAsString(result) + "\n";
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * The result as the JSON of result.json (stable key order, a final newline).
     *
     * @param result a model's result
     * @return the text
     */
    public static String json(FitResult result) {
        try {
            return MAPPER.writeValueAsString(result) + "\n";
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Writes result.json and draws.csv into {@code dir}, each atomically.
     *
     * @param outcome the fit's result and draws
     * @param dir     the folder (created when missing)
     * @throws java.io.UncheckedIOException when a file cannot be written
     */
    public static void write(FitOutcome outcome, Path dir) {
        writeResult(outcome, dir);
        writeDraws(outcome, dir);
    }

    /**
     * Writes result.json alone, atomically (so that a caller can write draws.csv at the same time).
     *
     * @param outcome the fit's result
     * @param dir     the folder (created when missing)
     * @throws java.io.UncheckedIOException when the file cannot be written
     */
    public static void writeResult(FitOutcome outcome, Path dir) {
        try {
            Files.createDirectories(dir);
            atomically(dir.resolve(RESULT), w -> w.write(json(outcome.result())));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Writes draws.csv alone, atomically.
     *
     * @param outcome the fit's draws
     * @param dir     the folder (created when missing)
     * @throws java.io.UncheckedIOException when the file cannot be written
     */
    public static void writeDraws(FitOutcome outcome, Path dir) {
        try {
            Files.createDirectories(dir);
            atomicallyBytes(dir.resolve(DRAWS), out -> DrawsCsv.write(outcome.draws(), out));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Writes text through the given action into a temporary sibling, then renames it onto {@code target}.
     *
     * @param target the file written
     * @param action writes the text
     * @throws IOException when writing or renaming fails (the temporary file is removed)
     */
    public static void atomically(Path target, TextAction action) throws IOException {
        atomicallyBytes(target, out -> {
            Writer w = new java.io.BufferedWriter(new java.io.OutputStreamWriter(out, StandardCharsets.UTF_8));
            action.write(w);
            w.flush();
        });
    }

    /** The same as {@link #atomically} for bytes (through a 1 MiB buffer). */
    private static void atomicallyBytes(Path target, ByteAction action) throws IOException {
        atomicallyBytes(target, action, false);
    }

    /**
     * Writes bytes through the given action into a temporary sibling, then renames it onto {@code target}, so
     * a reader sees the whole file or none.
     *
     * @param target  the file written
     * @param action  writes the bytes
     * @param durable whether the bytes are forced to the disk before the rename (a result kept across a
     *                machine's restart, not only the process's)
     * @throws IOException when writing or renaming fails (the temporary file is removed)
     */
    public static void atomicallyBytes(Path target, ByteAction action, boolean durable) throws IOException {
        // A sibling with a random suffix, created with the default permissions (not the owner-only ones of a
        // temporary file), so the renamed file reads like any other the user writes.
        Path tmp = target.resolveSibling("." + target.getFileName() + "." + Long.toHexString(System.nanoTime())
                + Long.toHexString(Double.doubleToLongBits(Math.random())) + ".tmp");
        try {
            try (java.nio.channels.FileChannel ch = java.nio.channels.FileChannel.open(tmp,
                    java.nio.file.StandardOpenOption.CREATE_NEW, java.nio.file.StandardOpenOption.WRITE)) {
                java.io.OutputStream out = new java.io.BufferedOutputStream(java.nio.channels.Channels.newOutputStream(ch),
                        1 << 20);
                action.write(out);
                out.flush();
                if (durable) {
                    ch.force(true);
                }
            }
            try {
                Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    /** Writes a file's bytes. */
    @FunctionalInterface
    public interface ByteAction {
        void write(java.io.OutputStream out) throws IOException;
    }

    @FunctionalInterface
    public interface TextAction {
        void write(Writer w) throws IOException;
    }
}
