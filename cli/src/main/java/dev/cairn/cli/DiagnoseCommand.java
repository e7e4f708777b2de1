package dev.cairn.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.diagnostics.Diagnostics;
import dev.cairn.diagnostics.DiagnosticsReport;
import dev.cairn.diagnostics.ParameterDiagnostics;
import dev.cairn.diagnostics.Thresholds;
import dev.cairn.samplers.DrawsCsv;
import dev.cairn.samplers.DrawsFile;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code cairn diagnose DRAWS.csv [--json]}: convergence diagnostics of draws from any sampler. */
@Command(name = "diagnose",
        mixinStandardHelpOptions = true,
        description = {
            "Convergence diagnostics of MCMC draws: rank-normalised split R-hat (bulk and folded), bulk- and "
                + "tail-ESS and the MCSE of the mean (Vehtari et al. 2021).",
            "DRAWS.csv has the columns chain,iteration,<parameter>... with one row per draw.",
            "Exit code 0: converged; 2: the file is not valid draws; 3: not converged."
        })
final class DiagnoseCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "DRAWS.csv", description = "Draws in the chain,iteration,<parameter>... format.")
    Path file;

    @Option(names = "--json", description = "Print the machine-readable form instead of the table.")
    boolean json;

    @Option(names = "--max-rhat", paramLabel = "R", defaultValue = "1.01",
            description = "Largest R-hat accepted as converged (default ${DEFAULT-VALUE}).")
    double maxRhat;

    @Option(names = "--min-ess-per-chain", paramLabel = "N", defaultValue = "100",
            description = "Bulk- and tail-ESS needed per chain (default ${DEFAULT-VALUE}).")
    double minEssPerChain;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        try {
            Thresholds thresholds = thresholds();
            Diagnosed d = diagnose(file, thresholds);
            if (json) {
                out.println(toJson(d.report, d.chains, d.draws));
            } else {
                out.print(table(d.report, d.chains, d.draws, file));
            }
            out.flush();
            return d.report.converged() ? ExitCodes.OK : ExitCodes.NOT_CONVERGED;
        } catch (BadInput e) {
            err.println("cairn diagnose: " + e.getMessage());
            return ExitCodes.BAD_INPUT;
        }
    }

    private Thresholds thresholds() {
        try {
            return new Thresholds(maxRhat, minEssPerChain);
        } catch (IllegalArgumentException e) {
            throw new BadInput("--max-rhat / --min-ess-per-chain: " + e.getMessage());
        }
    }

    /** A file's diagnostics with its shape. */
    record Diagnosed(DiagnosticsReport report, int chains, int draws) {
    }

    /**
     * Working memory of one parameter's diagnostics, in multiples of its draws: the pooled and split copies,
     * the sort order, the rank-normal and folded values and the autocovariance buffers (an upper estimate).
     */
    static final int WORKING_COPIES = 12;

    /**
     * Diagnoses a draws file without holding it: one pass checks the text and spills the values in binary
     * to the temporary folder ({@code java.io.tmpdir}); then blocks of parameters, as many as half the free
     * heap holds with their working memory, are read back and diagnosed in turn.
     */
    static Diagnosed diagnose(Path file, Thresholds thresholds) {
        Runtime rt = Runtime.getRuntime();
        return diagnose(file, thresholds, (rt.maxMemory() - (rt.totalMemory() - rt.freeMemory())) / 2);
    }

    /** {@link #diagnose(Path, Thresholds)} within {@code budget} bytes of heap for draws and working memory. */
    static Diagnosed diagnose(Path file, Thresholds thresholds, long budget) {
        if (Files.isDirectory(file)) {
            throw new BadInput(file + ": is a folder, expected a draws CSV file");
        }
        try (Reader r = new java.io.InputStreamReader(Files.newInputStream(file), StandardCharsets.UTF_8.newDecoder());
             DrawsFile draws = DrawsFile.read(r, Path.of(System.getProperty("java.io.tmpdir")))) {
            long column = draws.bytesPerColumn();
            int threads = Math.max(1, Math.min(Runtime.getRuntime().availableProcessors(), (int) Math.min(Integer.MAX_VALUE,
                    budget / ((WORKING_COPIES + 1) * column))));
            long left = budget - (long) threads * WORKING_COPIES * column;
            if (left < column) {
                throw new BadInput(file + ": each parameter has " + draws.chains() * (long) draws.draws()
                        + " draws (" + megabytes(column) + " MB); diagnosing one needs about "
                        + megabytes((WORKING_COPIES + 1) * column * 2) + " MB of heap, more than this run has; "
                        + "raise it with CAIRN_JAVA_OPTS=-Xmx...");
            }
            int perBlock = (int) Math.max(1, Math.min(Integer.MAX_VALUE, left / column));
            List<ParameterDiagnostics> all = new ArrayList<>(draws.names().size());
            draws.columns(perBlock, (names, columns) -> {
                ParameterDiagnostics[] out = new ParameterDiagnostics[names.size()];
                java.util.stream.IntStream range = java.util.stream.IntStream.range(0, out.length);
                (threads > 1 ? range.parallel() : range).forEach(i -> out[i] = Diagnostics.of(names.get(i), columns.get(i)));
                all.addAll(List.of(out));
            });
            return new Diagnosed(DiagnosticsReport.of(all, thresholds), draws.chains(), draws.draws());
        } catch (NoSuchFileException e) {
            throw new BadInput(file + ": no such file");
        } catch (DrawsCsv.FormatException e) {
            throw new BadInput(file + ": " + e.getMessage());
        } catch (CharacterCodingException e) {
            throw new BadInput(file + ": not UTF-8 text");
        } catch (IOException e) {
            throw new BadInput(file + ": cannot be read, or its values not spilled to the temporary folder "
                    + System.getProperty("java.io.tmpdir") + " (" + Messages.ioReason(e) + ")");
        } catch (UncheckedIOException e) {
            if (e.getCause() instanceof CharacterCodingException) {
                throw new BadInput(file + ": not UTF-8 text");
            }
            throw new BadInput(file + ": cannot be read (" + Messages.ioReason(e.getCause()) + ")");
        }
    }

    private static long megabytes(long bytes) {
        return (bytes + (1 << 20) - 1) >> 20;
    }

    /** The contract's JSON form; undefined numbers are null. */
    static String toJson(DiagnosticsReport report, int chains, int draws) {
        ObjectMapper mapper = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
        ObjectNode root = mapper.createObjectNode();
        ArrayNode params = root.putArray("parameters");
        for (ParameterDiagnostics p : report.parameters()) {
            ObjectNode o = params.addObject();
            o.put("name", p.name());
            number(o, "mean", p.mean());
            number(o, "sd", p.sd());
            number(o, "rhat", p.rhat());
            number(o, "essBulk", p.essBulk());
            number(o, "essTail", p.essTail());
            number(o, "mcseMean", p.mcseMean());
            if (!p.note().isEmpty()) {
                o.put("note", p.note());
            }
        }
        number(root, "maxRhat", report.maxRhat());
        number(root, "minEssBulk", report.minEssBulk());
        number(root, "minEssTail", report.minEssTail());
        root.put("converged", report.converged());
        root.put("chains", chains);
        root.put("draws", draws);
        ObjectNode t = root.putObject("thresholds");
        t.put("maxRhat", report.thresholds().maxRhat());
        t.put("minEssPerChain", report.thresholds().minEssPerChain());
        ArrayNode reasons = root.putArray("reasons");
        report.reasons().forEach(reasons::add);
        return root.toPrettyString();
    }

    private static void number(ObjectNode o, String key, double v) {
        if (Double.isFinite(v)) {
            o.put(key, v);
        } else {
            o.putNull(key);
        }
    }

    /** The terminal table: one row per parameter, then the verdict and its reasons. */
    static String table(DiagnosticsReport report, int chains, int draws, Path file) {
        StringBuilder sb = new StringBuilder();
        sb.append(String.format("%s: %d chain%s x %d draws, %d parameter%s%n%n", file.getFileName(),
                chains, chains == 1 ? "" : "s", draws,
                report.parameters().size(), report.parameters().size() == 1 ? "" : "s"));
        int width = "parameter".length();
        for (ParameterDiagnostics p : report.parameters()) {
            width = Math.max(width, TerminalText.escape(p.name()).length());
        }
        String row = "%-" + width + "s  %11s  %10s  %7s  %9s  %9s  %10s%n";
        sb.append(String.format(row, "parameter", "mean", "sd", "R-hat", "bulk-ESS", "tail-ESS", "MCSE mean"));
        double need = report.thresholds().minEssPerChain() * chains;
        for (ParameterDiagnostics p : report.parameters()) {
            boolean bad = p.defined() && (!(p.rhat() < report.thresholds().maxRhat())
                    || p.essBulk() < need || p.essTail() < need);
            sb.append(String.format(row, TerminalText.escape(p.name()), Numbers.sig(p.mean(), 4), Numbers.sig(p.sd(), 3),
                    Numbers.fixed(p.rhat(), 3), Numbers.count(p.essBulk()), Numbers.count(p.essTail()),
                    Numbers.sig(p.mcseMean(), 2)).replaceFirst("\\n$", bad ? "   <- check\n" : "\n"));
        }
        sb.append('\n');
        if (report.converged()) {
            sb.append(String.format("Converged: R-hat at most %s (< %s), bulk-ESS at least %s, tail-ESS at least %s "
                            + "(>= %s).%n", Numbers.fixed(report.maxRhat(), 3), report.thresholds().maxRhat(),
                    Numbers.count(report.minEssBulk()), Numbers.count(report.minEssTail()), Numbers.count(need)));
        } else {
            sb.append("NOT converged - do not use these draws for decisions yet:\n");
            for (String r : report.reasons()) {
                sb.append("  - ").append(r).append('\n');
            }
            sb.append("Run longer chains or more warmup, or reparameterise.\n");
        }
        for (String n : report.notes()) {
            sb.append("note: ").append(n).append('\n');
        }
        return sb.toString();
    }
}
