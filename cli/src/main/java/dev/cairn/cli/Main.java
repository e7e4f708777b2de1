package dev.cairn.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/** The {@code cairn} command: a thin shell over the models' Java API. */
@Command(name = "cairn",
        mixinStandardHelpOptions = true,
        versionProvider = Main.Version.class,
        description = {
            "Bayesian inference for revenue and retention experiments.",
            "",
            "Results are statistical estimates under stated model assumptions (independent users, the chosen "
                + "spend and retention families). Pricing and monetisation tests must follow local "
                + "consumer-protection law, rules for minors and paid random items, and app-store policies. "
                + "The output is not financial or legal advice."
        },
        subcommands = {FitCommand.class, PlanCommand.class, DiagnoseCommand.class, DemoCommand.class, SchemaCommand.class,
            ServeCommand.class,
            CommandLine.HelpCommand.class})
public final class Main implements Runnable {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    public static void main(String[] args) {
        System.setProperty("java.awt.headless", "true"); // charts are drawn to SVG, never to a screen
        int code;
        try {
            code = run(args);
        } catch (OutOfMemoryError e) { // thrown outside a command, e.g. while parsing a huge argument
            System.err.println("cairn: " + Messages.outOfMemory());
            code = ExitCodes.BAD_INPUT;
        }
        System.exit(code);
    }

    /** Runs the command line and returns its exit code (0 ok, 1 internal error, 2 bad input, 3 not converged). */
    public static int run(String... args) {
        return commandLine().execute(args);
    }

    static CommandLine commandLine() {
        return commandLine(new java.io.OutputStreamWriter(System.out, java.nio.charset.Charset.defaultCharset()),
                new java.io.OutputStreamWriter(System.err, java.nio.charset.Charset.defaultCharset()));
    }

    /** The command line writing to {@code out} and {@code err}, with control characters escaped (see {@link TerminalText}). */
    static CommandLine commandLine(java.io.Writer out, java.io.Writer err) {
        CommandLine cl = new CommandLine(new Main());
        cl.setOut(new java.io.PrintWriter(new TerminalText(out), true));
        cl.setErr(new java.io.PrintWriter(new TerminalText(err), true));
        cl.setExecutionExceptionHandler((ex, line, parsed) -> {
            // The user's input or machine (memory, files, disk): one line and exit 2; anything else is a bug.
            Throwable cause = ex;
            while (cause != null) {
                if (cause instanceof OutOfMemoryError) {
                    line.getErr().println("cairn: " + Messages.outOfMemory());
                    return ExitCodes.BAD_INPUT;
                }
                if (cause instanceof dev.cairn.models.InputException || cause instanceof BadInput) {
                    line.getErr().println("cairn: " + cause.getMessage());
                    return ExitCodes.BAD_INPUT;
                }
                if (cause instanceof java.io.IOException io) {
                    line.getErr().println("cairn: cannot read or write a file: " + Messages.ioReason(io));
                    return ExitCodes.BAD_INPUT;
                }
                cause = cause.getCause();
            }
            line.getErr().println("cairn: internal error: " + ex);
            return ExitCodes.INTERNAL_ERROR;
        });
        return cl;
    }

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    /** The version written into the jar at build time. */
    static final class Version implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            return new String[] {"cairn " + version()};
        }
    }

    static String version() {
        return dev.cairn.models.Version.get();
    }
}
