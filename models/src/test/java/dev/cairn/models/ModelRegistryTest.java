package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.cairn.models.spec.SpecReader;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;

/** The registry and the schema agree, and the rules that the model contract makes generic hold for every model. */
class ModelRegistryTest {
    private static JsonNode schema() throws Exception {
        try (var in = Cairn.class.getResourceAsStream("spec.schema.json")) {
            return new ObjectMapper().readTree(in);
        }
    }

    @Test
    void everyRegisteredModelIsInTheSchemaWithItsLayoutsAndKeys() throws Exception {
        JsonNode s = schema();
        Set<String> names = new HashSet<>();
        s.path("properties").path("model").path("enum").forEach(n -> names.add(n.asText()));
        Set<String> layouts = new HashSet<>();
        s.path("$defs").path("data").path("properties").path("layout").path("enum").forEach(n -> layouts.add(n.asText()));
        List<String> registered = new ArrayList<>();
        for (Model m : Cairn.models()) {
            registered.add(m.name());
            assertTrue(layouts.containsAll(m.layouts()), m.name() + " reads " + m.layouts() + ", schema has " + layouts);
            for (String key : m.ownKeys()) {
                assertTrue(s.path("properties").has(key), m.name() + "'s option '" + key + "' is not in the schema");
            }
        }
        assertEquals(names, new HashSet<>(registered), "schema model enum vs registry");
    }

    @Test
    void anotherModelsOptionOrLayoutIsRefusedNamingTheOwner() {
        for (Model m : Cairn.models()) {
            for (Model other : Cairn.models()) {
                for (String key : other.ownKeys()) {
                    if (other == m || m.ownKeys().contains(key)) {
                        continue;
                    }
                    String value = key.equals("days") ? "[1, 7]" : key.equals("ltv") ? "{\"horizon\": 30, \"revenuePerActiveDay\": 0.2}"
                            : key.equals("curve") ? "\"activity\"" : "\"centred\"";
                    String spec = "{\"model\": \"" + m.name() + "\", \"data\": {\"path\": \"x.csv\", \"layout\": \""
                            + m.layouts().get(0) + "\"}, \"" + key + "\": " + value
                            + (m.name().equals("retention") ? ", \"curve\": \"activity\"" : "") + "}";
                    InputException e = assertThrows(InputException.class, () -> SpecReader.parse(spec, "s.json"), spec);
                    assertEquals("s.json: /" + key + ": applies to model '" + other.name() + "' only", e.getMessage());
                }
            }
        }
    }

    @Test
    void aLayoutTheModelDoesNotReadIsRefusedWithTheOnesItReads() {
        InputException e = assertThrows(InputException.class, () -> SpecReader.parse(
                "{\"model\": \"spend\", \"data\": {\"path\": \"x.csv\", \"layout\": \"cohort-days\"}}", "s.json"));
        assertEquals("s.json: /data/layout: model 'spend' takes layout 'users' or 'summary', not 'cohort-days'", e.getMessage());
        e = assertThrows(InputException.class, () -> Cairn.model("churn"));
        assertTrue(e.getMessage().startsWith("/model: unknown model 'churn'; known: spend, "), e.getMessage());
    }
}
