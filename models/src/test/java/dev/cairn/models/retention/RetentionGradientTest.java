package dev.cairn.models.retention;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.data.CohortDays;
import dev.cairn.models.demo.RetentionScaleScenario;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.samplers.GradientCheck;
import dev.cairn.samplers.RandomStreams;
import java.nio.file.Path;
import org.apache.commons.rng.UniformRandomProvider;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The analytic gradient of the retention density agrees with central differences, both curve families. */
class RetentionGradientTest {
    @TempDir
    Path dir;

    @Test
    void gradientMatchesFiniteDifferences() {
        for (boolean survival : new boolean[] {false, true}) {
            Path file = RetentionScaleScenario.write(dir.resolve(survival + ".csv"), 5, 3, survival, 3);
            CohortDays data = CohortDays.read(new DataSpec(file.getFileName().toString(), "cohort-days", null, null), dir, survival);
            RetentionPosterior m = new RetentionPosterior(data, "A", survival);
            UniformRandomProvider rng = RandomStreams.forChain(9, 0);
            for (int trial = 0; trial < 5; trial++) {
                double[] x = m.start(rng);
                double error = GradientCheck.maxError(m.density, x);
                assertTrue(error < 1e-5, (survival ? "survival" : "activity") + ": " + error + " at "
                        + GradientCheck.worst(m.density, x));
            }
        }
    }
}
