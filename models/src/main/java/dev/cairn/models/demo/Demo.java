package dev.cairn.models.demo;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.FitOutcome;
import dev.cairn.models.ResultWriter;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * The demo: builds the invented scenario's data in a folder, copies every example spec beside it, fits
 * each, and writes each result into a sub-folder named after the spec.
 */
public final class Demo {
    private static final String EXAMPLES = "/dev/cairn/models/examples/";

    private Demo() {
    }

    /** One fitted example: its spec name, the folder its outputs went to, and the outcome. */
    public record Example(String spec, Path folder, FitOutcome outcome) {
    }

    /** {@return the example spec names, in the order the demo fits them} */
    public static List<String> examples() {
        return resource("index.txt").lines().map(String::strip).filter(s -> !s.isEmpty()).toList();
    }

    /**
     * The text of a bundled example spec.
     *
     * @param name the example's name (without .json)
     * @return the spec's JSON text
     */
    public static String exampleText(String name) {
        return resource(name);
    }

    /**
     * Writes data and specs into {@code dir}, then fits every example; {@code each} sees each fit as it ends.
     *
     * @param dir     the folder to write into (created)
     * @param options the fits' options
     * @param each    called with each fit as it ends
     * @return every fit, in the order the demo fits them
     */
    public static List<Example> run(Path dir, FitOptions options, java.util.function.Consumer<Example> each) {
        DemoScenario.writeUsers(dir);
        RetentionScenario.write(dir);
        List<Example> out = new ArrayList<>();
        for (String name : examples()) {
            try {
                Path spec = dir.resolve(name);
                Files.writeString(spec, exampleText(name), StandardCharsets.UTF_8);
                FitOutcome outcome = Cairn.fit(spec, options);
                Path folder = dir.resolve(name.replaceFirst("\\.json$", ""));
                ResultWriter.write(outcome, folder);
                Example f = new Example(name, folder, outcome);
                out.add(f);
                each.accept(f);
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
        return out;
    }

    /** The example plan spec: the next test, planned from the first example's fit (its baseline). */
    public static final String PLAN = "store-layout-next.plan.json";

    /** The example plan, run: its spec name, the folder its outputs went to, and the figures. */
    public record PlanExample(String spec, Path folder, dev.cairn.models.plan.PlanResult plan) {
    }

    /**
     * Writes the example plan spec into {@code dir} and runs it; its baseline is drawn from the posterior of
     * {@code store-layout-arpu}'s control, so {@link #run} must have run into the same folder first.
     *
     * @param dir     the demo's folder
     * @param threads worker threads
     * @return the plan, with plan.json and plan.csv written into its folder
     */
    public static PlanExample runPlan(Path dir, int threads) {
        try {
            Path spec = dir.resolve(PLAN);
            Files.writeString(spec, exampleText(PLAN), StandardCharsets.UTF_8);
            dev.cairn.models.plan.PlanResult plan = dev.cairn.models.plan.Planner.run(
                    dev.cairn.models.plan.PlanReader.read(spec), threads, dev.cairn.samplers.Progress.NONE);
            Path folder = dir.resolve(PLAN.replaceFirst("\\.json$", "").replace('.', '-'));
            Files.createDirectories(folder);
            dev.cairn.models.plan.PlanFiles.write(plan, folder);
            return new PlanExample(PLAN, folder, plan);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static String resource(String name) {
        try (InputStream in = Demo.class.getResourceAsStream(EXAMPLES + name)) {
            if (in == null) {
                throw new IllegalStateException("example missing from the jar: " + name);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
