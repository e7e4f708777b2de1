package dev.cairn.cli.serve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.InputException;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.spec.SpecReader;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code cairn serve} over real HTTP on loopback: the answers, the same messages as the command line, the
 * limits, the data folder, the store, and the OpenAPI description checked against the routes and against
 * every status these tests saw.
 */
class ServiceTest {
    static final String SPEND = """
            {"model": "spend", "currency": "EUR", "title": "Tide Pool Games: two offers",
             "data": {"layout": "summary", "rows": [
               {"arm": "A", "users": 1000, "payers": 30, "log_spend_sum": 60.5, "log_spend_sq_sum": 160.2},
               {"arm": "B", "users": 1000, "payers": 40, "log_spend_sum": 82.0, "log_spend_sq_sum": 215.0}]}%s}
            """;
    /** A slow fit: many draws of a sampled model, for the queue, the time limit and cancelling. */
    static final String SLOW = SPEND.formatted(", \"sampler\": {\"method\": \"metropolis-within-gibbs\", "
            + "\"chains\": 4, \"warmup\": 1000, \"draws\": 100000, \"thin\": 90}");
    /** Every (route, status) these tests saw; each must be documented in openapi.json. */
    private static final Set<String> SEEN = java.util.concurrent.ConcurrentHashMap.newKeySet();

    @TempDir
    Path dir;

    private static Service start(ServiceSettings.Builder b) throws IOException {
        return Service.start(b.host("127.0.0.1").port(0).build());
    }

    private static ServiceSettings.Builder settings() {
        return ServiceSettings.DEFAULT.toBuilder();
    }

    private static Http.Answer seen(String route, Http.Answer a) {
        SEEN.add(route + " " + a.status());
        assertEquals("application/json", a.header("content-type") == null ? null
                : a.header("content-type").replaceFirst(";.*", ""), "JSON answers: " + a.body());
        a.json(); // well-formed
        return a;
    }

    private static JsonNode withoutSeconds(JsonNode result) {
        JsonNode copy = result.deepCopy();
        ((ObjectNode) copy.get("run")).remove("seconds");
        return copy;
    }

    @Test
    void aFitAnswersWithTheSameResultAsTheCommandLine() throws Exception {
        try (Service s = start(settings())) {
            Http http = new Http(s.address());
            Http.Answer a = seen("POST /v1/fits", http.post("/v1/fits", SPEND.formatted("")));
            assertEquals(200, a.status(), a.body());
            String expected = ResultWriter.json(Cairn.fit(SpecReader.parse(SPEND.formatted(""), "x"), dir,
                    FitOptions.DEFAULT).result());
            assertEquals(withoutSeconds(Http.JSON.readTree(expected)), withoutSeconds(a.json()));
            assertTrue(a.json().get("converged").asBoolean());
            String location = a.header("location");
            assertTrue(location.matches("/v1/fits/[0-9a-f]{32}"), location);
            Http.Answer again = seen("GET /v1/fits/{id}", http.get(location));
            assertEquals(200, again.status());
            assertEquals(a.body(), again.body(), "the kept result is the one answered");
        }
    }

    @Test
    void aFitLongerThanTheWaitIsAnswered202AndPolled() throws Exception {
        try (Service s = start(settings())) {
            Http http = new Http(s.address());
            Http.Answer a = seen("POST /v1/fits", http.post("/v1/fits?wait=0", SPEND.formatted("")));
            assertEquals(202, a.status(), a.body());
            assertEquals(a.header("location"), a.json().get("location").asText());
            assertTrue(Set.of("queued", "running").contains(a.json().get("state").asText()));
            double progress = a.json().get("progress").asDouble();
            assertTrue(progress >= 0 && progress <= 1, a.body());
            assertNotNull(a.header("retry-after"));
            Http.Answer done = seen("GET /v1/fits/{id}", http.until(a.header("location")));
            assertEquals(200, done.status(), done.body());
            assertTrue(done.json().get("converged").asBoolean());
            assertEquals(400, seen("POST /v1/fits", http.post("/v1/fits?wait=soon", SPEND.formatted(""))).status());
        }
    }

    @Test
    void aFitThatDidNotConvergeIsANormalResultFlaggedFalse() throws Exception {
        try (Service s = start(settings())) {
            Http http = new Http(s.address());
            Http.Answer a = seen("POST /v1/fits", http.post("/v1/fits", SPEND.formatted(
                    ", \"sampler\": {\"method\": \"metropolis-within-gibbs\", \"warmup\": 0, \"draws\": 40}")));
            assertEquals(200, a.status(), a.body());
            assertFalse(a.json().get("converged").asBoolean());
            assertTrue(a.json().get("diagnostics").get("reasons").size() > 0);
        }
    }

