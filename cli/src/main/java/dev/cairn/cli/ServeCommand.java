package dev.cairn.cli;

import dev.cairn.cli.serve.Service;
import dev.cairn.cli.serve.ServiceSettings;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code cairn serve}: fits over HTTP/JSON for tools in any language (routes: GET /v1/openapi.json). */
@Command(name = "serve",
        mixinStandardHelpOptions = true,
        description = {
            "Answer fits over HTTP with JSON: POST /v1/fits takes a spec and answers with result.json (200), or "
                + "with a place to poll (202) when the fit takes longer than --wait; GET /v1/openapi.json describes "
                + "every route. Listens on 127.0.0.1 only unless --host says otherwise; the service has no "
                + "authentication, so put it behind one before opening it to a network.",
            "Specs send their data inline (data.rows); files are read only with --data-root, and only inside it.",
            "Exit code 0 when stopped; 2: bad option, or the address cannot be used."
        })
final class ServeCommand implements Callable<Integer> {
    private static final ServiceSettings D = ServiceSettings.DEFAULT;

    @Option(names = "--host", paramLabel = "ADDRESS", description = "Address to listen on (default: ${DEFAULT-VALUE}).")
    String host = D.host();

    @Option(names = "--port", paramLabel = "N", description = "TCP port; 0 picks a free one (default: ${DEFAULT-VALUE}).")
    int port = D.port();

    @Option(names = "--data-root", paramLabel = "DIR",
            description = "Allow specs to read files, only inside DIR (links resolved). Without it no file is read.")
    Path dataRoot;

    @Option(names = "--store", paramLabel = "DIR",
            description = "Keep finished results in DIR as well (written atomically), so a restart loses none.")
    Path store;

    @Option(names = "--wait", paramLabel = "SECONDS",
            description = "How long POST /v1/fits waits for the result before answering 202 (default: ${DEFAULT-VALUE}).")
    double wait = D.waitFor().toMillis() / 1000.0;

    @Option(names = "--max-body", paramLabel = "BYTES", description = "Largest request body (default: ${DEFAULT-VALUE}).")
    long maxBody = D.maxBodyBytes();

    @Option(names = "--max-rows", paramLabel = "N", description = "Most inline data rows per spec (default: ${DEFAULT-VALUE}).")
    int maxRows = D.maxRows();

    @Option(names = "--max-kept-values", paramLabel = "N",
            description = "Most values one fit keeps, chains x draws x recorded quantities (default: ${DEFAULT-VALUE}).")
    long maxKeptValues = D.maxKeptValues();

    @Option(names = "--running", paramLabel = "N", description = "Fits running at once (default: the processors, ${DEFAULT-VALUE}).")
    int running = D.running();

    @Option(names = "--queued", paramLabel = "N",
            description = "Fits that may wait for a runner; beyond them the answer is 429 (default: ${DEFAULT-VALUE}).")
    int queued = D.queued();

    @Option(names = "--time-limit", paramLabel = "SECONDS",
            description = "Longest a fit may run before it is stopped and answered 503 (default: ${DEFAULT-VALUE}).")
    double timeLimit = D.timeLimit().toSeconds();

    @Option(names = "--keep-for", paramLabel = "SECONDS", description = "How long finished results are kept (default: ${DEFAULT-VALUE}).")
    double keepFor = D.keepFor().toSeconds();

    @Option(names = "--keep-count", paramLabel = "N", description = "Most finished results kept, oldest forgotten first (default: ${DEFAULT-VALUE}).")
    int keepCount = D.keepCount();

    @Option(names = "--keep-bytes", paramLabel = "BYTES", description = "Most bytes of finished results kept (default: ${DEFAULT-VALUE}).")
    long keepBytes = D.keepBytes();

    @Option(names = "--threads-per-fit", paramLabel = "N", description = "Threads each fit's chains run on (default: ${DEFAULT-VALUE}).")
    int threadsPerFit = D.threadsPerFit();

    @CommandLine.Spec
    CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() throws InterruptedException {
        PrintWriter out = command.commandLine().getOut();
        PrintWriter err = command.commandLine().getErr();
        ServiceSettings settings;
        try {
            settings = D.toBuilder().host(host).port(port).dataRoot(dataRoot).store(store).waitFor(seconds(wait, "--wait"))
                    .maxBodyBytes(maxBody).maxRows(maxRows).maxKeptValues(maxKeptValues).running(running).queued(queued)
                    .timeLimit(seconds(timeLimit, "--time-limit")).keepFor(seconds(keepFor, "--keep-for"))
                    .keepCount(keepCount).keepBytes(keepBytes).threadsPerFit(threadsPerFit).build();
        } catch (IllegalArgumentException e) {
            err.println("cairn serve: " + e.getMessage());
            return ExitCodes.BAD_INPUT;
        }
        Service service;
        try {
            service = Service.start(settings);
        } catch (java.io.IOException e) {
            err.println("cairn serve: cannot listen on " + host + ":" + port + " (" + Messages.ioReason(e)
                    + "); is another service on that port? --port 0 picks a free one");
            return ExitCodes.BAD_INPUT;
        } catch (IllegalArgumentException | java.io.UncheckedIOException e) {
            err.println("cairn serve: " + e.getMessage());
            return ExitCodes.BAD_INPUT;
        }
        Runtime.getRuntime().addShutdownHook(new Thread(service::close, "cairn-serve-stop"));
        out.println("cairn serve: answering on " + service.address() + " (POST /v1/fits; GET /v1/openapi.json "
                + "describes every route); Ctrl-C stops");
        out.flush();
        service.join();
        return ExitCodes.OK;
    }

    private static Duration seconds(double s, String option) {
        if (!(s >= 0) || s > 1e9) {
            throw new IllegalArgumentException(option + " must be a number of seconds >= 0, was " + s);
        }
        return Duration.ofMillis(Math.round(s * 1000));
    }
}
