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
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Impacts;
import plumb.engine.likelihood.DataSet;

import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * Impacts rankings on the generated models, the best fit done in setup. {@code exactRanking}:
 * every constrained parameter refitted four times on 2 threads (γ not ranked), single shot — on
 * the large model one shot is ~1200 refits. {@code linearisedRanking}: the ranking from the
 * post-fit covariance, the fast mode. Figures in the README.
 */
@State(Scope.Benchmark)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgs = {"-Xmx2g"})
public class ImpactsBenchmark {

    @Param({"medium", "large"})
    public String size;

    private Impacts impacts;

    @Setup
    public void setup() {
        CompiledModel m = BenchModels.compiled(size);
        DataSet data = DataSet.observed(m);
        FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();
        if (!best.converged()) throw new IllegalStateException("benchmark best fit did not converge: " + best.status());
        impacts = new Impacts(m, data, FitSettings.defaults(), new int[0], new double[0], best, false);
    }

    @Benchmark
    @BenchmarkMode(Mode.SingleShotTime)
    @Warmup(iterations = 1)
    @Measurement(iterations = 1)
    public List<Impacts.Entry> exactRanking() {
        return impacts.rank(-1, 2, null);
    }

    @Benchmark
    @BenchmarkMode(Mode.AverageTime)
    @Warmup(iterations = 2, time = 1)
    @Measurement(iterations = 5, time = 1)
    public List<Impacts.Entry> linearisedRanking() {
        return impacts.linearised();
    }
}
