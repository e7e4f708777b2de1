package dev.cairn.models.retention;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import dev.cairn.models.spend.ExtremesTest;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.IntBinaryOperator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The retention and pooled-effects models at the extremes of valid data: nobody retained, everybody
 * retained, cohorts of one install, cohorts of a billion; estimates with tiny and huge standard errors and
 * huge values; under every sampler the model takes. Each case fits (converged or not: exit 0 or 3) with
 * every number in result.json finite, or is refused in one line — never an internal error.
 */
class RetentionExtremesTest {
    @TempDir
    Path dir;

    /** The samplers both models take ("auto" is NUTS for retention, its own default for pooled-effects). */
    private static final String[] METHODS = {"auto", "slice", "metropolis-within-gibbs"};

    private final List<String> problems = new ArrayList<>();
    private int fitted;

    private void fit(String name, String spec) throws Exception {
        Path file = dir.resolve("s" + fitted + problems.size() + ".json");
        Files.writeString(file, spec);
        String outcome = ExtremesTest.fitOrRefuse(file);
        if (outcome.equals(ExtremesTest.FITTED)) {
            fitted++;
        } else if (!outcome.equals(ExtremesTest.REFUSED)) {
            problems.add(name + ": " + outcome);
        }
    }

    /** Rows of 3 cohorts x 2 arms x days 1..7: installs per cohort and active(installs, day). */
    private static String rows(int installs, IntBinaryOperator active) {
        StringBuilder sb = new StringBuilder();
        for (int c = 1; c <= 3; c++) {
            for (String arm : new String[] {"A", "B"}) {
                for (int d = 1; d <= 7; d++) {
                    sb.append(sb.length() == 0 ? "" : ",").append(String.format(
                            "{\"cohort\": \"c%d\", \"arm\": \"%s\", \"day\": %d, \"installs\": %d, \"active\": %d}",
                            c, arm, d, installs, active.applyAsInt(installs, d)));
                }
            }
        }
        return sb.toString();
    }

    @Test
    void retentionAtTheExtremesFitsOrIsRefusedInOneLine() throws Exception {
        Object[][] cases = {
            {"nobody retained", 1000, (IntBinaryOperator) (n, d) -> 0},
            {"everybody retained", 1000, (IntBinaryOperator) (n, d) -> n},
            {"one install", 1, (IntBinaryOperator) (n, d) -> d < 3 ? 1 : 0},
            {"a billion installs", 1_000_000_000, (IntBinaryOperator) (n, d) -> (int) (n * 0.4 * Math.pow(d, -0.3))},
        };
        for (Object[] c : cases) {
            for (String curve : new String[] {"activity", "survival"}) {
                for (String method : METHODS) {
                    fit(c[0] + ", " + curve + ", " + method, "{\"model\": \"retention\", \"curve\": \"" + curve
                            + "\", \"days\": [1, 7], \"data\": {\"layout\": \"cohort-days\", \"rows\": ["
                            + rows((int) c[1], (IntBinaryOperator) c[2]) + "]}, \"sampler\": {\"method\": \"" + method
                            + "\", \"warmup\": 300, \"draws\": 200, \"seed\": 5}}");
                }
            }
        }
        report(18);
    }

    @Test
    void pooledEffectsAtTheExtremesFitOrAreRefusedInOneLine() throws Exception {
        double[][] cases = {{0.1, 1e-12}, {0.1, 1e9}, {1e12, 1}, {1e300, 1}, {0.1, 1e-300}};
        for (double[] c : cases) {
            for (String method : METHODS) {
                fit("estimate " + c[0] + ", se " + c[1] + ", " + method, "{\"model\": \"pooled-effects\", \"data\": "
                        + "{\"layout\": \"estimates\", \"rows\": [{\"name\": \"a\", \"estimate\": " + c[0] + ", \"se\": "
                        + c[1] + "}, {\"name\": \"b\", \"estimate\": " + (-c[0]) + ", \"se\": " + c[1] + "}]}, "
                        + "\"sampler\": {\"method\": \"" + method + "\", \"draws\": 300, \"seed\": 5}}");
            }
        }
        report(9);
    }

    private void report(int mustFit) {
        if (!problems.isEmpty()) {
            fail(problems.size() + " cases failed:\n" + String.join("\n", problems));
        }
        assertTrue(fitted >= mustFit, "at least " + mustFit + " cases fit: " + fitted);
    }
}
