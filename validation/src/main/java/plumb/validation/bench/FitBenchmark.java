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
import plumb.engine.likelihood.DataSet;

import java.util.concurrent.TimeUnit;

/**
 * A full fit with errors from the nominal values, one thread. {@code reference} is the
 * derivative-free BOBYQA fit of the same likelihood (the speed baseline of the fit target);
 * it runs on the medium model only — on the large one it takes minutes.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(value = 1, jvmArgs = {"-Xmx512m"})
public class FitBenchmark {

    @Param({"medium", "large"})
    public String size;

    private Fitter newton;
    private Fitter reference;

    @Setup
    public void setup() {
        CompiledModel m = BenchModels.compiled(size);
        DataSet data = DataSet.observed(m);
        newton = new Fitter(m, data, FitSettings.defaults());
        if (size.equals("medium")) {
            reference = new Fitter(m, data, FitSettings.defaults().withMinimiser(FitSettings.MinimiserKind.REFERENCE));
        }
    }

    @Benchmark
    public FitResult newtonFit() {
        return checked(newton.fit());
    }

    @Benchmark
    public FitResult referenceFit() {
        if (reference == null) return null; // the large model: not measured, see the class comment
        return checked(reference.fit());
    }

    private static FitResult checked(FitResult r) {
        if (!r.converged()) throw new IllegalStateException("benchmark fit did not converge: " + r.status());
        return r;
    }
}
