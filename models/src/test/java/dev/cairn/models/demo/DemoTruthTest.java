package dev.cairn.models.demo;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.FitOptions;
import dev.cairn.models.result.Interval;
import dev.cairn.models.result.Result;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The demo against its own truth: every spend example's 95% interval of each arm's payer rate and ARPU (for
 * the regional split, the population's) contains the true value {@link DemoScenario} generated the players
 * from. The data and seeds are fixed, so this is one fixed draw of the data: it checks that the fits recover
 * the generator, not a coverage rate (the coverage tests in the model packages do that).
 */
class DemoTruthTest {
    @TempDir
    Path dir;

    @Test
    void spendExamplesContainTheGeneratorsValues() {
        List<String> misses = new ArrayList<>();
        int checked = 0;
        for (Demo.Example e : Demo.run(dir, FitOptions.DEFAULT, f -> { })) {
            if (!(e.outcome().result() instanceof Result r)) {
                continue;
            }
            for (DemoScenario.Arm arm : DemoScenario.ARMS) {
                var summary = r.arms().get(arm.name());
                checked += 2;
                if (!covers(summary.payerRate(), arm.payerRate())) {
                    misses.add(e.spec() + " " + arm.name() + " payer rate " + summary.payerRate() + " vs " + arm.payerRate());
                }
                if (summary.arpu() != null && !covers(summary.arpu(), arm.trueArpu())) {
                    misses.add(e.spec() + " " + arm.name() + " ARPU " + summary.arpu() + " vs " + arm.trueArpu());
                }
            }
        }
        assertTrue(checked >= 24, "the spend examples were checked: " + checked);
        assertTrue(misses.isEmpty(), String.join("\n", misses));
    }

    private static boolean covers(Interval i, double truth) {
        return i.lo() <= truth && truth <= i.hi();
    }
}
