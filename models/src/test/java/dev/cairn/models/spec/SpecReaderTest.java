package dev.cairn.models.spec;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.cairn.models.InputException;
import org.junit.jupiter.api.Test;

class SpecReaderTest {
    private static final String SUMMARY = """
            {"model": "spend", "data": {"layout": "summary", "columns": %s,
             "rows": [{"arm": "A", "users": 10, "payers": 1, "s1": 0.5, "s2": 0.25},
                      {"arm": "B", "users": 10, "payers": 2, "s1": 1.0, "s2": 0.5}]}}""";

    /** Some editors start a UTF-8 file with a byte order mark; RFC 8259 lets a reader skip it. */
    @Test
    void aByteOrderMarkIsSkipped() {
        Spec spec = SpecReader.parse("\uFEFF" + SUMMARY.formatted("{}"), "spec.json");
        assertEquals("summary", spec.data().layout());
    }

    /** The README's column names and the logical names are the same mapping keys. */
    @Test
    void summaryMappingKeysHaveTwoSpellingsButOneMeaning() {
        DataSpec snake = SpecReader.parse(SUMMARY.formatted("{\"log_spend_sum\": \"s1\", \"log_spend_sq_sum\": \"s2\"}"),
                "spec.json").data();
        assertEquals("s1", snake.column("logSpendSum", "log_spend_sum"));
        assertEquals("s2", snake.column("logSpendSqSum", "log_spend_sq_sum"));
        InputException both = assertThrows(InputException.class, () -> SpecReader.parse(
                SUMMARY.formatted("{\"log_spend_sum\": \"s1\", \"logSpendSum\": \"s1\"}"), "spec.json"));
        assertEquals("spec.json: /data/columns: 'log_spend_sum' and 'logSpendSum' name the same column; give one",
                both.getMessage());
    }

    @Test
    void missingSpendBelongsToTheUsersLayout() {
        InputException e = assertThrows(InputException.class, () -> SpecReader.parse(
                SUMMARY.formatted("{}").replace("\"layout\": \"summary\",", "\"layout\": \"summary\", \"missingSpend\": \"zero\","),
                "spec.json"));
        assertEquals("spec.json: /data/missingSpend: applies to the 'users' layout only (a spend cell per user), "
                + "not 'summary'", e.getMessage());
        InputException word = assertThrows(InputException.class, () -> SpecReader.parse(
                "{\"model\": \"spend\", \"data\": {\"path\": \"u.csv\", \"layout\": \"users\", \"missingSpend\": \"0\"}}",
                "spec.json"));
        assertEquals(true, word.getMessage().startsWith("spec.json: /data/missingSpend: "), word.getMessage());
    }

    /** Inline rows past the limit are refused before the schema check, whose cost grows with them. */
    @Test
    void inlineRowsPastTheLimitAreRefused() {
        StringBuilder rows = new StringBuilder();
        for (int i = 0; i <= dev.cairn.models.Limits.INLINE_ROWS; i++) {
            rows.append(i == 0 ? "" : ",").append("{\"arm\":\"A\",\"spend\":0}");
        }
        InputException e = assertThrows(InputException.class, () -> SpecReader.parse(
                "{\"model\": \"spend\", \"data\": {\"layout\": \"users\", \"rows\": [" + rows + "]}}", "big.json"));
        assertEquals("big.json: /data/rows: 100,001 inline rows, more than 100,000; put the data in a CSV or Parquet "
                + "file (data.path)", e.getMessage());
    }

    @Test
    void aSpecFilePastTheLimitIsNotRead(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir) throws Exception {
        java.nio.file.Path spec = dir.resolve("huge.json");
        try (java.io.RandomAccessFile f = new java.io.RandomAccessFile(spec.toFile(), "rw")) {
            f.setLength(dev.cairn.models.Limits.SPEC_BYTES + 1); // sparse: no 64 MB written
        }
        InputException e = assertThrows(InputException.class, () -> SpecReader.read(spec));
        assertEquals(spec + ": 67,108,865 bytes, more than the 67,108,864 a spec may have; put the data in a CSV or "
                + "Parquet file (data.path)", e.getMessage());
    }
}
