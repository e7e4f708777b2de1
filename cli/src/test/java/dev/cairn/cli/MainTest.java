package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class MainTest {

    static String[] run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine cl = Main.commandLine(out, err);
        int code = cl.execute(args);
        return new String[] {String.valueOf(code), out.toString(), err.toString()};
    }

    @Test
    void helpShowsTheJobAndTheCautions() {
        String[] r = run("--help");
        assertEquals("0", r[0]);
        assertTrue(r[1].contains("Usage: cairn"), r[1]);
        assertTrue(r[1].contains("not financial or legal advice"), r[1]);
    }

    @Test
    void versionComesFromTheBuild() {
        String[] r = run("--version");
        assertEquals("0", r[0]);
        assertTrue(r[1].matches("cairn \\d+\\.\\d+\\.\\d+.*\\s*"), r[1]);
    }

    @Test
    void unknownOptionIsBadInput() {
        String[] r = run("--no-such-option");
        assertEquals("2", r[0]);
        assertTrue(r[2].contains("--no-such-option"), r[2]);
    }
}
