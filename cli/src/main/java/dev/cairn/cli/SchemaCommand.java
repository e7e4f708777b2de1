package dev.cairn.cli;

import dev.cairn.models.spec.SpecSchema;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/** {@code cairn schema [--plan]}: print the spec's (or the plan spec's) JSON Schema (draft 2020-12). */
@Command(name = "schema", mixinStandardHelpOptions = true,
        description = "Print the JSON Schema (draft 2020-12) that every spec is validated against; with --plan, the "
                + "plan spec's (cairn plan).")
final class SchemaCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec command;

    @CommandLine.Option(names = "--plan", description = "Print the plan spec's schema instead.")
    boolean plan;

    @Override
    public Integer call() {
        command.commandLine().getOut().print(plan ? dev.cairn.models.plan.PlanReader.schemaText() : SpecSchema.text());
        command.commandLine().getOut().flush();
        return ExitCodes.OK;
    }
}
