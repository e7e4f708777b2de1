package dev.cairn.cli.serve;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.models.InputException;
import dev.cairn.models.Version;
import dev.cairn.models.spec.SpecSchema;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.Locale;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.ScheduledFuture;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.regex.Pattern;
import org.eclipse.jetty.http.HttpHeader;
import org.eclipse.jetty.io.Content;
import org.eclipse.jetty.server.Handler;
import org.eclipse.jetty.server.Request;
import org.eclipse.jetty.server.Response;
import org.eclipse.jetty.util.Callback;
import org.eclipse.jetty.util.Fields;

/**
 * The service's routes on Jetty's core handler API (see {@link Route#ALL}). A POST reads the body on the
 * request's thread (bounded by {@code --max-body}), checks the spec there, and then waits for the fit without
 * holding a thread: the answer is written by whichever comes first, the fit finishing or the wait running out.
 */
final class HttpApi extends Handler.Abstract {
    private static final ObjectMapper JSON = new ObjectMapper();
    private static final Pattern ID = Pattern.compile("[0-9a-f]{32}");
    private static final String JSON_TYPE = "application/json";
    private final FitService service;
    private final ScheduledExecutorService timers = Executors.newSingleThreadScheduledExecutor(r -> {
        Thread t = new Thread(r, "cairn-request-timers");
        t.setDaemon(true);
        return t;
    });
    private final byte[] openApi;

    HttpApi(FitService service) {
        this.service = service;
        try (InputStream in = HttpApi.class.getResourceAsStream("openapi.json")) {
            this.openApi = in.readAllBytes();
        } catch (IOException | NullPointerException e) {
            throw new IllegalStateException("openapi.json is missing from the jar", e);
        }
    }

    @Override
    public boolean handle(Request request, Response response, Callback callback) {
        String path = Request.getPathInContext(request);
        String method = request.getMethod();
        boolean pathKnown = false;
        for (Route r : Route.ALL) {
            String variable = r.match(path);
            if (variable == null) {
                continue;
            }
            pathKnown = true;
            if (r.method().equals(method)) {
                dispatch(r, variable, request, response, callback);
                return true;
            }
        }
        if (pathKnown) {
            response.getHeaders().put(HttpHeader.ALLOW, allowed(path));
            send(response, callback, 405, ErrorBody.of(405, method + " " + path + ": not allowed; use " + allowed(path)));
        } else {
            send(response, callback, 404, ErrorBody.of(404, path + ": no such route; see GET /v1/openapi.json"));
        }
        return true;
    }

    private static String allowed(String path) {
        StringBuilder out = new StringBuilder();
        for (Route r : Route.ALL) {
            if (r.match(path) != null) {
                out.append(out.length() == 0 ? "" : ", ").append(r.method());
            }
        }
        return out.toString();
    }

    private void dispatch(Route route, String id, Request request, Response response, Callback callback) {
        switch (route.method() + " " + route.template()) {
            case "POST /v1/fits" -> post(request, response, callback);
            case "GET /v1/fits/{id}" -> get(id, response, callback);
            case "DELETE /v1/fits/{id}" -> delete(id, response, callback);
            case "GET /v1/schema" -> {
                response.getHeaders().put(HttpHeader.CONTENT_TYPE, "application/schema+json");
                write(response, callback, 200, SpecSchema.text().getBytes(StandardCharsets.UTF_8));
            }
            case "GET /v1/health" -> send(response, callback, 200, health());
            case "GET /v1/openapi.json" -> send(response, callback, 200, openApi);
            default -> throw new IllegalStateException("route without a handler: " + route);
        }
    }

    private void post(Request request, Response response, Callback callback) {
        long max = service.settings().maxBodyBytes();
        if (request.getLength() > max) {
            send(response, callback, 413, ErrorBody.of(413, tooLarge(request.getLength(), max)));
            return;
        }
        byte[] body;
        try {
            body = Content.Source.asInputStream(request).readNBytes((int) Math.min(Integer.MAX_VALUE - 8, max + 1));
        } catch (IOException e) {
            send(response, callback, 400, ErrorBody.of(400, "the request body could not be read: " + e.getMessage()));
            return;
        }
        if (body.length > max) {
            send(response, callback, 413, ErrorBody.of(413, tooLarge(-1, max)));
            return;
        }
        double waitSeconds;
        FitJob job;
        try {
            waitSeconds = waitSeconds(request);
            job = service.submit(new String(body, StandardCharsets.UTF_8));
        } catch (InputException e) {
            send(response, callback, 400, ErrorBody.of(400, e.getMessage()));
            return;
        } catch (FitService.Busy e) {
            response.getHeaders().put(HttpHeader.RETRY_AFTER, Long.toString(e.retryAfterSeconds));
            send(response, callback, 429, ErrorBody.of(429, e.getMessage()));
            return;
        }
        AtomicBoolean answered = new AtomicBoolean();
        ScheduledFuture<?> timer = timers.schedule(() -> {
            if (answered.compareAndSet(false, true)) {
                pending(job, response, callback);
            }
        }, (long) (waitSeconds * 1000), TimeUnit.MILLISECONDS);
        job.answer().thenAccept(a -> {
            if (answered.compareAndSet(false, true)) {
                timer.cancel(false);
                finished(job, a, response, callback);
            }
        });
    }

