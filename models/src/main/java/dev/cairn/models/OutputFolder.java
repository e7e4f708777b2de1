package dev.cairn.models;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Comparator;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;

/**
 * One run's output folder, written all at once or not at all.
 *
 * <p>{@link #claim} creates a fresh folder {@code .NAME.cairn-writing} beside {@code NAME} (the {@code --out}
 * folder) before the fit starts: creating it is the lock (a second run into the same folder finds it and
 * refuses, naming the process that holds it) and the check that the place is writable. The run writes its
 * files there; {@link #commit} then moves the old folder aside to {@code .NAME.cairn-previous}, renames the
 * new one to {@code NAME} and deletes the old set. A run that fails or is interrupted before the commit
 * leaves the previous set as it was. What a run killed with {@code kill -9} leaves behind (a writing folder
 * whose process is gone; an old set moved aside in the instant between the two renames) is cleaned up or
 * put back by the next run into the same folder.
 *
 * <p>The folder holds only cairn's outputs: an existing {@code --out} with other files in it is refused,
 * since the whole folder is replaced.
 */
public final class OutputFolder implements AutoCloseable {
    /** The files a run writes; an existing folder may hold only these. */
    public static final Set<String> OUTPUTS = Set.of("result.json", "draws.csv", "report.html", "plan.json", "plan.csv");
    private static final String OWNER = ".cairn-owner";

    private final Path target;
    private final Path writing;
    private final Path previous;
    private boolean committed;

    private OutputFolder(Path target, Path writing, Path previous) {
        this.target = target;
        this.writing = writing;
        this.previous = previous;
    }

    /**
     * Claims {@code out} for this run.
     *
     * @param out the output folder (created at commit when missing)
     * @return the claim; write into {@link #folder()}, then {@link #commit()}; close it in any case
     * @throws InputException when the folder cannot be used: not a folder, holds other files, another run
     *                        writes into it, or its parent is not writable (with the reason)
     */
    public static OutputFolder claim(Path out) {
        if (out == null || out.toString().isBlank()) {
            throw new InputException("--out is empty; name the folder to write into");
        }
        Path target = out.toAbsolutePath().normalize();
        if (target.getFileName() == null) {
            throw new InputException("--out " + out + ": name a folder below the file-system root");
        }
        if (Files.exists(target) && !Files.isDirectory(target)) {
            throw new InputException("--out " + out + ": exists and is not a folder");
        }
        String name = target.getFileName().toString();
        Path parent = target.getParent();
        Path writing = parent.resolve("." + name + ".cairn-writing");
        Path previous = parent.resolve("." + name + ".cairn-previous");
        try {
            Files.createDirectories(parent);
        } catch (IOException e) {
            throw new InputException("--out " + out + ": cannot create its parent folder (" + reason(e) + ")");
        }
        for (int attempt = 0; ; attempt++) {
            try {
                Files.createDirectory(writing);
                break;
            } catch (FileAlreadyExistsException e) {
                long owner = owner(writing);
                if (owner > 0 && owner != ProcessHandle.current().pid() && ProcessHandle.of(owner).map(ProcessHandle::isAlive).orElse(false)) {
                    throw new InputException("--out " + out + ": another cairn run (process " + owner
                            + ") is writing into it; wait for it to finish or choose another folder");
                }
                if (attempt > 0) {
                    throw new InputException("--out " + out + ": cannot claim " + writing + "; remove it by hand");
                }
                try {
                    deleteTree(writing); // left by a run that was killed
                } catch (IOException gone) {
                    throw new InputException("--out " + out + ": cannot remove " + writing + " (" + reason(gone) + ")");
                }
            } catch (IOException e) {
                throw new InputException("--out " + out + ": cannot write beside it (" + reason(e) + ")");
            }
        }
        OutputFolder claim = new OutputFolder(target, writing, previous);
        try {
            Files.writeString(writing.resolve(OWNER), Long.toString(ProcessHandle.current().pid()), StandardCharsets.UTF_8);
            claim.recover();
            if (Files.isDirectory(target)) {
                try (Stream<Path> s = Files.list(target)) {
                    List<String> other = s.map(p -> p.getFileName().toString())
                            .filter(f -> !OUTPUTS.contains(f) && !f.equals(OWNER) && !(f.startsWith(".") && f.endsWith(".tmp")))
                            .sorted().toList();
                    if (!other.isEmpty()) {
                        throw new InputException("--out " + out + ": holds files cairn did not write (" + String.join(", ",
                                other.subList(0, Math.min(3, other.size()))) + (other.size() > 3 ? ", ..." : "")
                                + "); the whole folder is replaced, so choose an empty or new folder");
                    }
                }
            }
        } catch (IOException e) {
            claim.close();
            throw new InputException("--out " + out + ": cannot write beside it (" + reason(e) + ")");
        } catch (RuntimeException e) {
            claim.close();
            throw e;
        }
        return claim;
    }

    /** {@return where this run writes its files until the commit} */
    public Path folder() {
        return writing;
    }

    /** {@return the folder the files will be in after the commit} */
    public Path target() {
        return target;
    }

    /**
     * Swaps the new set in: the old folder aside, the new one in place, the old one deleted.
     *
     * @throws UncheckedIOException when a rename fails (the previous set is then put back)
     */
    public void commit() {
        try {
            if (Files.exists(target)) {
                move(target, previous);
            }
            try {
                move(writing, target);
            } catch (IOException e) {
                if (Files.exists(previous) && !Files.exists(target)) {
                    move(previous, target);
                }
                throw e;
            }
            committed = true;
            Files.deleteIfExists(target.resolve(OWNER));
            deleteTree(previous);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Without a commit: removes the new files, leaving the previous set as it was. */
    @Override
    public void close() {
        if (!committed) {
            try {
                deleteTree(writing);
            } catch (IOException e) {
                // nothing more to do: the next run into the same folder removes it
            }
        }
    }

    /** A set moved aside by a run killed between its two renames is put back (or dropped if a new one landed). */
    private void recover() throws IOException {
        if (Files.exists(previous)) {
            if (Files.exists(target)) {
                deleteTree(previous);
            } else {
                move(previous, target);
            }
        }
        Files.deleteIfExists(target.resolve(OWNER));
    }

    private static long owner(Path writing) {
        try {
            return Long.parseLong(Files.readString(writing.resolve(OWNER), StandardCharsets.UTF_8).strip());
        } catch (IOException | NumberFormatException e) {
            return -1;
        }
    }

    private static void move(Path from, Path to) throws IOException {
        try {
            Files.move(from, to, StandardCopyOption.ATOMIC_MOVE);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(from, to);
        }
    }

    static void deleteTree(Path dir) throws IOException {
        if (!Files.exists(dir)) {
            return;
        }
        try (Stream<Path> s = Files.walk(dir)) {
            for (Path p : s.sorted(Comparator.reverseOrder()).toList()) {
                try {
                    Files.deleteIfExists(p);
                } catch (NoSuchFileException e) {
                    // gone already
                }
            }
        }
    }

    private static String reason(IOException e) {
        String m = e instanceof java.nio.file.FileSystemException f && f.getReason() != null ? f.getReason() : e.getMessage();
        if (e instanceof java.nio.file.AccessDeniedException) {
            m = "permission denied";
        }
        return m == null ? e.getClass().getSimpleName() : m;
    }
}
