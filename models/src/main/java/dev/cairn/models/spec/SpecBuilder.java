package dev.cairn.models.spec;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * A spec built in code, for programs that call cairn as a library. It assembles the JSON a spec file would
 * hold and validates it in {@link #build} through {@link SpecReader#parse}: a wrong value gives the same
 * one-line message naming the same JSON pointer as it would in a file, and there is no second path that could
 * skip a check. Values are JSON values: strings, numbers, booleans, and lists and maps of them.
 *
 * <pre>
 *   Spec spec = Spec.builder("spend").currency("EUR")
 *           .summaryRow("A", 1000, 30, 60.5, 160.2)
 *           .summaryRow("B", 1000, 40, 82.0, 215.0)
 *           .set("/sampler/seed", 7)
 *           .build();
 * </pre>
 * Mutable; one per spec.
 */
public final class SpecBuilder {
    /** How a built spec is named in messages. */
    public static final String ORIGIN = "spec built in code";
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private final ObjectNode root = MAPPER.createObjectNode();

    private SpecBuilder() {
    }

    /**
     * @param model the model name (see {@code cairn schema}); null is refused in {@link #build}, as a spec
     *              file without "model" is
     * @return a builder
     */
    public static SpecBuilder of(String model) {
        SpecBuilder b = new SpecBuilder();
        if (model != null) {
            b.root.put("model", model);
        }
        return b;
    }

    /**
     * Sets any key by its JSON pointer, making the objects on the way ("/sampler/thin", 2).
     *
     * @param pointer a JSON pointer such as "/decision/metric"
     * @param value   a JSON value (null removes the key)
     * @return this builder
     * @throws IllegalArgumentException when the pointer is not of the form "/a/b"
     */
    public SpecBuilder set(String pointer, Object value) {
        if (pointer == null || !pointer.startsWith("/") || pointer.length() < 2) {
            throw new IllegalArgumentException("a JSON pointer such as \"/sampler/seed\" is needed, was " + pointer);
        }
        String[] keys = pointer.substring(1).split("/");
        ObjectNode at = root;
        for (int i = 0; i < keys.length - 1; i++) {
            JsonNode next = at.get(keys[i]);
            if (!(next instanceof ObjectNode)) {
                next = at.putObject(keys[i]);
            }
            at = (ObjectNode) next;
        }
        String last = keys[keys.length - 1];
        if (value == null) {
            at.remove(last);
        } else {
            at.set(last, MAPPER.valueToTree(value));
        }
        return this;
    }

    /**
     * @param title the question the fit answers
     * @return this builder
     */
    public SpecBuilder title(String title) {
        return set("/title", title);
    }

    /**
     * @param code an ISO 4217 currency code for money figures ("EUR")
     * @return this builder
     */
    public SpecBuilder currency(String code) {
        return set("/currency", code);
    }

    /**
     * @param arm the control arm
     * @return this builder
     */
    public SpecBuilder control(String arm) {
        return set("/control", arm);
    }

    /**
     * @param layout the data layout ("users", "summary", "estimates", "cohort-days")
     * @return this builder
     */
    public SpecBuilder layout(String layout) {
        return set("/data/layout", layout);
    }

    /**
     * @param path a data file, relative to the base folder given to the fit
     * @return this builder
     */
    public SpecBuilder path(String path) {
        return set("/data/path", path);
    }

    /**
     * Adds one inline data row, its keys the layout's columns.
     *
     * @param row column to value
     * @return this builder
     */
    public SpecBuilder row(Map<String, ?> row) {
        JsonNode rows = root.path("data").get("rows");
        if (!(rows instanceof ArrayNode)) {
            set("/data/rows", java.util.List.of());
            rows = root.path("data").get("rows");
        }
        ((ArrayNode) rows).add(MAPPER.valueToTree(row));
        return this;
    }

    /**
     * One arm's sufficient statistics for the spend models' summary layout (sets the layout).
     *
     * @param arm           the arm
     * @param users         users
     * @param payers        payers
     * @param logSpendSum   the payers' sum of log spend
     * @param logSpendSqSum the payers' sum of squared log spend
     * @return this builder
     */
    public SpecBuilder summaryRow(String arm, long users, long payers, double logSpendSum, double logSpendSqSum) {
        layout("summary");
        Map<String, Object> row = new LinkedHashMap<>();
        row.put("arm", arm);
        row.put("users", users);
        row.put("payers", payers);
        row.put("log_spend_sum", logSpendSum);
        row.put("log_spend_sq_sum", logSpendSqSum);
        return row(row);
    }

    /**
     * One estimate for pooled-effects (sets the layout).
     *
     * @param name     the effect's name
     * @param estimate the estimate
     * @param se       its standard error
     * @return this builder
     */
    public SpecBuilder estimate(String name, double estimate, double se) {
        layout("estimates");
        Map<String, Object> row = new LinkedHashMap<>();
        row.put("name", name);
        row.put("estimate", estimate);
        row.put("se", se);
        return row(row);
    }

    /**
     * Users of one arm for the spend models' users layout, one row per user with what each spent (0 for a
     * user who did not pay); sets the layout. Read in memory, without the SQL engine.
     *
     * @param arm    the arm
     * @param spends each user's spend
     * @return this builder
     */
    public SpecBuilder users(String arm, double... spends) {
        layout("users");
        for (double spend : spends) {
            Map<String, Object> row = new LinkedHashMap<>();
            row.put("arm", arm);
            row.put("spend", spend);
            row(row);
        }
        return this;
    }

    /**
     * One row of the retention model's cohort-days layout (sets the layout).
     *
     * @param cohort   the install cohort, e.g. an ISO date
     * @param arm      the arm, or null for a table without arms
     * @param day      days since install (0 is the install day)
     * @param installs the cohort's installs in the arm
     * @param active   how many were active (or, for survival curves, still retained) on that day
     * @return this builder
     */
    public SpecBuilder cohortRow(String cohort, String arm, int day, long installs, long active) {
        layout("cohort-days");
        Map<String, Object> row = new LinkedHashMap<>();
        row.put("cohort", cohort);
        if (arm != null) {
            row.put("arm", arm);
        }
        row.put("day", day);
        row.put("installs", installs);
        row.put("active", active);
        return row(row);
    }

    /**
     * @param method "auto", "exact", "nuts", ... (see {@code cairn schema})
     * @return this builder
     */
    public SpecBuilder method(String method) {
        return set("/sampler/method", method);
    }

    /**
     * @param chains chains
     * @param draws  kept draws per chain
     * @param seed   the seed
     * @return this builder
     */
    public SpecBuilder sampler(int chains, int draws, long seed) {
        return set("/sampler/chains", chains).set("/sampler/draws", draws).set("/sampler/seed", seed);
    }

    /**
     * @return the JSON the spec is built from, as a spec file would hold it
     */
    public String json() {
        return root.toPrettyString();
    }

    /**
     * Validates the spec as a spec file is validated.
     *
     * @return the spec
     * @throws dev.cairn.models.InputException one line naming the field, prefixed "spec built in code: "
     */
    public Spec build() {
        return SpecReader.parse(root.toString(), ORIGIN);
    }
}
