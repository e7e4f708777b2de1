package dev.cairn.models.segmented;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import dev.cairn.models.spend.ExtremesTest;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Valid extremes through every segmented-spend sampler: a segment whose one cell has no payers, a single
 * payer, every user paying, payers who all spent the same amount (no spread at all), and spend per payer
 * from 1e-6 to 1e9, beside ordinary segments. Each fit must end with every number in result.json finite,
 * or be refused in one line (never an internal error).
 */
class SegmentedExtremesTest {
    @TempDir
    Path dir;

    /** One summary row: m payers of spend exp(logMean) each, with the given sd of log spend (0: identical). */
    private static String row(String segment, String arm, long users, long payers, double logMean, double sd) {
        double sum = payers * logMean;
        double squares = payers * (logMean * logMean + sd * sd);
        return String.format(Locale.ROOT, "%s,%s,%d,%d,%s,%s%n", segment, arm, users, payers,
                Double.toString(sum), Double.toString(squares));
    }

    @Test
    void extremeCellsFitOrAreRefusedInOneLine() throws Exception {
        long[][] cells = {{1000, 0}, {1000, 1}, {300, 300}, {40, 2}};
        double[] logMeans = {Math.log(1e-6), 0, Math.log(1e9)};
        double[] sds = {0, 1};
        List<String> problems = new ArrayList<>();
        int fitted = 0, k = 0;
        for (long[] cell : cells) {
            for (double logMean : logMeans) {
                for (double sd : sds) {
                    StringBuilder sb = new StringBuilder("segment,arm,users,payers,log_spend_sum,log_spend_sq_sum\n");
                    sb.append(row("odd", "A", cell[0], cell[1], logMean, sd));
                    sb.append(row("odd", "B", 2000, 60, 1.2, 1));
                    for (int j = 0; j < 5; j++) {
                        sb.append(row("s" + j, "A", 3000, 90, 1.2, 1));
                        sb.append(row("s" + j, "B", 3000, 95, 1.25, 1));
                    }
                    Path csv = dir.resolve("c" + k + ".csv");
                    Files.writeString(csv, sb.toString());
                    for (String method : new String[] {"segment-gibbs", "nuts"}) {
                        Path spec = dir.resolve("s" + k + method + ".json");
                        Files.writeString(spec, "{\"model\": \"segmented-spend\", \"data\": {\"path\": \"" + csv.getFileName()
                                + "\", \"layout\": \"summary\"}, \"control\": \"A\", \"sampler\": {\"method\": \"" + method
                                + "\", \"warmup\": 150, \"draws\": 150, \"seed\": " + (k + 1) + "}}");
                        String outcome = ExtremesTest.fitOrRefuse(spec);
                        if (outcome.equals(ExtremesTest.FITTED)) {
                            fitted++;
                        } else if (!outcome.equals(ExtremesTest.REFUSED)) {
                            problems.add(method + ", odd/A " + cell[1] + " of " + cell[0] + " payers, log spend "
                                    + logMean + " sd " + sd + ": " + outcome);
                        }
                    }
                    k++;
                }
            }
        }
        if (!problems.isEmpty()) {
            fail(problems.size() + " cases failed:\n" + String.join("\n", problems));
        }
        assertTrue(fitted > k, "most extreme cases fit: " + fitted + " of " + 2 * k);
    }
}
