package plumb.validation.bench;

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
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.models.SyntheticModels;

import java.util.concurrent.TimeUnit;

/**
 * The scale model: 40 channels × 500 bins × 8 samples with 2,000 nuisance parameters (20,000
 * MC-statistics parameters), as {@code plumb generate --channels 40 --bins 500 --samples 8
 * --nuisances 2000 --seed 3} writes it. Single shots on one thread with a 4 GB heap: one full
 * fit with errors from the nominal values, and one value + gradient + Hessian. Run with
 * {@code ./bench ScaleBenchmark}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 1)
@Measurement(iterations = 2)
@Fork(value = 1, jvmArgs = {"-Xmx4g"})
public class ScaleBenchmark {

    private CompiledModel model;
    private DataSet data;
    private BinnedNll nll;
    private double[] x;
    private double[] gradient;
    private double[] hessian;

    @Setup
    public void setup() {
        model = ModelCompiler.compile(SyntheticModels.generate(40, 500, 8, 2000, 3));
        data = DataSet.observed(model);
        nll = new BinnedNll(model, data);
        x = model.nominal();
        gradient = new double[model.nParams()];
        hessian = new double[model.nParams() * model.nParams()];
    }

    @Benchmark
    public FitResult fitWithErrors() {
        FitResult r = new Fitter(model, data, FitSettings.defaults()).fit();
        if (!r.converged()) throw new IllegalStateException("scale fit did not converge: " + r.status());
        return r;
    }

    @Benchmark
    public double valueGradientHessian() {
        return nll.valueGradientHessian(x, gradient, hessian);
    }
}
