package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/** Every case of fixtures/bad is refused with one line containing the expected fragment. */
class BadInputCorpusTest {
    static final Path CORPUS = Path.of("..", "fixtures", "bad");

    static Stream<String> cases() throws IOException {
        try (Stream<Path> s = Files.list(CORPUS)) {
            return s.filter(Files::isDirectory).map(p -> p.getFileName().toString()).sorted().toList().stream();
        }
    }

    @Test
    void theCorpusHasAtLeastThirtyCases() throws IOException {
        assertTrue(cases().count() >= 30);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void refusedWithOneLineNamingTheProblem(String name) throws IOException {
        Path dir = CORPUS.resolve(name);
        String expected = Files.readString(dir.resolve("expected.txt"), StandardCharsets.UTF_8).strip();
        InputException e = assertThrows(InputException.class, () -> Cairn.fit(dir.resolve("spec.json"), FitOptions.DEFAULT));
        String message = e.getMessage();
        assertTrue(message.contains(expected), "message: " + message + "\nexpected fragment: " + expected);
        assertFalse(message.contains("\n"), "one line: " + message);
        assertFalse(message.contains("Exception"), "no exception names: " + message);
        List<String> left = Files.list(dir).map(p -> p.getFileName().toString())
                .filter(f -> f.endsWith(".json") && !f.equals("spec.json")).toList();
        assertTrue(left.isEmpty(), "nothing written: " + left);
    }
}
