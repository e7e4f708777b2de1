package dev.cairn.models.spec;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.networknt.schema.JsonSchema;
import com.networknt.schema.JsonSchemaFactory;
import com.networknt.schema.PathType;
import com.networknt.schema.SchemaValidatorsConfig;
import com.networknt.schema.SpecVersion;
import com.networknt.schema.ValidationMessage;
import dev.cairn.models.InputException;
import dev.cairn.models.Limits;
import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Reads a spec: JSON syntax, then the JSON Schema (so unknown keys and wrong types are refused with the
 * JSON pointer of the offending value and, for an unknown key, the closest known one), then the rules a
 * schema cannot say. Every failure is an {@link InputException} with one line.
 */
public final class SpecReader {
    private static final ObjectMapper MAPPER = new ObjectMapper()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
            .enable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);
    private static final JsonNode SCHEMA_TREE = SpecSchema.tree();
    private static final JsonSchema SCHEMA = compile(SCHEMA_TREE);

    /** Most draws a fit may keep in all (chains x draws), so draws fit in memory. */
    public static final long MAX_KEPT_DRAWS = 1_000_000L;

    private SpecReader() {
    }

    /**
     * Reads and validates a spec file (UTF-8 JSON; a byte order mark is skipped).
     *
     * @param file the spec
     * @return the validated spec
     * @throws dev.cairn.models.InputException one line naming the file and the field
     */
    public static Spec read(Path file) {
        return parse(readText(file, "a spec JSON file"), file.toString());
    }

    /**
     * Reads a JSON spec file's text: UTF-8, at most {@link Limits#SPEC_BYTES}.
     *
     * @param file the file
     * @param what what the file should be, for the message when it is a folder
     * @return the text
     * @throws dev.cairn.models.InputException one line naming the file
     */
    public static String readText(Path file, String what) {
        String origin = file.toString();
        if (Files.isDirectory(file)) {
            throw new InputException(origin + ": is a folder, expected " + what);
        }
        try {
            if (Files.size(file) > Limits.SPEC_BYTES) {
                throw new InputException(String.format(Locale.ROOT, "%s: %,d bytes, more than the %,d a spec may have; "
                        + "put the data in a CSV or Parquet file (data.path)", origin, Files.size(file), Limits.SPEC_BYTES));
            }
            return StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(Files.readAllBytes(file))).toString();
        } catch (NoSuchFileException e) {
            throw new InputException(origin + ": no such file");
        } catch (CharacterCodingException e) {
            throw new InputException(origin + ": not UTF-8 text");
        } catch (IOException e) {
            throw new InputException(origin + ": cannot be read (" + e.getMessage() + ")");
        }
    }

    /**
     * Parses JSON text into a tree (a byte order mark is skipped; duplicate keys are refused).
     *
     * @param text   the text
     * @param origin its name, for messages
     * @return the tree
     * @throws dev.cairn.models.InputException naming the line and column of a syntax error
     */
    public static JsonNode tree(String text, String origin) {
        if (text.startsWith("\uFEFF")) { // a byte order mark some editors write; JSON readers may skip it (RFC 8259)
            text = text.substring(1);
        }
        JsonNode tree;
        try {
            tree = MAPPER.readTree(text);
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String where = at == null ? "" : " at line " + at.getLineNr() + ", column " + at.getColumnNr();
            throw new InputException(origin + ": not valid JSON" + where + ": " + e.getOriginalMessage());
        }
        if (tree == null || tree.isMissingNode()) {
            throw new InputException(origin + ": empty file, expected a JSON object");
        }
        return tree;
    }

    /**
     * Validates a tree against a JSON Schema (draft 2020-12) and throws the most useful error as one line:
     * an unknown key with the closest known one, a missing key, a wrong type, with the JSON pointer.
     *
     * @param schemaTree the schema
     * @param schema     the compiled schema
     * @param tree       the document
     * @param origin     its name, for messages
     * @throws dev.cairn.models.InputException on the first error
     */
    public static void validate(JsonNode schemaTree, JsonSchema schema, JsonNode tree, String origin) {
        Set<ValidationMessage> errors = schema.validate(tree);
        if (!errors.isEmpty()) {
            ValidationMessage first = errors.stream()
                    .min(Comparator.comparing((ValidationMessage m) -> rank(m.getType()))
                            .thenComparing(m -> m.getInstanceLocation().toString()))
                    .orElseThrow();
            throw new InputException(origin + ": " + describe(schemaTree, first));
        }
    }

    /**
     * Compiles a JSON Schema (draft 2020-12) whose errors carry JSON pointers.
     *
     * @param schemaTree the schema
     * @return the compiled schema
     */
    public static JsonSchema compile(JsonNode schemaTree) {
        return JsonSchemaFactory.getInstance(SpecVersion.VersionFlag.V202012)
                .getSchema(schemaTree, SchemaValidatorsConfig.builder().pathType(PathType.JSON_POINTER).build());
    }

    /**
     * Parses and validates spec text; {@code origin} names it in messages.
     *
     * @param text   the JSON text
     * @param origin the spec's name
     * @return the validated spec
     * @throws dev.cairn.models.InputException one line naming the field
     */
    public static Spec parse(String text, String origin) {
        JsonNode tree = tree(text, origin);
        JsonNode rows = tree.path("data").path("rows");
        if (rows.size() > Limits.INLINE_ROWS) { // before the schema check, whose cost grows with the rows
            throw new InputException(String.format(Locale.ROOT, "%s: /data/rows: %,d inline rows, more than %,d; put "
                    + "the data in a CSV or Parquet file (data.path)", origin, rows.size(), Limits.INLINE_ROWS));
        }
        validate(SCHEMA_TREE, SCHEMA, tree, origin);
        JsonNode columns = tree.path("data").path("columns");
        DataSpec.ALIASES.forEach((alias, key) -> {
            if (columns.has(alias) && columns.has(key)) {
                throw new InputException(origin + ": /data/columns: '" + alias + "' and '" + key
                        + "' name the same column; give one");
            }
        });
        Spec spec;
        try {
            // the schema has refused unknown keys; the models' own options are bound by each model
            spec = MAPPER.readerFor(Spec.class).without(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
                    .<Spec>readValue(tree).withTree(tree);
        } catch (JsonProcessingException e) {
            throw new InputException(origin + ": " + e.getOriginalMessage());
        } catch (IOException e) {
            throw new InputException(origin + ": " + e.getMessage());
        }
        checkRules(spec, origin);
        return spec;
    }

    /** Errors about unknown or missing keys are the most useful; report them first. */
    private static int rank(String type) {
        return switch (type) {
            case "additionalProperties" -> 0;
            case "required" -> 1;
            case "type", "enum", "const" -> 2;
            case "oneOf" -> 4;
            default -> 3;
        };
    }

    private static String describe(JsonNode schemaTree, ValidationMessage m) {
        String at = m.getInstanceLocation().toString();
        String pointer = at.isEmpty() ? "/" : at;
        switch (m.getType()) {
            case "additionalProperties" -> {
                String key = m.getProperty();
                String path = at + "/" + key;
                String hint = closest(key, SpecSchema.keysAt(schemaTree, at));
                return path + ": unknown key '" + key + "'" + (hint == null ? "" : " (did you mean '" + hint + "'?)");
            }
            case "required" -> {
                return (at.isEmpty() ? "" : at) + "/" + m.getProperty() + ": required key is missing";
            }
            case "oneOf" -> {
                if (at.equals("/data")) {
                    return "/data: give exactly one of 'path' (a CSV or Parquet file) and 'rows' (inline rows)"
                            + " (or, with engine spark, 'table')";
                }
                return pointer + ": " + stripPath(m.getMessage(), at);
            }
            default -> {
                return pointer + ": " + stripPath(m.getMessage(), at);
            }
        }
    }

    private static String stripPath(String message, String at) {
        String prefix = at + ": ";
        return message.startsWith(prefix) ? message.substring(prefix.length()) : message;
    }

    /**
     * The known name nearest to {@code key} in edit distance, when near enough to be a likely typo; else null.
     *
     * @param key   the name given
     * @param known the names that exist
     * @return the likely intended name, or null
     */
    public static String closest(String key, List<String> known) {
        String best = nearest(key, known);
        return best != null && distance(key, best) <= Math.max(2, best.length() / 3) ? best : null;
    }

    /**
     * The known name nearest to {@code key} in edit distance (case ignored), however far; null if none.
     *
     * @param key   the name given
     * @param known the names that exist
     * @return the nearest name, or null when known is empty
     */
    public static String nearest(String key, List<String> known) {
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String k : known) {
            int d = distance(key, k);
            if (d < bestDistance) {
                bestDistance = d;
                best = k;
            }
        }
        return best;
    }

    private static int distance(String a, String b) {
        return editDistance(a.toLowerCase(Locale.ROOT), b.toLowerCase(Locale.ROOT));
    }

    /** Levenshtein distance (insertions, deletions, substitutions), two-row dynamic programme. */
    private static int editDistance(String a, String b) {
        int[] previous = new int[b.length() + 1];
        int[] current = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            previous[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            current[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int substitute = previous[j - 1] + (a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1);
                current[j] = Math.min(substitute, Math.min(previous[j] + 1, current[j - 1] + 1));
            }
            int[] swap = previous;
            previous = current;
            current = swap;
        }
        return previous[b.length()];
    }

    /**
     * Rules across fields that the schema does not express: the model's data layout and own keys (any model),
     * then the model's own rules ({@link dev.cairn.models.Model#check}), then the sampler's and the data's.
     */
    private static void checkRules(Spec spec, String origin) {
        dev.cairn.models.Model model = dev.cairn.models.Cairn.model(spec.model());
        String layout = spec.data().layout();
        if (!model.layouts().contains(layout)) {
            throw new InputException(origin + ": /data/layout: model '" + model.name() + "' "
                    + (model.layouts().size() == 1 ? "needs layout '" + model.layouts().get(0) + "'"
                    : "takes layout " + model.layouts().stream().map(l -> "'" + l + "'")
                    .collect(java.util.stream.Collectors.joining(" or ")) + ", not '" + layout + "'"));
        }
        for (dev.cairn.models.Model other : dev.cairn.models.Cairn.models()) {
            if (other == model) {
                continue;
            }
            for (String key : other.ownKeys()) {
                if (spec.tree() != null && spec.tree().has(key) && !model.ownKeys().contains(key)) {
                    throw new InputException(origin + ": /" + key + ": applies to model '" + other.name() + "' only");
                }
            }
        }
        model.check(spec, origin);
        if (spec.currency() != null) {
            try {
                java.util.Currency.getInstance(spec.currency());
            } catch (IllegalArgumentException e) {
                throw new InputException(origin + ": /currency: '" + spec.currency() + "' is not an ISO 4217 currency code");
            }
        }
        SamplerSpec s = spec.samplerOrDefault();
        long kept = (long) s.chains() * s.draws();
        if (kept > MAX_KEPT_DRAWS) {
            throw new InputException(origin + ": /sampler: chains x draws = " + kept + " is more than "
                    + MAX_KEPT_DRAWS + " kept draws; use fewer draws or thin");
        }
        if ((long) s.warmup() + (long) s.draws() * s.thin() > 10_000_000L) {
            throw new InputException(origin + ": /sampler: warmup + draws x thin = "
                    + ((long) s.warmup() + (long) s.draws() * s.thin()) + " iterations per chain is more than 10000000");
        }
        if (spec.data().missingSpend() != null && !"users".equals(spec.data().layout())) {
            throw new InputException(origin + ": /data/missingSpend: applies to the 'users' layout only (a "
                    + "spend cell per user), not '" + spec.data().layout() + "'");
        }
        if (spec.data().mapped("time") && !("spend".equals(spec.model())
                && ("users".equals(spec.data().layout()) || "summary".equals(spec.data().layout())))) {
            throw new InputException(origin + ": /data/columns/time: a timeline applies to model 'spend' with layout "
                    + "'users' or 'summary', not model '" + spec.model() + "' with layout '" + spec.data().layout() + "'");
        }
        if ((spec.data().cohortPeriod() != null || spec.data().asOf() != null) && !"activity".equals(spec.data().layout())) {
            throw new InputException(origin + ": /data/" + (spec.data().cohortPeriod() != null ? "cohortPeriod" : "asOf")
                    + ": applies to layout 'activity' (raw activity rows), not '" + spec.data().layout() + "'");
        }
        if (spec.data().mapped("time") && "spark".equals(spec.data().engine())) {
            throw new InputException(origin + ": /data/columns/time: the timeline is computed by the embedded engine; "
                    + "engine 'spark' does not compute it yet");
        }
        if (spec.data().table() != null && !"spark".equals(spec.data().engine())) {
            throw new InputException(origin + ": /data/table: a catalog table is read by engine 'spark' (set data.engine)");
        }
        if ("spark".equals(spec.data().engine()) && spec.data().rows() != null) {
            throw new InputException(origin + ": /data/engine: inline rows are read in memory; engine 'spark' reads "
                    + "data.path or data.table");
        }
        if (spec.data().path() != null && spec.data().rows() != null) {
            throw new InputException(origin + ": /data: give exactly one of 'path' and 'rows'");
        }
    }
}
