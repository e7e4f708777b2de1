package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.IOException;
import java.io.StringReader;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class DrawsFileTest {
    @TempDir
    Path spill;

    private static Draws random(int chains, int k, int n) {
        SplittableRandom r = new SplittableRandom(3);
        List<String> names = new ArrayList<>();
        for (int j = 0; j < k; j++) {
            names.add("p" + j);
        }
        double[][][] v = new double[chains][k][n];
        for (double[][] chain : v) {
            for (double[] column : chain) {
                for (int t = 0; t < n; t++) {
                    column[t] = r.nextGaussian() * Math.pow(10, r.nextInt(-300, 300));
                }
            }
        }
        return Draws.of(names, v);
    }

    /** Whatever the block size, every column comes back whole, in order, to the last bit. */
    @Test
    void blocksHandOutEveryColumnExactly() throws IOException {
        Draws d = random(3, 7, 41);
        StringWriter w = new StringWriter();
        DrawsCsv.write(d, w);
        try (DrawsFile f = DrawsFile.read(new StringReader(w.toString()), spill)) {
            assertEquals(d.names(), f.names());
            assertEquals(3, f.chains());
            assertEquals(41, f.draws());
            assertEquals(8L * 3 * 41, f.bytesPerColumn());
            for (int perBlock : new int[] {1, 2, 3, 7, 100}) {
                List<String> seen = new ArrayList<>();
                f.columns(perBlock, (names, columns) -> {
                    assertEquals(Math.min(perBlock, 7 - seen.size()), names.size());
                    for (int j = 0; j < names.size(); j++) {
                        double[][] expected = d.column(names.get(j));
                        for (int c = 0; c < 3; c++) {
                            assertArrayEquals(expected[c], columns.get(j)[c], 0.0);
                        }
                    }
                    seen.addAll(names);
                });
                assertEquals(d.names(), seen);
            }
        }
        try (var left = Files.list(spill)) {
            assertEquals(0, left.count(), "the spill file is deleted on close");
        }
    }

    @Test
    void malformedTextLeavesNoSpillFile() throws IOException {
        assertThrows(DrawsCsv.FormatException.class,
                () -> DrawsFile.read(new StringReader("chain,iteration,x\n1,1,0.5\n1,2,word\n"), spill));
        try (var left = Files.list(spill)) {
            assertEquals(0, left.count());
        }
    }
}
