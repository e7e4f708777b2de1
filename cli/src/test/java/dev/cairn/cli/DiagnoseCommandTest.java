package dev.cairn.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class DiagnoseCommandTest {
    @TempDir
    Path dir;

    /** Writes m AR(1) chains of n draws per parameter; chain 'offsetChain' is shifted by 'offset'. */
    private Path draws(String name, int m, int n, double rho, int offsetChain, double offset) throws IOException {
        SplittableRandom random = new SplittableRandom(42);
        StringBuilder sb = new StringBuilder("chain,iteration,mu,sigma\n");
        for (int c = 0; c < m; c++) {
            double a = 0, b = 0;
            for (int t = 0; t < n; t++) {
                a = rho * a + random.nextGaussian();
                b = rho * b + random.nextGaussian();
                sb.append(c + 1).append(',').append(t + 1).append(',')
                        .append(a + (c == offsetChain ? offset : 0)).append(',').append(Math.exp(b)).append('\n');
            }
        }
        Path p = dir.resolve(name);
        Files.writeString(p, sb.toString());
        return p;
    }

    @Test
    void convergedDrawsExitZeroWithATable() throws IOException {
        String[] r = MainTest.run("diagnose", draws("ok.csv", 4, 1000, 0.3, -1, 0).toString());
        assertEquals("0", r[0], r[2]);
        assertTrue(r[1].contains("4 chains x 1000 draws, 2 parameters"), r[1]);
        assertTrue(r[1].contains("R-hat") && r[1].contains("bulk-ESS") && r[1].contains("tail-ESS"), r[1]);
        assertTrue(r[1].contains("Converged"), r[1]);
        assertEquals("", r[2]);
    }

    @Test
    void notConvergedExitsThreeAndSaysWhy() throws IOException {
        String[] r = MainTest.run("diagnose", draws("stuck.csv", 4, 500, 0.9, 2, 4.0).toString());
        assertEquals("3", r[0], r[2]);
        assertTrue(r[1].contains("NOT converged"), r[1]);
        assertTrue(r[1].contains("R-hat of mu"), r[1]);
    }

    @Test
    void jsonFollowsTheContract() throws IOException {
        String[] r = MainTest.run("diagnose", draws("ok.csv", 4, 1000, 0.3, -1, 0).toString(), "--json");
        assertEquals("0", r[0], r[2]);
        JsonNode json = new ObjectMapper().readTree(r[1]);
        assertEquals(2, json.get("parameters").size());
        JsonNode mu = json.get("parameters").get(0);
        assertEquals("mu", mu.get("name").asText());
        for (String key : new String[] {"mean", "sd", "rhat", "essBulk", "essTail", "mcseMean"}) {
            assertTrue(mu.get(key).isNumber(), key);
        }
        for (String key : new String[] {"maxRhat", "minEssBulk", "minEssTail"}) {
            assertTrue(json.get(key).isNumber(), key);
        }
        assertTrue(json.get("converged").asBoolean());
    }

    @Test
    void constantColumnIsNullInJsonNotNaN() throws IOException {
        Path p = dir.resolve("const.csv");
        StringBuilder sb = new StringBuilder("chain,iteration,k\n");
        for (int c = 1; c <= 2; c++) {
            for (int t = 1; t <= 50; t++) {
                sb.append(c).append(',').append(t).append(",3\n");
            }
        }
        Files.writeString(p, sb.toString());
        String[] r = MainTest.run("diagnose", p.toString(), "--json");
        JsonNode k = new ObjectMapper().readTree(r[1]).get("parameters").get(0);
        assertTrue(k.get("rhat").isNull());
        assertTrue(k.get("note").asText().startsWith("constant"));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
        "missing chain column  | iteration,mu\\n1,0.5\\n                      | first column must be 'chain'",
        "ragged row            | chain,iteration,mu,s\\n1,1,0.5,1\\n1,2,0.4\\n | line 3: expected 4 cells, found 3",
        "non-numeric cell      | chain,iteration,mu\\n1,1,0.5\\n1,2,abc\\n     | line 3: column 'mu' is not a number: 'abc'",
        "infinite cell         | chain,iteration,mu\\n1,1,Infinity\\n          | line 2: column 'mu' is not a finite number",
        "unequal chain lengths | chain,iteration,mu\\n1,1,0.5\\n1,2,0.1\\n2,1,0.3\\n | chains have unequal lengths",
        "header only           | chain,iteration,mu\\n                         | no draws after the header",
        "empty file            | ''                                            | empty file",
    })
    void malformedDrawsAreBadInputOnOneLine(String label, String content, String expected) throws IOException {
        Path p = dir.resolve("bad.csv");
        Files.writeString(p, content.replace("\\n", "\n"));
        String[] r = MainTest.run("diagnose", p.toString());
        assertEquals("2", r[0], label);
        assertEquals("", r[1], "nothing on stdout");
        assertEquals(1, r[2].strip().lines().count(), r[2]);
        assertTrue(r[2].contains("bad.csv") && r[2].contains(expected), r[2]);
        assertFalse(r[2].contains("Exception"), r[2]);
    }

    @Test
    void missingFileAndFolderAreBadInput() {
        String[] missing = MainTest.run("diagnose", dir.resolve("nope.csv").toString());
        assertEquals("2", missing[0]);
        assertTrue(missing[2].contains("no such file"), missing[2]);
        String[] folder = MainTest.run("diagnose", dir.toString());
        assertEquals("2", folder[0]);
        assertTrue(folder[2].contains("is a folder"), folder[2]);
    }

    @Test
    void thresholdsCanBeLoosenedAndAreValidated() throws IOException {
        Path p = draws("slow.csv", 4, 300, 0.95, -1, 0);
        assertEquals("3", MainTest.run("diagnose", p.toString())[0]);
        assertEquals("0", MainTest.run("diagnose", p.toString(), "--min-ess-per-chain", "1", "--max-rhat", "1.5")[0]);
        String[] bad = MainTest.run("diagnose", p.toString(), "--max-rhat", "0.9");
        assertEquals("2", bad[0]);
        assertTrue(bad[2].contains("maxRhat must be a finite number > 1, was 0.9"), bad[2]);
    }

    @Test
    void tableNumbersAreReadable() {
        assertEquals("1.235", Numbers.sig(1.23456, 4));
        assertEquals("0.001235", Numbers.sig(0.00123456, 4));
        assertEquals("-", Numbers.sig(Double.NaN, 3));
        assertEquals("12,346", Numbers.count(12345.6));
    }

    /** Diagnosed a few columns at a time, from the spill file, the report is the one of the whole file in memory. */
    @Test
    void streamedInBlocksGivesTheSameReportAsInMemory() throws IOException {
        Path file = draws("ok.csv", 4, 600, 0.5, 1, 0.3);
        dev.cairn.diagnostics.Thresholds t = new dev.cairn.diagnostics.Thresholds(1.01, 100);
        dev.cairn.samplers.Draws whole;
        try (var r = Files.newBufferedReader(file)) {
            whole = dev.cairn.samplers.DrawsCsv.read(r);
        }
        java.util.List<double[][]> columns = new java.util.ArrayList<>();
        whole.names().forEach(n -> columns.add(whole.column(n)));
        var inMemory = dev.cairn.diagnostics.Diagnostics.of(whole.names(), columns, t);
        long column = 8L * 4 * 600;
        for (long budget : new long[] {(DiagnoseCommand.WORKING_COPIES + 1) * column + 1, Long.MAX_VALUE / 4}) {
            DiagnoseCommand.Diagnosed d = DiagnoseCommand.diagnose(file, t, budget);
            assertEquals(inMemory, d.report(), "budget " + budget);
            assertEquals(4, d.chains());
            assertEquals(600, d.draws());
        }
        BadInput tooSmall = org.junit.jupiter.api.Assertions.assertThrows(BadInput.class,
                () -> DiagnoseCommand.diagnose(file, t, column));
        assertTrue(tooSmall.getMessage().contains("each parameter has 2400 draws")
                && tooSmall.getMessage().contains("CAIRN_JAVA_OPTS=-Xmx"), tooSmall.getMessage());
        try (var spills = Files.list(Path.of(System.getProperty("java.io.tmpdir")))) {
            assertTrue(spills.noneMatch(p -> p.getFileName().toString().startsWith("cairn-draws-")
                    && p.toFile().lastModified() >= System.currentTimeMillis() - 60_000),
                    "the spill file is deleted after use");
        }
    }

    /**
     * Names holding commas, quotes, line breaks and terminal control codes: cairn's own draws.csv is read
     * back by diagnose, and the terminal shows the control codes escaped.
     */
    @Test
    void readsEveryDrawsFileCairnWritesAndEscapesControlCodes() throws IOException {
        Files.writeString(dir.resolve("u.csv"), "arm,spend\n\"A, north\",0\n\"A, north\",3\n\"A, north\",1\n"
                + "\"B \"\"q\"\"\u001b[31m\u0007\",0\n\"B \"\"q\"\"\u001b[31m\u0007\",2\n"
                + "\"B \"\"q\"\"\u001b[31m\u0007\",5\n\"C\nnext\",1\n\"C\nnext\",0\n");
        Files.writeString(dir.resolve("s.json"), "{\"model\": \"spend\", \"data\": {\"path\": \"u.csv\", "
                + "\"layout\": \"users\"}, \"sampler\": {\"draws\": 300}}");
        String[] fit = MainTest.run("fit", dir.resolve("s.json").toString(), "--out", dir.resolve("o").toString());
        assertEquals("0", fit[0], fit[2]);
        assertFalse(fit[1].contains("\u001b") || fit[1].contains("\u0007"), "no raw control codes printed");
        assertTrue(fit[1].contains("B \"q\"\\x1b[31m\\x07"), fit[1]);
        String header = Files.readString(dir.resolve("o/draws.csv")).lines().findFirst().orElseThrow();
        assertTrue(header.startsWith("chain,iteration,\"payerRate[A, north]\",\"logSpendMean[A, north]\""), header);
        String[] r = MainTest.run("diagnose", dir.resolve("o/draws.csv").toString());
        assertEquals("0", r[0], r[2]);
        assertTrue(r[1].contains("payerRate[A, north]") && r[1].contains("payerRate[B \"q\"\\x1b[31m\\x07]"), r[1]);
        assertFalse(r[1].contains("\u001b") || r[1].contains("\u0007"), r[1]);
        assertTrue(r[1].contains("payerRate[C\nnext]"), "a line break in a name is quoted in the file, read back whole");
    }
}
