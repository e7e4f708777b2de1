package dev.cairn.cli.serve;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Finished answers on disk ({@code cairn serve --store DIR}), so that a restart loses none: one file per fit,
 * {@code ID.STATUS.json} holding the answer's body exactly, written to a temporary sibling, forced to the
 * disk and renamed into place, so a reader (or a restart after a crash) sees a whole file or none.
 */
final class ResultStore {
    private static final Pattern NAME = Pattern.compile("([0-9a-f]{32})\\.([1-5][0-9][0-9])\\.json");
    private final Path folder;

    private ResultStore(Path folder) {
        this.folder = folder;
    }

    /**
     * Opens (creating if needed) a store folder and removes temporary files a crash left behind.
     *
     * @param folder the folder
     * @return the store
     * @throws UncheckedIOException when the folder cannot be made or listed
     */
    static ResultStore open(Path folder) {
        try {
            Files.createDirectories(folder);
            try (DirectoryStream<Path> left = Files.newDirectoryStream(folder, ".*.tmp")) {
                for (Path p : left) {
                    Files.deleteIfExists(p);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("--store " + folder + ": " + e.getMessage(), e);
        }
        return new ResultStore(folder);
    }

    /** A stored answer: the fit's id, when it finished, and its answer. */
    record Stored(String id, long finishedMillis, FitJob.Answer answer) {
    }

    /**
     * @return every answer in the folder (files of other names are left alone)
     * @throws UncheckedIOException when a file cannot be read
     */
    List<Stored> readAll() {
        List<Stored> out = new ArrayList<>();
        try (DirectoryStream<Path> files = Files.newDirectoryStream(folder, "*.json")) {
            for (Path p : files) {
                Matcher m = NAME.matcher(p.getFileName().toString());
                if (m.matches()) {
                    out.add(new Stored(m.group(1), Files.getLastModifiedTime(p).toMillis(),
                            new FitJob.Answer(Integer.parseInt(m.group(2)), Files.readAllBytes(p))));
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("--store " + folder + ": " + e.getMessage(), e);
        }
        return out;
    }

    /**
     * Writes a finished answer atomically.
     *
     * @param id             the fit's id
     * @param answer         its answer
     * @param finishedMillis when it finished (the file's modification time)
     * @throws UncheckedIOException when the file cannot be written
     */
    void write(String id, FitJob.Answer answer, long finishedMillis) {
        Path target = folder.resolve(id + "." + answer.status() + ".json");
        try {
            dev.cairn.models.ResultWriter.atomicallyBytes(target, out -> out.write(answer.body()), true);
            Files.setLastModifiedTime(target, FileTime.fromMillis(finishedMillis));
        } catch (IOException e) {
            throw new UncheckedIOException("--store " + folder + ": cannot write " + target.getFileName() + ": "
                    + e.getMessage(), e);
        }
    }

    /**
     * Removes a fit's stored answer, if any.
     *
     * @param id the fit's id
     */
    void delete(String id) {
        try (DirectoryStream<Path> files = Files.newDirectoryStream(folder, id + ".*.json")) {
            for (Path p : files) {
                Files.deleteIfExists(p);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("--store " + folder + ": cannot delete the result of " + id + ": "
                    + e.getMessage(), e);
        }
    }
}
