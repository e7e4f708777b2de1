package dev.cairn.cli;

import dev.cairn.models.spec.SpecSchema;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/** {@code cairn schema}: print the spec's JSON Schema (draft 2020-12). */
@Command(name = "schema", mixinStandardHelpOptions = true,
        description = "Print the JSON Schema (draft 2020-12) that every spec is validated against.")
final class SchemaCommand implements Callable<Integer> {
    @CommandLine.Spec
    CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() {
        command.commandLine().getOut().print(SpecSchema.text());
        command.commandLine().getOut().flush();
        return ExitCodes.OK;
    }
}
