package dev.cairn.cli;

import dev.cairn.cli.report.PlanReport;
import dev.cairn.models.InputException;
import dev.cairn.models.OutputFolder;
import dev.cairn.models.ResultWriter;
import dev.cairn.models.plan.PlanFiles;
import dev.cairn.models.plan.PlanReader;
import dev.cairn.models.plan.PlanResult;
import dev.cairn.models.plan.PlanSpec;
import dev.cairn.models.plan.Planner;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code cairn plan PLAN.json --out DIR}: simulate a planned test under its decision rule. */
@Command(name = "plan",
        mixinStandardHelpOptions = true,
        description = {
            "Simulate whole tests under a plan (assumed truth, users per day, decision rule, looks) and write "
                + "DIR/plan.json, DIR/plan.csv (one row per look day) and DIR/report.html; the summary is printed first.",
            "The plan spec's schema: cairn schema --plan. With --json, plan.json goes to standard output.",
            "Exit code 0: done; 2: bad plan spec or files (nothing written); 1: internal error."
        })
final class PlanCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "PLAN.json", description = "The plan spec (see: cairn schema --plan).")
    Path spec;

    @Option(names = "--out", paramLabel = "DIR", description = "Folder for plan.json, plan.csv and report.html.")
    Path out;

    @Option(names = "--json", description = "Write plan.json to standard output (and nothing else there).")
    boolean json;

    @Option(names = "--threads", paramLabel = "N", description = "Worker threads (the figures do not depend on them); "
            + "default: every core.")
    Integer threads;

    @Option(names = "--quiet", description = "Print nothing but errors.")
    boolean quiet;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() {
        PrintWriter stdout = command.commandLine().getOut();
        PrintWriter err = command.commandLine().getErr();
        if (threads != null && threads < 1) {
            err.println("cairn plan: --threads must be >= 1, was " + threads);
            return ExitCodes.BAD_INPUT;
        }
        if (out == null && !json) {
            err.println("cairn plan: say where the plan goes: --out DIR (files) or --json (plan.json on standard output)");
            return ExitCodes.BAD_INPUT;
        }
        PlanResult plan;
        try (OutputFolder folder = out == null ? null : OutputFolder.claim(out)) {
            PlanSpec p = PlanReader.read(spec);
            dev.cairn.samplers.Progress progress = ProgressBar.forTerminal(quiet || json, "simulating");
            try {
                plan = Planner.run(p, threads != null ? threads : Runtime.getRuntime().availableProcessors(), progress);
            } finally {
                ProgressBar.finish(progress);
            }
            if (folder != null) {
                try {
                    PlanFiles.write(plan, folder.folder());
                    PlanReport.write(plan, spec.getFileName().toString(), folder.folder());
                    folder.commit();
                } catch (java.io.UncheckedIOException e) {
                    err.println("cairn plan: cannot write into --out " + out + " (" + Messages.ioReason(e.getCause())
                            + "); the previous files there are unchanged");
                    return ExitCodes.BAD_INPUT;
                }
            }
        } catch (InputException e) {
            err.println("cairn plan: " + e.getMessage());
            return ExitCodes.BAD_INPUT;
        }
        if (json) {
            stdout.print(ResultWriter.jsonOf(plan) + "\n");
        } else if (!quiet) {
            stdout.print(PlanPrinter.print(plan));
            stdout.println("\nWrote " + out.resolve(PlanFiles.JSON) + ", " + out.resolve(PlanFiles.CSV) + " and "
                    + out.resolve(dev.cairn.cli.report.ReportWriter.REPORT));
        }
        stdout.flush();
        return ExitCodes.OK;
    }
}
