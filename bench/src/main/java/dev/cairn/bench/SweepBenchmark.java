package dev.cairn.bench;

import dev.cairn.samplers.Chain;
import dev.cairn.samplers.Initializer;
import dev.cairn.samplers.Parameters;
import dev.cairn.samplers.RandomStreams;
import dev.cairn.samplers.SliceStep;
import dev.cairn.samplers.MetropolisStep;
import dev.cairn.samplers.Sweep;
import dev.cairn.samplers.Target;
import dev.cairn.samplers.Transform;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Sweeps per second on a 100-dimensional Gaussian with scales 1..10 (independent coordinates), for the
 * slice sweep and the Metropolis-within-Gibbs sweep. Each coordinate update evaluates the full log density
 * (the generic case, no conditional structure), so one sweep costs O(d^2) arithmetic. Tuning is adapted
 * in setup and frozen while measuring, as for kept draws.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class SweepBenchmark {
    static final int DIMENSION = 100;

    @Param({"slice", "metropolis-within-gibbs"})
    public String method;

    private Chain chain;

    @Setup
    public void setUp() {
        double[] precision = new double[DIMENSION];
        for (int i = 0; i < DIMENSION; i++) {
            double sd = 1 + 9.0 * i / (DIMENSION - 1);
            precision[i] = 1 / (sd * sd);
        }
        Target gaussian = Target.of(Parameters.builder().vector("x", DIMENSION, Transform.REAL).build(), x -> {
            double s = 0;
            for (int i = 0; i < x.length; i++) {
                s += x[i] * x[i] * precision[i];
            }
            return -0.5 * s;
        });
        Sweep sweep = method.equals("slice") ? Sweep.of(SliceStep.of(1.0)) : Sweep.of(MetropolisStep.of(1.0));
        chain = Chain.start(gaussian, sweep, Initializer.uniform(2), 0, RandomStreams.forChain(1, 0));
        for (int t = 0; t < 1000; t++) {
            chain.iterate(true);
        }
    }

    @Benchmark
    public double sweep() {
        chain.iterate(false);
        return chain.state().logDensity();
    }
}
