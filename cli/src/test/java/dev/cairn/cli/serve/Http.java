package dev.cairn.cli.serve;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.Duration;

/** A test client of the service, the way a tool in another language would call it (plain HTTP and JSON). */
final class Http {
    static final ObjectMapper JSON = new ObjectMapper();
    private static final HttpClient CLIENT = HttpClient.newBuilder().version(HttpClient.Version.HTTP_1_1)
            .connectTimeout(Duration.ofSeconds(10)).build();
    private final URI base;

    Http(URI base) {
        this.base = base;
    }

    /** An answer: status, one header, body text and its JSON. */
    record Answer(int status, String body, HttpResponse<String> raw) {
        JsonNode json() {
            try {
                return JSON.readTree(body);
            } catch (IOException e) {
                throw new UncheckedIOException("not JSON: " + body, e);
            }
        }

        String header(String name) {
            return raw.headers().firstValue(name).orElse(null);
        }
    }

    Answer post(String path, String body) {
        return send(HttpRequest.newBuilder(base.resolve(path)).POST(HttpRequest.BodyPublishers.ofString(body))
                .header("Content-Type", "application/json"));
    }

    Answer get(String path) {
        return send(HttpRequest.newBuilder(base.resolve(path)).GET());
    }

    Answer delete(String path) {
        return send(HttpRequest.newBuilder(base.resolve(path)).DELETE());
    }

    Answer method(String method, String path) {
        return send(HttpRequest.newBuilder(base.resolve(path)).method(method, HttpRequest.BodyPublishers.noBody()));
    }

    private static Answer send(HttpRequest.Builder b) {
        try {
            HttpResponse<String> r = CLIENT.send(b.timeout(Duration.ofSeconds(120)).build(),
                    HttpResponse.BodyHandlers.ofString());
            return new Answer(r.statusCode(), r.body(), r);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException(e);
        }
    }

    /** Polls a fit until it has finished (bounded), returning the finished answer. */
    Answer until(String location) {
        long deadline = System.nanoTime() + 120_000_000_000L;
        while (System.nanoTime() < deadline) {
            Answer a = get(location);
            if (a.status() != 202) {
                return a;
            }
            try {
                Thread.sleep(20);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException(e);
            }
        }
        throw new AssertionError(location + " did not finish within 120 s");
    }
}
