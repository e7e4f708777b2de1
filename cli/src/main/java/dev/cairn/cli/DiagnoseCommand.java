package dev.cairn.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.cairn.diagnostics.Diagnostics;
import dev.cairn.diagnostics.DiagnosticsReport;
import dev.cairn.diagnostics.ParameterDiagnostics;
import dev.cairn.diagnostics.Thresholds;
import dev.cairn.samplers.Draws;
import dev.cairn.samplers.DrawsCsv;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.Reader;
import java.nio.charset.MalformedInputException;
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
            Draws draws = read(file);
            List<double[][]> columns = new ArrayList<>();
            for (String name : draws.names()) {
                columns.add(draws.column(name));
            }
            DiagnosticsReport report = Diagnostics.of(draws.names(), columns, thresholds);
            if (json) {
                out.println(toJson(report, draws));
            } else {
                out.print(table(report, draws, file));
            }
            out.flush();
            return report.converged() ? ExitCodes.OK : ExitCodes.NOT_CONVERGED;
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

    static Draws read(Path file) {
        if (Files.isDirectory(file)) {
            throw new BadInput(file + ": is a folder, expected a draws CSV file");
        }
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return DrawsCsv.read(r);
        } catch (NoSuchFileException e) {
            throw new BadInput(file + ": no such file");
        } catch (MalformedInputException e) {
            throw new BadInput(file + ": not UTF-8 text");
        } catch (DrawsCsv.FormatException e) {
            throw new BadInput(file + ": " + e.getMessage());
        } catch (IOException e) {
            throw new BadInput(file + ": cannot be read (" + e.getMessage() + ")");
        } catch (java.io.UncheckedIOException e) {
            if (e.getCause() instanceof MalformedInputException) {
                throw new BadInput(file + ": not UTF-8 text");
            }
            throw new BadInput(file + ": cannot be read (" + e.getCause().getMessage() + ")");
        }
    }

    /** The contract's JSON form; undefined numbers are null. */
    static String toJson(DiagnosticsReport report, Draws draws) {
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
        root.put("chains", draws.chains());
        root.put("draws", draws.iterations());
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
    static String table(DiagnosticsReport report, Draws draws, Path file) {
        StringBuilder sb = new StringBuilder();
        sb.append(String.format("%s: %d chain%s x %d draws, %d parameter%s%n%n", file.getFileName(),
                draws.chains(), draws.chains() == 1 ? "" : "s", draws.iterations(),
                draws.names().size(), draws.names().size() == 1 ? "" : "s"));
        int width = "parameter".length();
        for (ParameterDiagnostics p : report.parameters()) {
            width = Math.max(width, p.name().length());
        }
        String row = "%-" + width + "s  %11s  %10s  %7s  %9s  %9s  %10s%n";
        sb.append(String.format(row, "parameter", "mean", "sd", "R-hat", "bulk-ESS", "tail-ESS", "MCSE mean"));
        double need = report.thresholds().minEssPerChain() * draws.chains();
        for (ParameterDiagnostics p : report.parameters()) {
            boolean bad = p.defined() && (!(p.rhat() < report.thresholds().maxRhat())
                    || p.essBulk() < need || p.essTail() < need);
            sb.append(String.format(row, p.name(), Numbers.sig(p.mean(), 4), Numbers.sig(p.sd(), 3),
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
