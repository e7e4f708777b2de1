package dev.cairn.samplers;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/** Invalid settings are refused when made, with a message that names the bad value. */
class ArgumentsTest {

    private static void refused(Executable e, String... fragments) {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, e);
        for (String f : fragments) {
            assertTrue(ex.getMessage().contains(f), "'" + ex.getMessage() + "' should mention '" + f + "'");
        }
    }

    @Test
    void stepSettings() {
        refused(() -> SliceStep.of(-1.0), "slice width", "-1.0");
        refused(() -> SliceStep.of(Double.NaN), "slice width", "NaN");
        refused(() -> SliceStep.of(1.0, null, 0), "maxStepsOut", "0");
        refused(() -> MetropolisStep.of(0.0), "proposal scale", "0.0");
        refused(() -> BlockMetropolisStep.of(Double.POSITIVE_INFINITY), "proposal scale", "Infinity");
        refused(() -> SliceStep.of(1.0, new int[] {0, 0}), "coordinate 0", "twice");
        refused(() -> Sweep.of(), "at least one step");
    }

    @Test
    void runSettings() {
        refused(() -> RunSettings.of(0, 100, 100, 1), "chains", "0");
        refused(() -> RunSettings.of(4, -5, 100, 1), "warmup", "-5");
        refused(() -> RunSettings.of(4, 100, 0, 1), "draws", "0");
        refused(() -> RunSettings.of(4, 100, 100, 1).withThreads(0), "threads", "0");
        refused(() -> RunSettings.of(4, 100, 100, 1).withThin(-2), "thin", "-2");
        refused(() -> RunSettings.of(4, 100, 2_000_000_000, 1), "warmup + draws");
    }

    @Test
    void startingValues() {
        refused(() -> Initializer.fixed(0.0, Double.NaN), "initial value 2", "NaN");
        refused(() -> Initializer.uniform(0), "initial radius", "0");
        Target t = Target.of(Parameters.real("mu", "tau"), x -> 0);
        refused(() -> Chain.start(t, Sweep.of(SliceStep.of(1)), (c, p, rng) -> new double[] {0, Double.NaN}, 0,
                RandomStreams.forChain(1, 0)), "'tau'", "NaN");
        refused(() -> Chain.start(t, Sweep.of(SliceStep.of(1)), Initializer.fixed(1.0), 0,
                RandomStreams.forChain(1, 0)), "expected 2 values, was 1");
    }

    @Test
    void coordinatesOutsideTheTarget() {
        Target t = Target.of(Parameters.real("mu"), x -> 0);
        refused(() -> SliceStep.of(1, new int[] {3}).start(t, RandomStreams.forChain(1, 0)), "coordinate 3", "0..0");
    }
}
