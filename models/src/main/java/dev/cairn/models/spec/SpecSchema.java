package dev.cairn.models.spec;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;

/** The JSON Schema (draft 2020-12) of spec v1, as shipped in the jar and printed by {@code cairn schema}. */
public final class SpecSchema {
    private static final String RESOURCE = "/dev/cairn/models/spec.schema.json";

    private SpecSchema() {
    }

    /**
     * {@return the spec's JSON schema (draft 2020-12), as bundled in the jar}
     */
    public static String text() {
        return resourceText(RESOURCE);
    }

    /**
     * A schema bundled in the jar, as text.
     *
     * @param resource the resource's absolute name
     * @return its text (UTF-8)
     * @throws IllegalStateException when the jar lacks it
     */
    public static String resourceText(String resource) {
        try (InputStream in = SpecSchema.class.getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("schema resource missing from the jar: " + resource);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static JsonNode tree() {
        try {
            return new ObjectMapper().readTree(text());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * The keys the schema allows at a JSON pointer of a spec ("" for the top level), following
     * {@code properties} and {@code $ref}; empty when the location is not an object with known keys.
     */
    static List<String> keysAt(JsonNode schema, String pointer) {
        JsonNode node = resolve(schema, schema);
        if (!pointer.isEmpty()) {
            for (String part : pointer.substring(1).split("/")) {
                JsonNode props = node.path("properties");
                if (props.has(part)) {
                    node = resolve(schema, props.get(part));
                } else if (node.has("items")) {
                    node = resolve(schema, node.get("items"));
                } else {
                    return List.of();
                }
            }
        }
        List<String> keys = new ArrayList<>();
        for (Iterator<String> it = node.path("properties").fieldNames(); it.hasNext(); ) {
            keys.add(it.next());
        }
        return keys;
    }

    private static JsonNode resolve(JsonNode schema, JsonNode node) {
        while (node.has("$ref")) {
            String ref = node.get("$ref").asText();
            node = schema.at(ref.substring(1));
        }
        return node;
    }
}
