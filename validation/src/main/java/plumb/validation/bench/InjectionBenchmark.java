package plumb.validation.bench;

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
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.InjectionToys;
import plumb.engine.inference.ToyFit;

import java.util.concurrent.TimeUnit;

/**
 * 1,000 injection toys of the medium generated model at μ = 1 (generated, fitted from the toys'
 * start, summarised), single shot. {@code threads = 1} is the baseline of the same work on one
 * thread: both parameters fit the same toys (seeds 2, 3, 4 after the warm-up), so their ratio is
 * the speed-up of a second thread.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 1)
@Measurement(iterations = 3)
@Fork(value = 1, jvmArgs = {"-Xmx1g"})
public class InjectionBenchmark {

    /** Toys per measurement (1,000 injection toys of the medium generated model). */
    public static final int TOYS = 1000;

    @Param({"2", "1"})
    public int threads;

    private InjectionToys toys;
    private double[] point;
    private String[] names;
    private long seed;

    @Setup
    public void setup() {
        CompiledModel m = BenchModels.compiled("medium");
        toys = new InjectionToys(m, FitSettings.defaults(), new int[0], new double[0]);
        point = toys.generatingPoint(1, false).values();
        int[] pulled = toys.pulledParameters();
        names = new String[pulled.length];
        for (int k = 0; k < names.length; k++) names[k] = m.parameterNames(pulled[k]);
    }

    @Benchmark
    public InjectionSummary thousandToys() {
        // a new seed per shot: each measurement fits 1,000 toys it has not seen
        ToyFit[] fits = toys.run(point, ++seed, true, 0, TOYS, threads, null);
        InjectionSummary s = InjectionSummary.of(1, fits, names);
        if (s.converged() < 0.95 * TOYS) throw new IllegalStateException("too few toys converged: " + s.nonConverged());
        return s;
    }
}
