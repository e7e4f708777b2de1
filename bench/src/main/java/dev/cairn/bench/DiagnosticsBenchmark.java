package dev.cairn.bench;

import dev.cairn.diagnostics.Diagnostics;
import dev.cairn.diagnostics.DiagnosticsReport;
import dev.cairn.diagnostics.Thresholds;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Wall time to diagnose 4 chains x 100,000 draws x 50 parameters (R-hat bulk and folded, bulk- and
 * tail-ESS, MCSE of the mean), all cores. Target: under 2 s on 2 cores. The draws are AR(1) chains with
 * coefficients from 0 to 0.9, so Geyer truncation happens at different lags.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3)
@Measurement(iterations = 10)
@Fork(value = 1, jvmArgs = {"-Xmx4g"})
public class DiagnosticsBenchmark {
    private final List<String> names = new ArrayList<>();
    private final List<double[][]> draws = new ArrayList<>();

    @Setup
    public void setUp() {
        SplittableRandom random = new SplittableRandom(1);
        for (int p = 0; p < 50; p++) {
            double rho = 0.9 * p / 49;
            double[][] x = new double[4][100_000];
            for (double[] chain : x) {
                double v = random.nextGaussian() / Math.sqrt(1 - rho * rho);
                for (int t = 0; t < chain.length; t++) {
                    chain[t] = v;
                    v = rho * v + random.nextGaussian();
                }
            }
            names.add("p" + p);
            draws.add(x);
        }
    }

    @Benchmark
    public DiagnosticsReport diagnose() {
        return Diagnostics.of(names, draws, Thresholds.DEFAULT);
    }
}