    static Stream<Path> corpus() throws IOException {
        try (Stream<Path> s = Files.list(Path.of("..", "fixtures", "bad"))) {
            return s.filter(Files::isDirectory).sorted().toList().stream();
        }
    }

    @Test
    void everyBadInputOfTheCorpusIs400WithTheCommandLinesMessage() throws Exception {
        // One service whose data root is the corpus folder; each case's file paths are put under its own folder,
        // and the command line's message is taken for the same rewritten spec.
        Path root = Path.of("..", "fixtures", "bad").toAbsolutePath().normalize();
        List<String> wrong = new ArrayList<>();
        try (Service s = start(settings().dataRoot(root))) {
            Http http = new Http(s.address());
            for (Path caseDir : corpus().toList()) {
                String spec = underFolder(Files.readString(caseDir.resolve("spec.json"), StandardCharsets.UTF_8),
                        caseDir.getFileName().toString());
                Http.Answer a = seen("POST /v1/fits", http.post("/v1/fits", spec));
                if (a.status() == 202 || a.status() == 200 && a.json().has("error")) {
                    a = http.until(a.header("location"));
                }
                String expected = Files.readString(caseDir.resolve("expected.txt"), StandardCharsets.UTF_8).strip();
                String cli;
                try {
                    Cairn.fit(SpecReader.parse(spec, "request"), root, FitOptions.DEFAULT);
                    cli = "(fitted)";
                } catch (InputException e) {
                    cli = e.getMessage();
                }
                JsonNode error = a.json().get("error");
                String message = error == null ? "" : error.get("message").asText();
                // a missing file is said without the server's folders (the command line prints where it looked)
                boolean same = message.equals(cli) || message.contains("no such file in this service's data folder");
                if (a.status() != 400 || !message.contains(expected) || !same) {
                    wrong.add(caseDir.getFileName() + ": " + a.status() + " " + a.body().strip() + " / command line: " + cli);
                }
                if (error != null && same && ErrorBody.pointer(cli) != null) {
                    assertEquals(ErrorBody.pointer(cli), error.get("pointer").asText(), caseDir.toString());
                }
            }
        }
        assertEquals(List.of(), wrong);
    }

    /** The spec with every relative {@code path} value put under {@code folder} (the text otherwise as written). */
    private static String underFolder(String spec, String folder) {
        return spec.replaceAll("(\"path\"\\s*:\\s*\")(?!/)", "$1" + folder + "/");
    }

    @Test
    void errorsNameTheFieldAndItsPointer() throws Exception {
        try (Service s = start(settings())) {
            Http http = new Http(s.address());
            Http.Answer a = seen("POST /v1/fits", http.post("/v1/fits", SPEND.formatted(", \"control\": \"Z\"")));
            assertEquals(400, a.status(), a.body());
            assertEquals("/control", a.json().get("error").get("pointer").asText());
            assertTrue(a.json().get("error").get("message").asText().contains("arm 'Z' is not in the data"), a.body());
            Http.Answer notJson = seen("POST /v1/fits", http.post("/v1/fits", "{\"model\": "));
            assertEquals(400, notJson.status());
            assertTrue(notJson.json().get("error").get("message").asText().startsWith("request: not valid JSON"));
            assertEquals(404, seen("GET /v1/fits/{id}", http.get("/v1/fits/0123456789abcdef0123456789abcdef")).status());
            Http.Answer climb = seen("GET /v1/fits/{id}", http.get("/v1/fits/..%2F..%2Fetc"));
            assertTrue(climb.status() == 404 || climb.status() == 400, climb.body()); // the server refuses such paths
            assertEquals(404, http.get("/v1/nothing").status());
            Http.Answer put = http.method("PUT", "/v1/fits");
            assertEquals(405, put.status());
            assertEquals("POST", put.header("allow"));
        }
    }

