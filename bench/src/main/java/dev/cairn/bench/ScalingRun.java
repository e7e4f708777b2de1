package dev.cairn.bench;

import dev.cairn.models.Cairn;
import dev.cairn.models.FitOptions;
import dev.cairn.models.result.FitResult;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

/** What the scaling benchmarks share: their arguments ([DIR] [SIZES...]) and one timed fit after a warm-up. */
final class ScalingRun {
    final Path dir;
    final int[] sizes;
    private boolean warm;

    ScalingRun(String[] args, int... defaultSizes) throws IOException {
        dir = Path.of(args.length > 0 ? args[0] : "bench-data");
        Files.createDirectories(dir);
        sizes = args.length > 1 ? java.util.Arrays.stream(args, 1, args.length).mapToInt(Integer::parseInt).toArray()
                : defaultSizes;
    }

    /** A fit's result and its wall time. */
    record Timed(FitResult result, double seconds) {
    }

    /** Fits the spec (after one dropped run the first time: JIT warm-up). */
    Timed fit(Path spec) {
        if (!warm) {
            Cairn.fit(spec, FitOptions.DEFAULT);
            warm = true;
        }
        long t0 = System.nanoTime();
        FitResult r = Cairn.fit(spec, FitOptions.DEFAULT).result();
        return new Timed(r, (System.nanoTime() - t0) / 1e9);
    }
}
