package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.net.URL;
import java.net.URLClassLoader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import javax.tools.JavaCompiler;
import javax.tools.ToolProvider;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The README's library example, as a reader would copy it: the Java block after the
 * {@code <!-- library-example -->} marker is compiled against the library's classpath and run; it must
 * print a decision and a converged fit.
 */
class ReadmeExampleTest {
    @TempDir
    Path dir;

    @Test
    void theLibraryExampleCompilesAndRuns() throws Exception {
        String readme = Files.readString(Path.of("..", "README.md"), StandardCharsets.UTF_8);
        int marker = readme.indexOf("<!-- library-example -->");
        assertTrue(marker >= 0, "the README marks its library example");
        int start = readme.indexOf("```java", marker) + "```java".length();
        int end = readme.indexOf("```", start);
        String source = readme.substring(start, end);
        Path file = dir.resolve("ThreeArms.java");
        Files.writeString(file, source);
        JavaCompiler javac = ToolProvider.getSystemJavaCompiler();
        ByteArrayOutputStream diagnostics = new ByteArrayOutputStream();
        int status = javac.run(null, diagnostics, diagnostics, "-d", dir.toString(), "-cp",
                System.getProperty("java.class.path"), file.toString());
        assertEquals(0, status, diagnostics.toString(StandardCharsets.UTF_8));
        PrintStream stdout = System.out;
        ByteArrayOutputStream printed = new ByteArrayOutputStream();
        try (URLClassLoader loader = new URLClassLoader(new URL[] {dir.toUri().toURL()}, getClass().getClassLoader())) {
            System.setOut(new PrintStream(printed, true, StandardCharsets.UTF_8));
            loader.loadClass("ThreeArms").getMethod("main", String[].class).invoke(null, (Object) new String[0]);
        } finally {
            System.setOut(stdout);
        }
        List<String> lines = printed.toString(StandardCharsets.UTF_8).lines().toList();
        assertEquals(2, lines.size(), lines.toString());
        assertTrue(lines.get(0).matches("(Ship|Keep).*"), lines.get(0));
        assertEquals("converged: true", lines.get(1));
    }
}
