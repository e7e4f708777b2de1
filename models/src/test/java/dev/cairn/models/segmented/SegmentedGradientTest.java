package dev.cairn.models.segmented;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.data.SegmentedSpendData;
import dev.cairn.models.data.SpendDataReader;
import dev.cairn.models.demo.StudioScaleScenario;
import dev.cairn.models.spec.DataSpec;
import dev.cairn.samplers.GradientCheck;
import dev.cairn.samplers.GradientTarget;
import dev.cairn.samplers.RandomStreams;
import java.nio.file.Path;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The analytic gradient of the segmented-spend density agrees with central differences in every
 * parameterisation, and the payer-rate and spend parts add up to the whole.
 */
class SegmentedGradientTest {
    @TempDir
    Path dir;

    @Test
    void gradientMatchesFiniteDifferences() {
        StudioScaleScenario.write(dir.resolve("cells.csv"), 12, 4, 5);
        DataSpec spec = new DataSpec("cells.csv", "summary", Map.of("segment", "segment"), null);
        SegmentedSpendData data = SpendDataReader.readSegmented(spec, dir, false);
        UniformRandomProvider rng = RandomStreams.forChain(17, 0);
        for (String parameterisation : new String[] {"auto", "centred", "non-centred"}) {
            SegmentedPosterior p = new SegmentedPosterior(data, "A", parameterisation);
            for (int trial = 0; trial < 3; trial++) {
                double[] x = p.density.start(rng);
                check(p.density, x, parameterisation);
                check(p.density.part(true), x, parameterisation + " payer part");
                check(p.density.part(false), x, parameterisation + " spend part");
                double whole = p.density.logDensity(x);
                double sum = p.density.part(true).logDensity(x) + p.density.part(false).logDensity(x);
                assertEquals(whole, sum, 1e-9 * Math.abs(whole), "the parts add up to the density");
            }
        }
    }

    private static void check(GradientTarget target, double[] x, String what) {
        double error = GradientCheck.maxError(target, x);
        assertTrue(error < 1e-5, what + ": " + error + " at " + GradientCheck.worst(target, x));
    }
}
