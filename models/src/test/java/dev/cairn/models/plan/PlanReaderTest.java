package dev.cairn.models.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.InputException;
import dev.cairn.models.result.Metric;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Plan specs: defaults, and one clear line naming the field for each kind of mistake. */
class PlanReaderTest {
    private static final String GOOD = """
        {"arms": {"A": {}, "B": {"arppuLift": 0.03}}, "control": "A", "usersPerDay": 1000,
         "baseline": {"payerRate": 0.03, "logSpendMean": 1.0, "logSpendSd": 1.2}}
        """;

    private static String message(String json) {
        return assertThrows(InputException.class, () -> PlanReader.parse(json, "plan.json", Path.of("."))).getMessage();
    }

    @Test
    void defaults() {
        PlanSpec p = PlanReader.parse(GOOD, "plan.json", Path.of("."));
        assertEquals(Metric.ARPU, p.metric());
        assertEquals(LookRule.Kind.EXPECTED_LOSS, p.rule());
        assertEquals(null, p.tolerance());
        assertEquals(7, p.minDays());
        assertEquals(28, p.maxDays());
        assertEquals(22, p.lookDays().length);
        assertEquals(10_000, p.experiments());
        assertTrue(p.approximate());
        assertEquals(4000, p.draws());
        assertEquals(false, p.uncertain());
        PlanSpec conversion = PlanReader.parse("""
            {"arms": {"A": {}, "B": {"payerRateLift": 0.1}}, "control": "A", "usersPerDay": 1000,
             "baseline": {"payerRate": 0.2}, "schedule": {"maxDays": 3}}
            """, "plan.json", Path.of("."));
        assertEquals(Metric.PAYER_RATE, conversion.metric());
        assertEquals(3, conversion.minDays(), "minDays defaults to maxDays when that is shorter than a week");
    }

    @Test
    void mistakesAreNamed() {
        assertEquals("plan.json: /control: 'Z' is not one of the arms [A, B]", message(GOOD.replace("\"control\": \"A\"", "\"control\": \"Z\"")));
        assertTrue(message(GOOD.replace("usersPerDay", "usersPerDya")).contains("unknown key 'usersPerDya' (did you mean 'usersPerDay'?)"));
        assertEquals("plan.json: /usersPerDay: no number for arm 'B' (give every arm, or one number for all)",
                message(GOOD.replace("\"usersPerDay\": 1000", "\"usersPerDay\": {\"A\": 1000}")));
        assertTrue(message(GOOD.replace("\"payerRate\": 0.03, ", "")).startsWith("plan.json: /baseline/payerRate: required"));
        assertTrue(message(GOOD.replace("\"baseline\": {", "\"baseline\": {\"priors\": {\"payerRate\": {\"family\": \"beta\", \"a\": 3, \"b\": 97}}, "))
                .contains("/baseline: give exactly one of"));
        assertEquals("plan.json: /decision/metric: 'arpu' needs spend in the baseline (logSpendMean and logSpendSd, "
                + "priors.logSpend, or a result with spend); this baseline has a payer rate only",
                message(GOOD.replace(", \"logSpendMean\": 1.0, \"logSpendSd\": 1.2", "").replace("{\"arppuLift\": 0.03}", "{}")
                        .replace("\"usersPerDay\"", "\"decision\": {\"metric\": \"arpu\"}, \"usersPerDay\"")));
        assertEquals("plan.json: /arms/B/arppuLift: the baseline has no spend to change",
                message(GOOD.replace(", \"logSpendMean\": 1.0, \"logSpendSd\": 1.2", "")));
        assertTrue(message(GOOD.replace("\"usersPerDay\"", "\"decision\": {\"rule\": \"prob-above\", \"tolerance\": 0.01}, \"usersPerDay\""))
                .startsWith("plan.json: /decision/tolerance: applies to rule 'expected-loss'"));
        assertEquals("plan.json: /schedule/minDays: 10 is after maxDays 5",
                message(GOOD.replace("\"usersPerDay\"", "\"schedule\": {\"minDays\": 10, \"maxDays\": 5}, \"usersPerDay\"")));
        assertEquals("plan.json: /arms/B/payerRateLift: takes the payer rate 0.6 above 1",
                message(GOOD.replace("0.03,", "0.6,").replace("{\"arppuLift\": 0.03}", "{\"payerRateLift\": 0.8}")));
        assertTrue(message(GOOD.replace("0.03}", "{\"family\": \"uniform\", \"lower\": 0.1, \"upper\": 0.05}}"))
                .contains("/arms/B/arppuLift/upper: 0.05 must be above lower 0.1"));
        assertTrue(message(GOOD.replace("\"usersPerDay\"", "\"currency\": \"XYZ\", \"usersPerDay\""))
                .contains("/currency: 'XYZ' is not an ISO 4217 currency code"));
        assertTrue(message(GOOD.replace("\"usersPerDay\"", "\"simulation\": {\"experiments\": 1000000}, \"schedule\": {\"minDays\": 1, \"maxDays\": 365}, \"usersPerDay\""))
                .contains("/simulation/experiments: 1,000,000 tests x 366 looks is more than"));
        assertTrue(message("{").startsWith("plan.json: not valid JSON at line 1"));
    }

    @Test
    void baselineFromHistoryAndFromAMissingResult(@TempDir Path dir) throws Exception {
        Files.writeString(dir.resolve("history.csv"), """
            users,payers,log_spend_sum,log_spend_sq_sum
            10000,310,320.5,890.1
            12000,350,371.0,1003.2
            9000,260,262.2,720.9
            """);
        String history = GOOD.replace("\"payerRate\": 0.03, \"logSpendMean\": 1.0, \"logSpendSd\": 1.2",
                "\"fromHistory\": {\"path\": \"history.csv\"}");
        PlanSpec p = PlanReader.parse(history, "plan.json", dir);
        assertEquals("history", p.baseline().source());
        assertTrue(p.uncertain());
        String result = GOOD.replace("\"payerRate\": 0.03, \"logSpendMean\": 1.0, \"logSpendSd\": 1.2",
                "\"fromResult\": {\"path\": \"old/result.json\"}");
        assertThrows(InputException.class, () -> PlanReader.parse(result, "plan.json", dir), "no such file");
        Files.createDirectories(dir.resolve("old"));
        Files.writeString(dir.resolve("old/result.json"), "{\"model\": \"retention\", \"converged\": true}");
        String m = assertThrows(InputException.class, () -> PlanReader.parse(result, "plan.json", dir)).getMessage();
        assertTrue(m.contains("is not a result of model 'spend'"), m);
    }
}
