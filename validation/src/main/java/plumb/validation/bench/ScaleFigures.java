package plumb.validation.bench;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Impacts;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.linalg.CholeskySolver;
import plumb.engine.minimise.BoundedNewton;
import plumb.engine.minimise.MinimiserOptions;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.MinimumStatus;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Path;
import java.util.Arrays;

/**
 * Thread-CPU figures of every stage of the work on a big model, for a machine too busy for wall
 * times: reading, compiling, one value+gradient and one value+gradient+Hessian, N Newton
 * iterations from the nominal values, then at the point they reach a factorisation and inverse of
 * the Hessian, the γ variances, the block post-fit covariance, the yields with errors, the
 * linearised ranking and the grouped breakdown. Each stage is timed on its own, so the figures
 * hold whether or not N iterations converge.
 * {@code java -Xmx4g -cp validation/target/benchmarks.jar plumb.validation.bench.ScaleFigures MODEL.json N}
 */
public final class ScaleFigures {

    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();
    private static long mark;

    private ScaleFigures() {
    }

    private static void lap(String stage) {
        long now = THREADS.getCurrentThreadCpuTime();
        System.out.printf("%-40s %7.2f s%n", stage, (now - mark) * 1e-9);
        mark = THREADS.getCurrentThreadCpuTime();
    }

    public static void main(String[] args) {
        mark = THREADS.getCurrentThreadCpuTime();
        Model model = ModelReader.read(Path.of(args[0]));
        lap("read");
        CompiledModel m = ModelCompiler.compile(model);
        lap("compile");
        DataSet data = DataSet.observed(m);
        BinnedNll nll = new BinnedNll(m, data);
        int n = m.nParams();
        double[] x = Arrays.copyOf(m.nominal(), n), g = new double[n], h = new double[n * n];
        nll.valueAndGradient(x, g);
        lap("value+gradient");
        nll.valueGradientHessian(x, g, h);
        lap("value+gradient+Hessian");
        int iterations = Integer.parseInt(args[1]);
        BoundedNewton newton = new BoundedNewton(n, MinimiserOptions.defaults().withRestart(false).withMaxIterations(iterations));
        MinimumResult r = newton.minimise(nll, x, Arrays.copyOf(m.lower(), n), Arrays.copyOf(m.upper(), n),
                Arrays.copyOf(m.fixed(), n));
        lap("Newton: " + r.iterations() + " iterations, " + r.evaluations() + " evaluations");
        CholeskySolver cholesky = CholeskySolver.create(n);
        if (!cholesky.decompose(r.hessian(), n)) {
            System.out.println("the Hessian is not positive definite at that point (" + r.status() + "): stop");
            return;
        }
        lap("factor of the Hessian, " + n + "²");
        double[] cov = new double[n * n];
        cholesky.invert(cov);
        lap("inverse of the Hessian");
        double[] values = new double[m.nAll()], errors = new double[m.nAll()], var = new double[m.nGamma()];
        nll.allValues(r.x(), values);
        for (int i = 0; i < n; i++) errors[i] = Math.sqrt(Math.max(cov[i * n + i], 0));
        nll.gammaVariances(r.x(), cov, var);
        for (int i = 0; i < var.length; i++) errors[n + i] = Math.sqrt(var[i]);
        lap("γ variances, " + m.nGamma());
        boolean[] held = Arrays.copyOf(m.fixed(), m.nAll());
        FitResult best = new FitResult(MinimumStatus.CONVERGED, r.value(), values, errors, cov, held,
                r.evaluations(), r.iterations(), 0);
        PostfitCovariance post = PostfitCovariance.of(nll, best);
        lap("block post-fit covariance");
        Yields.compute(m, data, m.nominal(), held, best, post);
        lap("yields with errors");
        Impacts impacts = new Impacts(m, data, FitSettings.defaults(), new int[0], new double[0], best, false);
        impacts.linearised();
        lap("linearised ranking");
        Impacts.Breakdown breakdown = impacts.breakdown();
        lap("grouped breakdown");
        System.out.printf("status %s, -ln L %.6f, σ(POI) %.6f%n", r.status(), r.value(), breakdown.total());
    }
}
