package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringReader;
import java.io.StringWriter;
import java.util.List;
import org.junit.jupiter.api.Test;

class DrawsCsvTest {

    @Test
    void writeThenReadGivesTheSameDoubles() {
        Draws d = ChainRunner.of(RunSettings.of(3, 20, 25, 6)).run(
                Target.of(Parameters.real("a", "b"), x -> -0.5 * (x[0] * x[0] + x[1] * x[1])),
                Sweep.of(SliceStep.of(1)), Initializer.uniform(2)).withDerived("sum", x -> x[0] + x[1]);
        StringWriter w = new StringWriter();
        DrawsCsv.write(d, w);
        String text = w.toString();
        assertTrue(text.startsWith("chain,iteration,a,b,sum\n1,1,"), text.substring(0, 40));
        assertEquals(d, DrawsCsv.read(new StringReader(text)));
    }

    @Test
    void contractLayoutIsOneBased() {
        Draws d = Draws.of(List.of("x"), new double[][][] {{{0.5, 1.5}}, {{2.5, 3.5}}});
        StringWriter w = new StringWriter();
        DrawsCsv.write(d, w);
        assertEquals("chain,iteration,x\n1,1,0.5\n1,2,1.5\n2,1,2.5\n2,2,3.5\n", w.toString());
    }

    private static String failure(String text) {
        return assertThrows(DrawsCsv.FormatException.class, () -> DrawsCsv.read(new StringReader(text))).getMessage();
    }

    @Test
    void malformedTextNamesTheLineAndColumn() {
        assertTrue(failure("").contains("empty file"));
        assertTrue(failure("iteration,chain,x\n").contains("first column must be 'chain'"));
        assertTrue(failure("chain,iteration\n1,1\n").contains("no parameter columns"));
        assertTrue(failure("chain,iteration,x\n").contains("no draws"));
        String ragged = failure("chain,iteration,x,y\n1,1,0.1,0.2\n1,2,0.3\n");
        assertTrue(ragged.contains("line 3") && ragged.contains("expected 4 cells, found 3"), ragged);
        String word = failure("chain,iteration,x\n1,1,0.1\n1,2,abc\n");
        assertTrue(word.contains("line 3") && word.contains("'x'") && word.contains("abc"), word);
        String unequal = failure("chain,iteration,x\n1,1,0.1\n1,2,0.2\n2,1,0.3\n");
        assertTrue(unequal.contains("unequal lengths"), unequal);
        String split = failure("chain,iteration,x\n1,1,0.1\n2,1,0.2\n1,2,0.3\n2,2,0.1\n");
        assertTrue(split.contains("line 4") && split.contains("not contiguous"), split);
        assertTrue(failure("chain,iteration,x,x\n1,1,0,0\n").contains("'x' appears twice"));
    }

    /** RFC 4180: names with a comma, a quote or a line break are quoted and read back as written. */
    @Test
    void anyNameSurvivesTheRoundTrip() {
        List<String> names = List.of("plain", "A, north", "say \"hi\"", "two\nlines", " padded ", "\u001b[31m");
        double[][][] values = new double[2][names.size()][3];
        for (int c = 0; c < 2; c++) {
            for (int j = 0; j < names.size(); j++) {
                for (int t = 0; t < 3; t++) {
                    values[c][j][t] = c + 0.1 * j + 0.01 * t;
                }
            }
        }
        Draws d = Draws.of(names, values);
        StringWriter w = new StringWriter();
        DrawsCsv.write(d, w);
        assertTrue(w.toString().startsWith("chain,iteration,plain,\"A, north\",\"say \"\"hi\"\"\",\"two\nlines\","),
                w.toString());
        assertEquals(d, DrawsCsv.read(new StringReader(w.toString())));
        assertEquals(d, DrawsCsv.read(new StringReader("\uFEFF" + w)), "a UTF-8 byte order mark is skipped");
        assertEquals(d, DrawsCsv.read(new StringReader(w.toString().replace("\n1,", "\r\n1,"))), "CRLF line ends");
    }

    @Test
    void unclosedQuoteIsAFormatError() {
        String m = failure("chain,iteration,\"x\n1,1,0.5\n");
        assertTrue(m.contains("not valid CSV"), m);
    }
}