    @Test
    void filesAreReadOnlyInsideTheDataRoot() throws Exception {
        Path root = Files.createDirectories(dir.resolve("root"));
        StringBuilder users = new StringBuilder("arm,spend\n");
        for (int i = 0; i < 400; i++) {
            users.append(i % 2 == 0 ? "A," : "B,").append(i % 10 == 0 ? 2.99 + i % 7 : i % 10 == 1 ? 4.99 + i % 5 : 0).append('\n');
        }
        Files.writeString(root.resolve("users.csv"), users);
        Files.writeString(dir.resolve("outside.csv"), "arm,spend\nA,0\nB,1\n");
        Files.createSymbolicLink(root.resolve("link.csv"), dir.resolve("outside.csv"));
        String byPath = "{\"model\": \"spend\", \"data\": {\"path\": \"%s\", \"layout\": \"users\"}}";
        try (Service none = start(settings())) {
            Http.Answer a = seen("POST /v1/fits", new Http(none.address()).post("/v1/fits", byPath.formatted("users.csv")));
            assertEquals(400, a.status());
            assertEquals("/data/path", a.json().get("error").get("pointer").asText());
            assertTrue(a.json().get("error").get("message").asText().contains("reads no files"), a.body());
        }
        try (Service s = start(settings().dataRoot(root))) {
            Http http = new Http(s.address());
            Http.Answer inside = seen("POST /v1/fits", http.post("/v1/fits", byPath.formatted("users.csv")));
            assertEquals(200, inside.status(), inside.body());
            for (String escape : List.of("../outside.csv", dir.resolve("outside.csv").toString(), "link.csv", "/etc/passwd")) {
                Http.Answer a = seen("POST /v1/fits", http.post("/v1/fits", byPath.formatted(escape)));
                assertEquals(400, a.status(), escape);
                assertTrue(a.json().get("error").get("message").asText().matches(".*(outside this service's data folder"
                        + "|no such file in this service's data folder).*"), a.body());
                assertFalse(a.body().contains(dir.toString()) && !escape.contains(dir.toString()),
                        "the server's folders are not told: " + a.body());
            }
            String history = "{\"model\": \"spend\", \"data\": {\"path\": \"users.csv\", \"layout\": \"users\"}, "
                    + "\"priors\": {\"fromHistory\": {\"path\": \"../outside.csv\"}}}";
            Http.Answer h = seen("POST /v1/fits", http.post("/v1/fits", history));
            assertEquals(400, h.status(), h.body());
        }
    }

    @Test
    void limitsAreEnforcedWithTheirOptionNamed() throws Exception {
        try (Service s = start(settings().maxBodyBytes(400).maxRows(1))) {
            Http http = new Http(s.address());
            Http.Answer big = seen("POST /v1/fits", http.post("/v1/fits", SPEND.formatted("") + " ".repeat(500)));
            assertEquals(413, big.status(), big.body());
            assertTrue(big.json().get("error").get("message").asText().contains("--max-body"));
            String small = SPEND.formatted("").replaceAll("\\s+", " ");
            assertTrue(small.length() <= 400, "fits the body limit: " + small.length());
            Http.Answer rows = seen("POST /v1/fits", http.post("/v1/fits", small));
            assertEquals(400, rows.status(), rows.body());
            assertTrue(rows.json().get("error").get("message").asText().contains("--max-rows"), rows.body());
        }
        try (Service s = start(settings().maxKeptValues(1000))) {
            Http.Answer a = seen("POST /v1/fits", new Http(s.address()).post("/v1/fits", SPEND.formatted("")));
            assertEquals(400, a.status(), a.body());
            assertEquals("/sampler", a.json().get("error").get("pointer").asText());
            assertTrue(a.json().get("error").get("message").asText().contains("more than the 1,000 allowed"), a.body());
        }
    }

    @Test
    void aFullQueueIs429WithRetryAfterAndAFitPastItsTimeIs503() throws Exception {
        try (Service s = start(settings().running(1).queued(0).timeLimit(Duration.ofMillis(1500)))) {
            Http http = new Http(s.address());
            Http.Answer slow = seen("POST /v1/fits", http.post("/v1/fits?wait=0", SLOW));
            assertEquals(202, slow.status(), slow.body());
            Http.Answer busy = seen("POST /v1/fits", http.post("/v1/fits", SPEND.formatted("")));
            assertEquals(429, busy.status(), busy.body());
            assertTrue(Long.parseLong(busy.header("retry-after")) >= 1);
            assertTrue(busy.json().get("error").get("message").asText().contains("--queued"), busy.body());
            Http.Answer stopped = seen("GET /v1/fits/{id}", http.until(slow.header("location")));
            assertEquals(503, stopped.status(), stopped.body());
            assertTrue(stopped.json().get("error").get("message").asText().contains("--time-limit"), stopped.body());
            Http.Answer waited = seen("POST /v1/fits", http.post("/v1/fits", SLOW));
            assertEquals(503, waited.status(), "a POST that waits sees the time limit too: " + waited.body());
            assertEquals(200, seen("POST /v1/fits", http.post("/v1/fits", SPEND.formatted(""))).status(),
                    "the runner is free again");
        }
    }

