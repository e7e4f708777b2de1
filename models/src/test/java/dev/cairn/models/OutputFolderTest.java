package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * One run's outputs land together or not at all: fault injection for a run that dies between its files,
 * a disk that fills while writing, a second run into the same folder, and a run killed between the renames.
 */
class OutputFolderTest {
    @TempDir
    Path dir;

    private Path previousSet() throws IOException {
        Path out = dir.resolve("out");
        try (OutputFolder f = OutputFolder.claim(out)) {
            Files.writeString(f.folder().resolve("result.json"), "old result");
            Files.writeString(f.folder().resolve("draws.csv"), "old draws");
            f.commit();
        }
        return out;
    }

    private List<String> siblings() throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    @Test
    void aCommittedRunReplacesTheWholeSetAndLeavesNothingBeside() throws IOException {
        Path out = previousSet();
        try (OutputFolder f = OutputFolder.claim(out)) {
            Files.writeString(f.folder().resolve("result.json"), "new result");
            f.commit();
        }
        assertEquals("new result", Files.readString(out.resolve("result.json")));
        assertFalse(Files.exists(out.resolve("draws.csv")), "no file of the old set survives beside the new one");
        assertEquals(List.of("out"), siblings());
        try (Stream<Path> s = Files.list(out)) {
            assertEquals(List.of("result.json"), s.map(p -> p.getFileName().toString()).toList());
        }
    }

    /** kill -9 after the first file: the claim is never committed nor closed; the old set stays, the next run cleans up. */
    @Test
    void aRunKilledBetweenItsFilesLeavesThePreviousSet() throws IOException {
        Path out = previousSet();
        OutputFolder killed = OutputFolder.claim(out);
        Files.writeString(killed.folder().resolve("result.json"), "half of a new set");
        // the process dies here: nothing else runs
        assertEquals("old result", Files.readString(out.resolve("result.json")));
        assertEquals("old draws", Files.readString(out.resolve("draws.csv")));
        try (OutputFolder next = OutputFolder.claim(out)) { // the owner is this process: taken as stale
            next.close();
        }
        assertEquals(List.of("out"), siblings(), "the next run removed what the killed one left");
    }

    /** A full disk, injected as a failing write: the previous set is unchanged and no partial file remains. */
    @Test
    void aFullDiskLeavesThePreviousSet() throws IOException {
        Path out = previousSet();
        try (OutputFolder f = OutputFolder.claim(out)) {
            assertThrows(IOException.class, () -> ResultWriter.atomically(f.folder().resolve("draws.csv"), w -> {
                w.write("chain,iteration,x\n");
                throw new IOException("No space left on device");
            }));
        }
        assertEquals("old draws", Files.readString(out.resolve("draws.csv")));
        assertEquals(List.of("out"), siblings());
    }

    /** A second run while the first (a live process) writes: refused, naming it; the first is untouched. */
    @Test
    void aSecondRunIntoTheSameFolderIsRefused() throws Exception {
        Path out = previousSet();
        Process other = new ProcessBuilder("sleep", "30").start();
        try {
            Path writing = dir.resolve(".out.cairn-writing");
            Files.createDirectory(writing);
            Files.writeString(writing.resolve(".cairn-owner"), Long.toString(other.pid()));
            InputException e = assertThrows(InputException.class, () -> OutputFolder.claim(out));
            assertTrue(e.getMessage().contains("another cairn run (process " + other.pid() + ")"), e.getMessage());
            assertTrue(Files.exists(writing.resolve(".cairn-owner")), "the running claim is left alone");
        } finally {
            other.destroyForcibly().waitFor();
        }
        try (OutputFolder f = OutputFolder.claim(out)) { // its process gone, the claim is stale
            f.commit();
        }
    }

    /** Killed between moving the old set aside and moving the new one in: the next run puts the old set back. */
    @Test
    void aRunKilledBetweenTheRenamesIsRepaired() throws IOException {
        Path out = previousSet();
        Files.move(out, dir.resolve(".out.cairn-previous"));
        try (OutputFolder f = OutputFolder.claim(out)) {
            assertEquals("old result", Files.readString(out.resolve("result.json")));
        }
        assertEquals(List.of("out"), siblings());
    }

    @Test
    void foldersThatCannotBeUsedAreRefusedBeforeTheFit() throws IOException {
        Files.writeString(dir.resolve("file"), "x");
        assertTrue(assertThrows(InputException.class, () -> OutputFolder.claim(dir.resolve("file")))
                .getMessage().contains("exists and is not a folder"));
        assertTrue(assertThrows(InputException.class, () -> OutputFolder.claim(dir.resolve("file").resolve("out")))
                .getMessage().contains("cannot create its parent folder"));
        assertTrue(assertThrows(InputException.class, () -> OutputFolder.claim(Path.of("")))
                .getMessage().contains("--out is empty"));
        Path mine = dir.resolve("mine");
        Files.createDirectories(mine);
        Files.writeString(mine.resolve("notes.txt"), "the user's own file");
        InputException e = assertThrows(InputException.class, () -> OutputFolder.claim(mine));
        assertTrue(e.getMessage().contains("holds files cairn did not write (notes.txt)"), e.getMessage());
        assertTrue(Files.exists(mine.resolve("notes.txt")));
        assertEquals(List.of("file", "mine"), siblings());
    }
}
