package plumb.validation.bench;

import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsymptoticUpperLimit;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.Toys;
import plumb.engine.likelihood.DataSet;

import java.util.concurrent.TimeUnit;

/**
 * Limits on the generated models, one thread. {@code asymptoticLimit}: observed limit and the five
 * expected limits from scratch (Asimov set at μ = 0 with its conditional fit included), the
 * targets 0.5 s (medium) and 10 s (large). {@code toyFit}: one toy of the s+b hypothesis generated
 * and fitted twice (best fit and the conditional fit of q̃μ), reported per fit — the target is
 * 100 fits per second per core on the medium model. {@code baselineFit}: a full fit with errors,
 * as in FitBenchmark, for the ratio.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 3)
@Measurement(iterations = 5, time = 3)
@Fork(value = 1, jvmArgs = {"-Xmx1g"})
public class LimitBenchmark {

    @Param({"medium", "large"})
    public String size;

    private CompiledModel m;
    private DataSet observed;
    private Fitter toyFitter;
    private double[] generating;
    private double[] expected;
    private double mu;
    private int toy;

    @Setup
    public void setup() {
        m = BenchModels.compiled(size);
        observed = DataSet.observed(m);
        mu = 1;
        generating = DataSets.asimovAt(m, mu, new int[0], new double[0], true, FitSettings.defaults()).values();
        expected = DataSets.expectedCounts(m, generating);
        toyFitter = Fitter.valuesOnly(m, observed, FitSettings.defaults(), new int[0], new double[0]);
    }

    @Benchmark
    public LimitResult asymptoticLimit() {
        DataSet asimovZero = DataSets.asimovAt(m, 0, new int[0], new double[0], true, FitSettings.defaults()).data();
        return AsymptoticUpperLimit.compute(m, observed, asimovZero, FitSettings.defaults(), new int[0], new double[0], 0.95);
    }

    /** Two fits per toy (best and conditional at μ): the time per fit is the score. */
    @Benchmark
    @OperationsPerInvocation(2)
    public double toyFit() {
        if (!size.equals("medium")) return 0;   // the toy target is for the medium model
        toyFitter.setData(Toys.generate(m, expected, generating, observed.channelIncluded(), 99, toy++, true));
        FitResult best = toyFitter.fit(generating, -1, 0);
        FitResult at = toyFitter.fit(best.values(), m.poi(), mu);
        return best.nll() + at.nll();
    }

    @Benchmark
    public FitResult baselineFit() {
        return new Fitter(m, observed, FitSettings.defaults()).fit();
    }
}