    @Test
    void deleteCancelsARunningFitAndForgetsAFinishedOne() throws Exception {
        try (Service s = start(settings().running(1))) {
            Http http = new Http(s.address());
            Http.Answer slow = http.post("/v1/fits?wait=0", SLOW);
            Http.Answer queued = http.post("/v1/fits?wait=0", SLOW);
            assertEquals(202, queued.status());
            Http.Answer cancelled = seen("DELETE /v1/fits/{id}", http.delete(slow.header("location")));
            assertEquals(200, cancelled.status(), cancelled.body());
            assertEquals("cancelled", cancelled.json().get("state").asText());
            assertEquals(404, seen("GET /v1/fits/{id}", http.get(slow.header("location"))).status());
            assertEquals("cancelled", http.delete(queued.header("location")).json().get("state").asText());
            Http.Answer done = http.post("/v1/fits", SPEND.formatted(""));
            assertEquals(200, done.status(), "the runner was freed: " + done.body());
            Http.Answer deleted = seen("DELETE /v1/fits/{id}", http.delete(done.header("location")));
            assertEquals("deleted", deleted.json().get("state").asText());
            assertEquals(404, seen("DELETE /v1/fits/{id}", http.delete(done.header("location"))).status());
        }
    }

    @Test
    void finishedResultsSurviveARestartWithAStore() throws Exception {
        Path store = dir.resolve("store");
        String location;
        String body;
        String failed;
        try (Service s = start(settings().store(store))) {
            Http http = new Http(s.address());
            Http.Answer a = http.post("/v1/fits", SPEND.formatted(""));
            assertEquals(200, a.status());
            location = a.header("location");
            body = a.body();
            Http.Answer bad = http.post("/v1/fits?wait=0", SPEND.formatted(", \"control\": \"Z\"").replace(
                    "\"control\"", "\"strict\": true, \"control\""));
            failed = bad.status() == 202 ? http.until(bad.header("location")).body() : null;
        }
        try (Stream<Path> files = Files.list(store)) {
            List<String> names = files.map(p -> p.getFileName().toString()).toList();
            assertTrue(names.stream().noneMatch(n -> n.endsWith(".tmp")), names.toString());
            assertTrue(names.contains(location.substring("/v1/fits/".length()) + ".200.json"), names.toString());
        }
        try (Service again = start(settings().store(store))) {
            Http http = new Http(again.address());
            Http.Answer a = seen("GET /v1/fits/{id}", http.get(location));
            assertEquals(200, a.status());
            assertEquals(body, a.body(), "byte for byte");
            assertEquals(1 + (failed == null ? 0 : 1), http.get("/v1/health").json().get("kept").asInt());
            http.delete(location);
        }
        try (Service third = start(settings().store(store))) {
            assertEquals(404, new Http(third.address()).get(location).status(), "a deleted result stays deleted");
        }
    }

    @Test
    void resultsAreForgottenPastTheKeepingCountAndTime() throws Exception {
        try (Service s = start(settings().keepCount(2))) {
            Http http = new Http(s.address());
            List<String> locations = new ArrayList<>();
            for (int i = 0; i < 3; i++) {
                Http.Answer a = http.post("/v1/fits", SPEND.formatted(""));
                assertEquals(200, a.status());
                locations.add(a.header("location"));
                Thread.sleep(5); // distinct finishing times
            }
            assertEquals(404, http.get(locations.get(0)).status(), "the oldest is forgotten first");
            assertEquals(200, http.get(locations.get(2)).status());
        }
        try (Service s = start(settings().keepFor(Duration.ofMillis(300)))) {
            Http http = new Http(s.address());
            String location = http.post("/v1/fits", SPEND.formatted("")).header("location");
            long deadline = System.nanoTime() + 10_000_000_000L;
            while (http.get(location).status() == 200 && System.nanoTime() < deadline) {
                Thread.sleep(50);
            }
            assertEquals(404, http.get(location).status());
        }
    }

    @Test
    void schemaHealthAndDescriptionAnswer() throws Exception {
        try (Service s = start(settings())) {
            Http http = new Http(s.address());
            Http.Answer schema = http.get("/v1/schema");
            SEEN.add("GET /v1/schema " + schema.status());
            assertEquals(200, schema.status());
            assertTrue(schema.json().has("$schema") && schema.json().has("properties"), schema.body());
            Http.Answer health = seen("GET /v1/health", http.get("/v1/health"));
            assertEquals("ok", health.json().get("status").asText());
            assertEquals(0, health.json().get("running").asInt());
            assertTrue(health.json().get("limits").has("maxBodyBytes"));
            assertEquals(200, seen("GET /v1/openapi.json", http.get("/v1/openapi.json")).status());
        }
    }

