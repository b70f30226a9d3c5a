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
 * start, summarised), single shots. {@code threads = 1} is the baseline of the same work on one
 * thread: both parameters fit the same toys (the shot after the warm-up shots takes seed 7, then
 * 8, … in every fork), so their ratio is the speed-up of a second thread.
 *
 * <p>The warm-up is long on purpose: the JIT compiler keeps compiling (C2, the large fit and
 * likelihood methods, then the rarer paths) through the first ~5,000 toys, several CPU-seconds in
 * all. On two cores a single worker leaves it the free core, while two workers share their cores
 * with it, so shots taken early (one warm-up shot) measure the compiler as much as the toys and
 * showed a speed-up of 1.45 where rounds of 3,000 toys showed 2.04. Two forks, as compiled code and hence
 * the time per toy differ a little from one JVM to the next.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 6)
@Measurement(iterations = 6)
@Fork(value = 2, jvmArgs = {"-Xmx1g"})
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
