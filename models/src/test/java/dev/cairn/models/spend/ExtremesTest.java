package dev.cairn.models.spend;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.ResultWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Valid data at the extremes never ends in an internal error or a non-finite number: arms with 0 payers,
 * 1 payer, all payers, spend from 1e-6 to 1e9 and the floating-point extremes, under every sampler and both
 * prior families. Each case either fits with every number in result.json finite, or is refused with one line
 * (InputException) — a swept property, seeded plain loops.
 */
public class ExtremesTest {
    @TempDir
    Path dir;

    private static final String[] SAMPLERS = {"auto", "exact", "slice", "metropolis-within-gibbs"};
    private static final String CONJUGATE = "";
    private static final String NON_CONJUGATE = ", \"priors\": {\"logSpendMean\": {\"family\": \"normal\", \"mean\": 0, "
            + "\"sd\": 5}, \"logSpendSd\": {\"family\": \"half-normal\", \"sd\": 2}}";
    private static final String TIGHT_CONJUGATE = ", \"priors\": {\"logSpend\": {\"family\": \"normal-inverse-gamma\", \"mu0\": 1, \"kappa0\": 1, \"alpha0\": 3, "
            + "\"beta0\": 3}}";

    /** Per user, the spends of one arm: {users, payers, spend of each payer}. */
    private static String users(long seed, int users, int payers, double spend) {
        StringBuilder sb = new StringBuilder();
        java.util.Random r = new java.util.Random(seed);
        for (int i = 0; i < users; i++) {
            double v = i < payers ? spend * Math.exp(0.5 * r.nextGaussian()) : 0;
            sb.append(String.format(Locale.ROOT, "%s,%s%n", "ARM", Double.toString(v)));
        }
        return sb.toString();
    }

    @Test
    void extremeButValidDataFitOrAreRefusedInOneLine() throws Exception {
        int[][] payerCases = {{1000, 0}, {1000, 1}, {200, 200}, {50, 2}};
        double[] spends = {1e-6, 1, 1e9, 1e300, Double.MIN_VALUE};
        List<String> problems = new ArrayList<>();
        int fitted = 0, refused = 0, k = 0;
        for (int[] pc : payerCases) {
            for (double spend : spends) {
                String data = "arm,spend\n" + users(k, pc[0], pc[1], spend).replace("ARM", "A")
                        + users(k + 1, 2000, 60, 3).replace("ARM", "B");
                Path csv = dir.resolve("u" + k + ".csv");
                Files.writeString(csv, data);
                for (String priors : new String[] {CONJUGATE, NON_CONJUGATE, TIGHT_CONJUGATE}) {
                    for (String method : SAMPLERS) {
                        if (method.equals("exact") && priors.equals(NON_CONJUGATE)) {
                            continue;
                        }
                        String name = csv.getFileName() + " A=" + pc[1] + "/" + pc[0] + " spend " + spend + " " + method
                                + (priors.isEmpty() ? " default priors" : priors.contains("half") ? " non-conjugate" : " tight");
                        Path spec = dir.resolve("s" + k + ".json");
                        Files.writeString(spec, "{\"model\": \"spend\", \"data\": {\"path\": \"" + csv.getFileName()
                                + "\", \"layout\": \"users\"}, \"sampler\": {\"method\": \"" + method
                                + "\", \"warmup\": 200, \"draws\": 200, \"seed\": " + (k + 1) + "}" + priors + "}");
                        String outcome = fitOrRefuse(spec);
                        if (outcome.equals(FITTED)) {
                            fitted++;
                        } else if (outcome.equals(REFUSED)) {
                            refused++;
                        } else {
                            problems.add(name + ": " + outcome);
                        }
                    }
                }
                k++;
            }
        }
        if (!problems.isEmpty()) {
            fail(problems.size() + " cases failed:\n" + String.join("\n", problems));
        }
        assertTrue(fitted > refused, "most extreme cases fit: " + fitted + " fitted, " + refused + " refused");
    }

    public static final String FITTED = "fitted", REFUSED = "refused";

    /**
     * Fits a spec and says how it ended: {@link #FITTED} with every number in result.json finite,
     * {@link #REFUSED} in one line, or else what went wrong (a non-finite number, a message of several lines,
     * any other exception).
     */
    public static String fitOrRefuse(Path spec) throws java.io.IOException {
        try {
            FitOutcome o = Cairn.fit(spec, FitOptions.DEFAULT);
            String bad = nonFinite(new ObjectMapper().readTree(ResultWriter.json(o.result())), "");
            return bad == null ? FITTED : "non-finite " + bad;
        } catch (InputException e) {
            return e.getMessage().contains("\n") ? "message of several lines" : REFUSED;
        } catch (RuntimeException e) {
            return e.toString();
        }
    }

    /** The first path in the JSON tree holding a non-finite number (or its string form), or null. */
    public static String nonFinite(JsonNode n, String path) {
        if (n.isNumber() && !Double.isFinite(n.doubleValue())) {
            return path;
        }
        if (n.isTextual() && (n.asText().equals("NaN") || n.asText().endsWith("Infinity"))) {
            return path;
        }
        if (n.isContainerNode()) {
            var it = n.fields();
            if (n.isArray()) {
                for (int i = 0; i < n.size(); i++) {
                    String b = nonFinite(n.get(i), path + "/" + i);
                    if (b != null) {
                        return b;
                    }
                }
            }
            while (it.hasNext()) {
                var e = it.next();
                String b = nonFinite(e.getValue(), path + "/" + e.getKey());
                if (b != null) {
                    return b;
                }
            }
        }
        return null;
    }
}
