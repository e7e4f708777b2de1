package dev.cairn.cli;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.InputException;
import dev.cairn.models.OutputFolder;
import dev.cairn.models.ResultWriter;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code cairn fit SPEC.json --out DIR}: fit a spec and write result.json, draws.csv and report.html; with
 * {@code --json} result.json goes to standard output instead (or as well), and {@code -} as the spec reads it
 * from standard input, so that a program in any language can pipe a spec in and a result out.
 */
@Command(name = "fit",
        mixinStandardHelpOptions = true,
        description = {
            "Fit the model a spec describes and write DIR/result.json, DIR/draws.csv and DIR/report.html.",
            "With --json, result.json is written to standard output (nothing else goes there; non-ASCII text is "
                + "escaped, so any reader's encoding works); the files are written only when --out is given too. "
                + "SPEC.json '-' reads the spec from standard input (relative data paths then resolve against the "
                + "working folder).",
            "Exit code 0: converged; 2: bad spec or data (nothing written); 3: fitted but not converged "
                + "(files written with \"converged\": false); 1: internal error."
        })
final class FitCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "SPEC.json", description = "The spec (see: cairn schema); - reads it from standard input.")
    Path spec;

    @Option(names = "--out", paramLabel = "DIR", description = "Folder for result.json, draws.csv and report.html.")
    Path out;

    @Option(names = "--json", description = "Write result.json to standard output (and nothing else there).")
    boolean json;

    @Option(names = "--threads", paramLabel = "N", description = "Worker threads (results do not depend on it).")
    Integer threads;

    @Option(names = "--quiet", description = "Print nothing but errors.")
    boolean quiet;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec command;

    /**
     * result.json and the report on this thread while draws.csv (hundreds of megabytes for a large fit) is
     * written on another: the files are independent, and the draws are immutable.
     */
    private void writeAll(FitOutcome outcome, java.nio.file.Path folder) {
        java.util.concurrent.ExecutorService drawsWriter = java.util.concurrent.Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "cairn-draws-writer");
            t.setDaemon(true);
            return t;
        });
        try {
            java.util.concurrent.Future<?> draws = drawsWriter.submit(() -> ResultWriter.writeDraws(outcome, folder));
            ResultWriter.writeResult(outcome, folder);
            dev.cairn.cli.report.ReportWriter.write(outcome, spec.getFileName().toString(), folder);
            try {
                draws.get();
            } catch (java.util.concurrent.ExecutionException e) {
                if (e.getCause() instanceof RuntimeException re) {
                    throw re;
                }
                if (e.getCause() instanceof Error err) {
                    throw err;
                }
                throw new IllegalStateException(e.getCause());
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new java.util.concurrent.CancellationException("interrupted");
            }
        } finally {
            drawsWriter.shutdownNow();
        }
    }

    @Override
    public Integer call() {
        PrintWriter stdout = command.commandLine().getOut();
        PrintWriter err = command.commandLine().getErr();
        if (threads != null && threads < 1) {
            err.println("cairn fit: --threads must be >= 1, was " + threads);
            return ExitCodes.BAD_INPUT;
        }
        if (out == null && !json) {
            err.println("cairn fit: say where the result goes: --out DIR (files) or --json (result.json on standard output)");
            return ExitCodes.BAD_INPUT;
        }
        FitOutcome outcome;
        dev.cairn.samplers.Progress progress = ProgressBar.forTerminal(quiet, "fitting");
        try (OutputFolder folder = out == null ? null : OutputFolder.claim(out)) {
            try {
                FitOptions options = (threads == null ? FitOptions.DEFAULT : FitOptions.DEFAULT.withThreads(threads))
                        .withProgress(progress);
                outcome = fromStandardInput() ? Cairn.fit(readStandardInput(), Path.of("").toAbsolutePath(), options)
                        : Cairn.fit(spec, options);
            } finally {
                ProgressBar.finish(progress);
            }
            if (folder != null) {
                try {
                    writeAll(outcome, folder.folder());
                    folder.commit();
                } catch (java.io.UncheckedIOException e) {
                    err.println("cairn fit: cannot write the results into --out " + out + " ("
                            + Messages.ioReason(e.getCause()) + "); the previous results there are unchanged");
                    return ExitCodes.BAD_INPUT;
                }
            }
        } catch (InputException e) {
            err.println("cairn fit: " + e.getMessage());
            return ExitCodes.BAD_INPUT;
        }
        if (json) {
            stdout.print(ResultWriter.asciiJson(outcome.result()));
            stdout.flush();
        } else if (!quiet) {
            stdout.print(ResultPrinter.print(outcome.result()));
            stdout.println("\nWrote " + out.resolve(ResultWriter.RESULT) + ", " + out.resolve(ResultWriter.DRAWS) + " and "
                    + out.resolve(dev.cairn.cli.report.ReportWriter.REPORT));
            stdout.flush();
        }
        return outcome.result().converged() ? ExitCodes.OK : ExitCodes.NOT_CONVERGED;
    }

    private boolean fromStandardInput() {
        return spec.toString().equals("-");
    }

    /** The spec as JSON text on standard input (UTF-8, as RFC 8259 has it). */
    private static dev.cairn.models.spec.Spec readStandardInput() {
        String text;
        try {
            text = new String(System.in.readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        } catch (java.io.IOException e) {
            throw new InputException("standard input: cannot be read (" + Messages.ioReason(e) + ")");
        }
        if (text.isBlank()) {
            throw new InputException("standard input: no spec (SPEC.json '-' reads the spec from standard input)");
        }
        return dev.cairn.models.spec.SpecReader.parse(text, "standard input");
    }
}
