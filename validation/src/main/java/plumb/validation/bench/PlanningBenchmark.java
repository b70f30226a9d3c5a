package plumb.validation.bench;

import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.AsymptoticUpperLimit;
import plumb.engine.inference.Contour;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Problem;
import plumb.engine.inference.Projection;
import plumb.engine.inference.Sensitivity;
import plumb.models.DemoModel;

import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * The planning computations: {@code sensitivityFast} is the fast ranking of every parameter and
 * group of the large model (removed and width × 0.5) after its Asimov data sets and exact limit
 * and significance, which setup makes: the four Fisher matrices (two of them at conditional fits)
 * and every rank-one, Woodbury and MC-statistics update. {@code project} is four luminosity points
 * in three scenarios on the medium model, {@code contour} 64 rays (68 % and 95 %) on the demo
 * model, both on 2 threads from scratch (fits included).
 */
@State(Scope.Benchmark)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgs = {"-Xmx2g"})
public class PlanningBenchmark {

    private CompiledModel large;
    private Sensitivity.AsimovPair asimov;
    private double limit;
    private double z;
    private Problem medium;
    private Problem demo;

    @Setup(Level.Trial)
    public void setup() {
        large = BenchModels.compiled("large");
        FitSettings s = FitSettings.defaults();
        asimov = Sensitivity.AsimovPair.of(large, new int[0], new double[0], true, s);
        limit = AsymptoticUpperLimit.compute(large, null, asimov.zero().data(), s, new int[0], new double[0], 0.95)
                .expected().median();
        z = Discovery.compute(large, asimov.one().data(), s, new int[0], new double[0]).z();
        medium = Problem.observed(BenchModels.compiled("medium"));
        demo = Problem.observed(ModelCompiler.compile(DemoModel.load()));
    }

    @Benchmark
    @BenchmarkMode(Mode.SingleShotTime)
    @Warmup(iterations = 2)
    @Measurement(iterations = 5)
    public List<Sensitivity.Target> sensitivityFast() {
        Sensitivity.Fisher f = Sensitivity.Fisher.of(large, asimov, new int[0], new double[0], limit, FitSettings.defaults());
        return Sensitivity.fast(large, f, new int[0], new double[] {0.5}, limit, z);
    }

    @Benchmark
    @BenchmarkMode(Mode.SingleShotTime)
    @Warmup(iterations = 1)
    @Measurement(iterations = 3)
    public Projection.Result project() {
        return Projection.compute(medium, true, 0.95, new double[] {1, 2, 5, 10}, 2, null);
    }

    @Benchmark
    @BenchmarkMode(Mode.SingleShotTime)
    @Warmup(iterations = 1)
    @Measurement(iterations = 3)
    public Contour.Result contour() {
        return Contour.compute(demo, "mu", "r_dijet", Contour.DEFAULT_CLS, 64, 2, null);
    }
}
