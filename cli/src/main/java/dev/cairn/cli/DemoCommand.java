package dev.cairn.cli;

import dev.cairn.models.FitOptions;
import dev.cairn.models.InputException;
import dev.cairn.models.demo.Demo;
import dev.cairn.models.demo.DemoScenario;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code cairn demo [--out DIR]}: build the invented demo data and fit every example spec. */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = {
            "Build the demo data - Lantern Reef, an invented game by the invented studio Driftwood Forge, "
                + "testing four store layouts on 160,000 simulated players with known true parameters - and "
                + "fit every example spec on it; then plan the next test from the first fit (cairn plan).",
            "Exit code 0 when every fit converged, 3 otherwise."
        })
final class DemoCommand implements Callable<Integer> {

    @Option(names = "--out", paramLabel = "DIR", defaultValue = "demo-out",
            description = "Folder for the data, the specs and one result folder per spec (default: ${DEFAULT-VALUE}).")
    Path out;

    @Option(names = "--quiet", description = "No progress bar.")
    boolean quiet;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() {
        PrintWriter stdout = command.commandLine().getOut();
        stdout.println("Demo data: " + out.resolve(DemoScenario.USERS_FILE) + " (true parameters in the README).");
        stdout.flush();
        List<Demo.Example> fitted;
        try {
            dev.cairn.samplers.Progress progress = ProgressBar.forTerminal(quiet, "demo");
            fitted = Demo.run(out, FitOptions.DEFAULT.withProgress(progress), f -> {
                ProgressBar.finish(progress);
                dev.cairn.cli.report.ReportWriter.write(f.outcome(), f.spec(), f.folder());
                stdout.println();
                stdout.println("=== " + f.spec() + " ===");
                stdout.print(ResultPrinter.print(f.outcome().result()));
                stdout.println("Wrote " + f.folder().resolve("result.json") + ", draws.csv and report.html");
                stdout.flush();
            });
        } catch (InputException e) {
            command.commandLine().getErr().println("cairn demo: " + e.getMessage());
            return ExitCodes.BAD_INPUT;
        }
        boolean all = fitted.stream().allMatch(f -> f.outcome().result().converged());
        if (all) {
            Demo.PlanExample plan = Demo.runPlan(out, Runtime.getRuntime().availableProcessors());
            dev.cairn.cli.report.PlanReport.write(plan.plan(), plan.spec(), plan.folder());
            stdout.println();
            stdout.println("=== " + plan.spec() + " (cairn plan) ===");
            stdout.print(PlanPrinter.print(plan.plan()));
            stdout.println("Wrote " + plan.folder().resolve("plan.json") + ", plan.csv and report.html");
            stdout.flush();
        }
        return all ? ExitCodes.OK : ExitCodes.NOT_CONVERGED;
    }
}
