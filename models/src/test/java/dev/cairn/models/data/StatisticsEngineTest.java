package dev.cairn.models.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.cairn.models.InputException;
import dev.cairn.models.spec.DataSpec;
import java.util.List;
import org.junit.jupiter.api.Test;

/** What the models do with rows another engine read: numeric columns cast, text left alone, messages named. */
class StatisticsEngineTest {
    @Test
    void numericColumnsAreCastAndTextIsLeftAsWritten() throws Exception {
        JsonNode row = new ObjectMapper().readTree("{\"arm\": \"007\", \"users\": \" 120 \", \"payers\": \"\", \"se\": \"x\"}");
        JsonNode typed = StatisticsEngine.typed(List.of(row), c -> c.equals("arm") ? "VARCHAR" : "DOUBLE").get(0);
        assertEquals("007", typed.get("arm").asText(), "an arm that looks like a number keeps its text");
        assertEquals(120.0, typed.get("users").doubleValue());
        assertTrue(typed.get("payers").isNull(), "a blank number is missing, as the engine reads it");
        assertTrue(typed.get("se").isTextual(), "text that is no number stays, for the reader to refuse");
    }

    @Test
    void messagesNameTheFileAndLineOrTheTable() {
        DataSpec csv = new DataSpec("s.csv", "summary", null, null, null, null, null, "spark", null);
        InputException e = assertThrows(InputException.class, () -> StatisticsEngine.fromRows(csv, () -> {
            throw new InputException("spec: /data/rows/1, /data/rows/4 and 2 more, 'payers': must be <= users");
        }));
        assertEquals("s.csv: lines 3, 6 and 2 more, column 'payers': must be <= users", e.getMessage());
        DataSpec table = new DataSpec(null, "summary", null, null, null, null, null, "spark", "db.t");
        e = assertThrows(InputException.class, () -> StatisticsEngine.fromRows(table, () -> {
            throw new InputException("spec: /data/rows/1, 'payers': must be <= users");
        }));
        assertEquals("table db.t (read by spark): row 1, 'payers': must be <= users", e.getMessage());
    }
}
