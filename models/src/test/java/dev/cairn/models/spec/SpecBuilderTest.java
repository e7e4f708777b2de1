package dev.cairn.models.spec;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.InputException;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/** A spec built in code is the spec the same JSON in a file gives, and it is refused with the same message. */
class SpecBuilderTest {
    private static final String JSON = """
            {"model": "spend", "currency": "EUR", "control": "A",
             "data": {"layout": "summary", "rows": [
               {"arm": "A", "users": 1000, "payers": 30, "log_spend_sum": 60.5, "log_spend_sq_sum": 160.2},
               {"arm": "B", "users": 1000, "payers": 40, "log_spend_sum": 82.0, "log_spend_sq_sum": 215.0}]},
             "sampler": {"chains": 2, "draws": 500, "seed": 7}}
            """;

    private static SpecBuilder twoArms() {
        return Spec.builder("spend").currency("EUR").control("A")
                .summaryRow("A", 1000, 30, 60.5, 160.2)
                .summaryRow("B", 1000, 40, 82.0, 215.0)
                .sampler(2, 500, 7);
    }

    @Test
    void theBuiltSpecIsTheOneTheJsonGives() {
        Spec built = twoArms().build();
        Spec read = SpecReader.parse(JSON, "file");
        assertEquals(read, built);
        assertTrue(Cairn.fit(built, Path.of("."), FitOptions.DEFAULT).result().converged());
    }

    @Test
    void badValuesAreRefusedWithTheMessagesOfTheJsonPath() {
        String fromJson = message(() -> SpecReader.parse(JSON.replace("\"chains\": 2", "\"chains\": 0"), "file"));
        String fromCode = message(() -> twoArms().set("/sampler/chains", 0).build());
        assertEquals(fromJson.replaceFirst("^file: ", ""), fromCode.replaceFirst("^" + SpecBuilder.ORIGIN + ": ", ""));
        assertTrue(fromCode.contains("/sampler/chains"), fromCode);
        String typo = message(() -> twoArms().set("/data/layuot", "summary").build());
        assertTrue(typo.contains("layuot") && typo.contains("layout"), typo);
        String noModel = message(() -> SpecBuilder.of(null).summaryRow("A", 10, 1, 0.5, 0.3).build());
        assertTrue(noModel.startsWith(SpecBuilder.ORIGIN + ": ") && noModel.contains("model"), noModel);
        assertEquals(1, noModel.lines().count());
    }

    @Test
    void perUserAndCohortRowsAreTheJsonRows() {
        Spec users = Spec.builder("spend").users("A", 0, 4.99, 0).users("B", 0, 0, 9.99).build();
        Spec usersJson = SpecReader.parse("""
                {"model": "spend", "data": {"layout": "users", "rows": [
                  {"arm": "A", "spend": 0.0}, {"arm": "A", "spend": 4.99}, {"arm": "A", "spend": 0.0},
                  {"arm": "B", "spend": 0.0}, {"arm": "B", "spend": 0.0}, {"arm": "B", "spend": 9.99}]}}
                """, "file");
        assertEquals(usersJson, users);
        Spec cohorts = Spec.builder("retention").set("/curve", "activity").cohortRow("2026-03-02", "A", 1, 500, 210)
                .cohortRow("2026-03-02", null, 7, 500, 120).build();
        Spec cohortsJson = SpecReader.parse("""
                {"model": "retention", "curve": "activity", "data": {"layout": "cohort-days", "rows": [
                  {"cohort": "2026-03-02", "arm": "A", "day": 1, "installs": 500, "active": 210},
                  {"cohort": "2026-03-02", "day": 7, "installs": 500, "active": 120}]}}
                """, "file");
        assertEquals(cohortsJson, cohorts);
    }

    private static String message(Runnable r) {
        return assertThrows(InputException.class, r::run).getMessage();
    }
}
