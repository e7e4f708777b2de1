package dev.cairn.cli;

import java.nio.file.AccessDeniedException;
import java.nio.file.FileSystemException;
import java.nio.file.NoSuchFileException;

/** One-line wording for failures of the machine rather than of cairn: files, disks, memory. */
final class Messages {
    private Messages() {
    }

    /** The reason an input/output operation failed, without class names ("No space left on device"). */
    static String ioReason(Throwable e) {
        if (e instanceof AccessDeniedException) {
            return "permission denied";
        }
        if (e instanceof NoSuchFileException n) {
            return "no such file: " + n.getFile();
        }
        if (e instanceof FileSystemException f && f.getReason() != null) {
            return f.getReason();
        }
        String m = e == null ? null : e.getMessage();
        return m == null || m.isBlank() ? "input/output error" : m.lines().findFirst().orElse(m);
    }

    /** The line for running out of heap, naming the limit and how to raise it. */
    static String outOfMemory() {
        long max = Runtime.getRuntime().maxMemory() / (1024 * 1024);
        return "out of memory (the heap limit is " + max + " MB): the input is larger than this limit allows; "
                + "raise it, e.g. CAIRN_JAVA_OPTS=-Xmx4g, or reduce the input";
    }
}
