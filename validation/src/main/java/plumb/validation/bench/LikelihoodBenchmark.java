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
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;

import java.util.Arrays;
import java.util.concurrent.TimeUnit;

/**
 * Cost of one likelihood evaluation on the generated models. Divide by
 * {@link CompiledModel#entries()} (printed by the setup) for the cost per (sample, bin, variation)
 * entry. The baseline is the value alone; the Hessian pass is measured too because Newton fits use it.
 * {@code bareLoop} is the bound of value + gradient: the same entries' arithmetic alone ({@link BareLoop}).
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class LikelihoodBenchmark {

    @Param({"medium", "large"})
    public String size;

    private BinnedNll nll;
    private double[] x;
    private double[] gradient;
    private double[] hessian;
    private BareLoop bare;
    private double[] rho;

    @Setup
    public void setup() {
        CompiledModel m = BenchModels.compiled(size);
        nll = new BinnedNll(m, DataSet.observed(m));
        x = Arrays.copyOf(m.nominal(), m.nParams());
        x[m.poi()] = 1.1; // off the nominal so no branch is trivially skipped
        gradient = new double[m.nParams()];
        hessian = new double[m.nParams() * m.nParams()];
        bare = new BareLoop(m);
        rho = new double[m.nBins()];
        nll.valueAndGradient(x, gradient);
        nll.binWeights(rho, new double[m.nBins()]);   // the bins' weights at x, as the gradient pass has them
        System.out.printf("%n%s model: %d entries, %d parameters, %d MC-statistics parameters%n",
                size, m.entries(), m.nParams(), m.nGamma());
    }

    @Benchmark
    public double valueOnly() {
        return nll.value(x);
    }

    @Benchmark
    public double valueAndGradient() {
        return nll.valueAndGradient(x, gradient);
    }

    @Benchmark
    public double bareLoop() {
        Arrays.fill(gradient, 0);
        return bare.pass(x, rho, gradient);
    }

    @Benchmark
    public double valueGradientHessian() {
        return nll.valueGradientHessian(x, gradient, hessian);
    }
}
