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
import plumb.engine.inference.Impacts;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.DataSet;
import plumb.models.SyntheticModels;

import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * What follows a fit on a model with 20,000 MC-statistics parameters: the post-fit yields with
 * errors, and the linearised impact ranking with the grouped breakdown, both from the block form
 * of the covariance. The model is the scale model's 40 channels × 500 bins × 8 samples with 300
 * nuisance parameters ({@code plumb generate --channels 40 --bins 500 --samples 8 --nuisances 300
 * --seed 3}), whose fit converges in seconds; the best fit is made once in the setup and is not
 * timed. Single shots on one thread with a 4 GB heap: {@code ./bench ScalePostfitBenchmark}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 1)
@Measurement(iterations = 3)
@Fork(value = 1, jvmArgs = {"-Xmx4g"})
public class ScalePostfitBenchmark {

    private CompiledModel model;
    private DataSet data;
    private Fitter fitter;
    private FitResult best;

    @Setup
    public void setup() {
        model = ModelCompiler.compile(SyntheticModels.generate(40, 500, 8, 300, 3));
        data = DataSet.observed(model);
        fitter = new Fitter(model, data, FitSettings.defaults());
        best = fitter.fit();
        if (!best.converged()) throw new IllegalStateException("fit did not converge: " + best.status());
    }

    /** Block covariance, then pre- and post-fit yields with errors of every bin, sample and channel. */
    @Benchmark
    public List<Yields.ChannelYields> yields() {
        PostfitCovariance post = PostfitCovariance.of(fitter.likelihood(), best);
        return Yields.compute(model, data, model.nominal(), best.held(), best, post);
    }

    /** Linearised ranking of every nuisance parameter and the grouped breakdown (MC statistics and all systematics included). */
    @Benchmark
    public Impacts.Breakdown linearisedImpactsAndBreakdown() {
        Impacts impacts = new Impacts(model, data, FitSettings.defaults(), new int[0], new double[0], best, false);
        impacts.linearised();
        return impacts.breakdown();
    }
}
