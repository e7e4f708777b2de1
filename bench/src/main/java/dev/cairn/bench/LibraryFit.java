package dev.cairn.bench;

import dev.cairn.models.FitOptions;
import dev.cairn.models.Fitted;
import dev.cairn.models.result.Result;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;

/**
 * A program that uses cairn as a library (this module depends on cairn-models through Maven): a revenue
 * comparison of three in-memory arms, built with {@code Spec.builder} and fitted with {@code Fitted.revenue},
 * default settings (the exact sampler, 4 chains x 1,000 draws). Ten warm-up fits, then the median and the
 * slowest of 30 timed ones. Run: {@code java -cp bench/target/benchmarks.jar dev.cairn.bench.LibraryFit}
 */
public final class LibraryFit {
    private LibraryFit() {
    }

    public static void main(String[] args) {
        Spec spec = Spec.builder("spend").currency("EUR")
                .summaryRow("A", 1000, 30, 60.5, 160.2)
                .summaryRow("B", 1000, 40, 82.0, 215.0)
                .summaryRow("C", 1000, 35, 70.1, 180.4)
                .build();
        for (int i = 0; i < 10; i++) {
            Fitted.revenue(spec, Path.of("."), FitOptions.DEFAULT);
        }
        double[] seconds = new double[30];
        String decision = null;
        for (int i = 0; i < seconds.length; i++) {
            long t0 = System.nanoTime();
            Fitted<Result> fit = Fitted.revenue(spec, Path.of("."), FitOptions.DEFAULT);
            seconds[i] = (System.nanoTime() - t0) / 1e9;
            decision = fit.result().decision().outcome();
        }
        Arrays.sort(seconds);
        System.out.printf(Locale.ROOT, "three in-memory arms, warm: median %.3f s, slowest %.3f s (decision: %s)%n",
                seconds[seconds.length / 2], seconds[seconds.length - 1], decision);
    }
}