    private static String tooLarge(long length, long max) {
        return String.format(Locale.ROOT, "the request body%s is larger than the %,d bytes this service takes "
                + "(--max-body); put large tables in a file under the service's --data-root", length < 0 ? ""
                : String.format(Locale.ROOT, " (%,d bytes)", length), max);
    }

    /** The {@code wait} query parameter in seconds (0 up to the service's {@code --wait}), or the default. */
    private double waitSeconds(Request request) {
        double most = service.settings().waitFor().toMillis() / 1000.0;
        Fields query = Request.extractQueryParameters(request);
        String given = query.getValue("wait");
        if (given == null) {
            return most;
        }
        double w;
        try {
            w = Double.parseDouble(given);
        } catch (NumberFormatException e) {
            throw new InputException("?wait: expected seconds, found '" + given + "'");
        }
        if (!(w >= 0)) {
            throw new InputException("?wait: must be >= 0 seconds, was " + given);
        }
        return Math.min(w, most);
    }

    private void get(String id, Response response, Callback callback) {
        FitJob job = ID.matcher(id).matches() ? service.get(id) : null;
        if (job == null) {
            send(response, callback, 404, ErrorBody.of(404, "/v1/fits/" + id + ": no such fit here (never submitted, "
                    + "deleted, or forgotten after --keep-for)"));
            return;
        }
        FitJob.Answer a = job.answerNow();
        if (a == null) {
            pending(job, response, callback);
        } else {
            finished(job, a, response, callback);
        }
    }

    private void delete(String id, Response response, Callback callback) {
        FitJob job = ID.matcher(id).matches() ? service.delete(id) : null;
        if (job == null) {
            send(response, callback, 404, ErrorBody.of(404, "/v1/fits/" + id + ": no such fit here"));
            return;
        }
        ObjectNode out = JSON.createObjectNode();
        out.put("id", job.id);
        out.put("state", job.state() == FitJob.State.DONE || job.state() == FitJob.State.FAILED
                || job.state() == FitJob.State.TIMED_OUT ? "deleted" : "cancelled");
        send(response, callback, 200, bytes(out));
    }

    private void pending(FitJob job, Response response, Callback callback) {
        ObjectNode out = JSON.createObjectNode();
        out.put("id", job.id);
        out.put("state", job.state().word);
        out.put("progress", Math.round(job.fractionDone() * 1000) / 1000.0);
        out.put("location", location(job));
        response.getHeaders().put(HttpHeader.LOCATION, location(job));
        response.getHeaders().put(HttpHeader.RETRY_AFTER, "1");
        send(response, callback, 202, bytes(out));
    }

    private void finished(FitJob job, FitJob.Answer a, Response response, Callback callback) {
        response.getHeaders().put(HttpHeader.LOCATION, location(job));
        send(response, callback, a.status(), a.body());
    }

    private static String location(FitJob job) {
        return "/v1/fits/" + job.id;
    }

    private byte[] health() {
        ObjectNode out = JSON.createObjectNode();
        out.put("status", "ok");
        out.put("version", Version.get());
        out.put("running", service.running());
        out.put("queued", service.queued());
        out.put("kept", service.kept());
        ServiceSettings s = service.settings();
        ObjectNode limits = out.putObject("limits");
        limits.put("running", s.running());
        limits.put("queued", s.queued());
        limits.put("waitSeconds", s.waitFor().toMillis() / 1000.0);
        limits.put("maxBodyBytes", s.maxBodyBytes());
        limits.put("maxRows", s.maxRows());
        limits.put("maxKeptValues", s.maxKeptValues());
        limits.put("timeLimitSeconds", s.timeLimit().toMillis() / 1000.0);
        limits.put("keepForSeconds", s.keepFor().toMillis() / 1000.0);
        limits.put("keepCount", s.keepCount());
        limits.put("keepBytes", s.keepBytes());
        limits.put("dataFiles", s.dataRoot() != null);
        limits.put("store", s.store() != null);
        return bytes(out);
    }

    private static byte[] bytes(ObjectNode node) {
        try {
            return (JSON.writeValueAsString(node) + "\n").getBytes(StandardCharsets.UTF_8);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static void send(Response response, Callback callback, int status, byte[] body) {
        response.getHeaders().put(HttpHeader.CONTENT_TYPE, JSON_TYPE);
        write(response, callback, status, body);
    }

    private static void write(Response response, Callback callback, int status, byte[] body) {
        response.setStatus(status);
        response.getHeaders().put(HttpHeader.CACHE_CONTROL, "no-store");
        response.write(true, ByteBuffer.wrap(body), callback);
    }

    @Override
    protected void doStop() throws Exception {
        timers.shutdownNow();
        super.doStop();
    }
}