    @Test
    void theDescriptionNamesExactlyTheRoutesServed() throws Exception {
        JsonNode doc = openApi();
        assertEquals("3.1.0", doc.get("openapi").asText());
        Set<String> described = new LinkedHashSet<>();
        for (Iterator<Map.Entry<String, JsonNode>> paths = doc.get("paths").fields(); paths.hasNext(); ) {
            Map.Entry<String, JsonNode> p = paths.next();
            for (Iterator<String> methods = p.getValue().fieldNames(); methods.hasNext(); ) {
                String m = methods.next();
                if (!m.equals("parameters")) {
                    described.add(m.toUpperCase(java.util.Locale.ROOT) + " " + p.getKey());
                }
            }
        }
        Set<String> served = new LinkedHashSet<>();
        for (Route r : Route.ALL) {
            served.add(r.method() + " " + r.template());
        }
        assertEquals(served, described);
        // every $ref points at a schema that exists
        for (String ref : refs(doc, new ArrayList<>())) {
            assertTrue(doc.at(ref.substring(1)).isObject(), ref);
        }
    }

    @AfterAll
    static void everyStatusSeenIsDescribed() throws IOException {
        JsonNode doc = openApi();
        List<String> undocumented = new ArrayList<>();
        for (String seen : SEEN) {
            String[] p = seen.split(" ");
            JsonNode op = doc.get("paths").get(p[1]).get(p[0].toLowerCase(java.util.Locale.ROOT));
            if (op == null || !op.get("responses").has(p[2])) {
                undocumented.add(seen);
            }
        }
        assertEquals(List.of(), undocumented);
    }

    private static JsonNode openApi() throws IOException {
        try (var in = HttpApi.class.getResourceAsStream("openapi.json")) {
            return Http.JSON.readTree(in);
        }
    }

    private static List<String> refs(JsonNode node, List<String> out) {
        if (node.isObject()) {
            node.fields().forEachRemaining(e -> {
                if (e.getKey().equals("$ref")) {
                    out.add(e.getValue().asText());
                } else {
                    refs(e.getValue(), out);
                }
            });
        } else if (node.isArray()) {
            node.forEach(n -> refs(n, out));
        }
        return out;
    }

    @Test
    void everyFileTheSchemaNamesSitsUnderAKeyCalledPath() throws IOException {
        // DataAccess finds files by that key; a new file key under another name would slip past it.
        JsonNode schema = Http.JSON.readTree(dev.cairn.models.spec.SpecSchema.text());
        List<String> fileKeys = new ArrayList<>();
        collectFileKeys(schema, "", fileKeys);
        assertFalse(fileKeys.isEmpty());
        for (String key : fileKeys) {
            assertTrue(key.endsWith("/path"), "a file key not named 'path': " + key);
        }
    }

    private static void collectFileKeys(JsonNode node, String at, List<String> out) {
        if (node.isObject()) {
            JsonNode props = node.get("properties");
            if (props != null) {
                props.fields().forEachRemaining(e -> {
                    String d = e.getValue().path("description").asText("").toLowerCase(java.util.Locale.ROOT);
                    if (e.getKey().toLowerCase(java.util.Locale.ROOT).contains("path") || e.getKey().contains("file")
                            || d.contains(".csv") || d.contains("parquet")) {
                        out.add(at + "/" + e.getKey());
                    }
                });
            }
            node.fields().forEachRemaining(e -> collectFileKeys(e.getValue(), at + "/" + e.getKey(), out));
        } else if (node.isArray()) {
            node.forEach(n -> collectFileKeys(n, at, out));
        }
    }

    @Test
    void theErrorPointerIsTheOneTheMessageNames() {
        assertEquals("/control", ErrorBody.pointer("request: /control: arm 'Z' is not in the data"));
        assertEquals("/data/rows/1", ErrorBody.pointer("/data/rows/1, 'spend': spend must be >= 0"));
        assertEquals("/data/rows/1/spend", ErrorBody.pointer("request: /data/rows/1/spend: expected a number"));
        assertNull(ErrorBody.pointer("users.csv: line 3, column 'spend': spend is empty"));
        assertNull(ErrorBody.pointer("request: not valid JSON at line 1, column 1"));
    }
}
