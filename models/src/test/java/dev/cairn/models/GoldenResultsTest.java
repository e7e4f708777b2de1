package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.models.demo.Demo;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Golden results: the result.json of every example spec, less its run time and version, is kept in
 * fixtures/golden and compared to the letter, so a change that moves any number — a refactoring, a new
 * default, a different summation order — is seen and has to be accepted on purpose.
 *
 * <p>To accept a deliberate change: {@code mvn -B -q test -pl models -Dtest=GoldenResultsTest
 * -Dcairn.golden.update=true}, then review the diff of fixtures/golden before committing it.
 */
class GoldenResultsTest {
    static final Path GOLDEN = Path.of("..", "fixtures", "golden");
    private static final ObjectMapper MAPPER = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    @TempDir
    Path dir;

    /** A result as kept: run.seconds and run.version removed, the only fields that change between identical runs. */
    static String kept(FitOutcome outcome) throws IOException {
        ObjectNode tree = (ObjectNode) MAPPER.readTree(ResultWriter.json(outcome.result()));
        ObjectNode run = (ObjectNode) tree.get("run");
        run.remove("seconds");
        run.remove("version");
        return MAPPER.writeValueAsString(tree) + "\n";
    }

    @Test
    void everyExampleResultIsTheKeptOne() throws IOException {
        boolean update = Boolean.getBoolean("cairn.golden.update");
        List<String> differ = new ArrayList<>();
        List<Demo.Example> fitted = Demo.run(dir, FitOptions.DEFAULT, f -> { });
        assertEquals(Demo.examples().size(), fitted.size());
        for (Demo.Example f : fitted) {
            String name = f.spec().replace(".json", ".result.json");
            Path golden = GOLDEN.resolve(name);
            String now = kept(f.outcome());
            if (update) {
                Files.createDirectories(GOLDEN);
                Files.writeString(golden, now, StandardCharsets.UTF_8);
                continue;
            }
            assertTrue(Files.exists(golden), golden + " is missing; run with -Dcairn.golden.update=true to create it");
            String kept = Files.readString(golden, StandardCharsets.UTF_8);
            if (!kept.equals(now)) {
                differ.add(name + " (first difference at character " + firstDifference(kept, now) + ")");
            }
        }
        assertTrue(differ.isEmpty(), "results differ from fixtures/golden: " + differ
                + "; if the change is deliberate, accept it with -Dcairn.golden.update=true and review the diff");
    }

    private static int firstDifference(String a, String b) {
        int i = 0;
        while (i < a.length() && i < b.length() && a.charAt(i) == b.charAt(i)) {
            i++;
        }
        return i;
    }
}
