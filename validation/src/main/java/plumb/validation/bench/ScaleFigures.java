package plumb.validation.bench;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Impacts;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.Problem;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.linalg.CholeskySolver;
import plumb.engine.linalg.FillOrder;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryMXBean;
import java.lang.management.ThreadMXBean;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

/**
 * Figures of the whole chain of work on a big model, stage by stage, as the commands run it:
 * reading, compiling, the fit with errors ({@code plumb fit}: Newton, the kink and other-side
 * checks, the covariance and the γ errors), then at its minimum one value + gradient + Hessian
 * and its factorisation in the parameters' order and in the fill-reducing one Newton uses (the cost
 * of a Newton iteration, timed N times), the block post-fit
 * covariance, the yields with errors ({@code plumb yields}), the linearised ranking and the grouped
 * breakdown ({@code plumb impacts --exact-top 0}). Each stage prints the calling thread's CPU
 * time, the process's CPU time (every thread: the second thread of the Hessian and the
 * factorisation, the garbage collector, the compiler) and the wall time, so the figures mean
 * something on a busy machine (CPU) and on a quiet one (wall).
 * {@code java -Xmx4g -cp validation/target/benchmarks.jar plumb.validation.bench.ScaleFigures MODEL.json [N]}
 */
public final class ScaleFigures {

    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();
    private static final com.sun.management.OperatingSystemMXBean OS =
            (com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean();
    private static final MemoryMXBean MEMORY = ManagementFactory.getMemoryMXBean();

    private static long threadMark, processMark, wallMark;
    private static long threadStart, processStart, wallStart;

    private ScaleFigures() {
    }

    private static void mark() {
        threadMark = THREADS.getCurrentThreadCpuTime();
        processMark = OS.getProcessCpuTime();
        wallMark = System.nanoTime();
    }

    /** Prints the stage's figures since the last mark and marks again. */
    private static double lap(String stage) {
        long t = THREADS.getCurrentThreadCpuTime(), p = OS.getProcessCpuTime(), w = System.nanoTime();
        double wall = (w - wallMark) * 1e-9;
        System.out.printf(Locale.ROOT, "%-52s %8.2f %8.2f %8.2f%n", stage, (t - threadMark) * 1e-9,
                (p - processMark) * 1e-9, wall);
        mark();
        return wall;
    }

    public static void main(String[] args) {
        if (args.length < 1) {
            System.err.println("usage: ScaleFigures MODEL.json [N: times the Newton iteration's pieces are timed, default 3]");
            System.exit(2);
        }
        int repeats = args.length > 1 ? Integer.parseInt(args[1]) : 3;
        System.out.printf(Locale.ROOT, "%-52s %8s %8s %8s%n", "stage (seconds)", "thread", "process", "wall");
        mark();
        threadStart = threadMark;
        processStart = processMark;
        wallStart = wallMark;
        Model model = ModelReader.read(Path.of(args[0]));
        lap("read");
        CompiledModel m = ModelCompiler.compile(model);
        model = null;
        lap("compile (" + m.nParams() + " parameters, " + m.nGamma() + " MC-statistics γ)");

        Problem problem = Problem.observed(m);
        Fitter fitter = new Fitter(problem);
        FitResult best = fitter.fit();
        lap("fit with errors: " + best.status() + ", " + best.iterations() + " iterations, "
                + best.evaluations() + " evaluations");
        System.out.printf(Locale.ROOT, "  -ln L %.6f, mu %.6f ± %.6f%n", best.nll(), best.values()[m.poi()],
                best.errors()[m.poi()]);

        int n = m.nParams();
        BinnedNll nll = fitter.likelihood();
        double[] x = Arrays.copyOf(best.values(), n), g = new double[n], h = new double[n * n];
        CholeskySolver cholesky = CholeskySolver.create(n);
        double[] permuted = new double[n * n];
        for (int r = 0; r < repeats; r++) {
            nll.valueGradientHessian(x, g, h);
            lap("  at the minimum: value + gradient + Hessian");
            boolean definite = cholesky.decompose(h, n);
            lap("  at the minimum: factor " + n + "², parameters' order" + (definite ? "" : " (not definite)"));
            int[] order = FillOrder.minimumDegree(FillOrder.pattern(h, n), n);
            lap("  at the minimum: minimum-degree order (made once per fit)");
            for (int i = 0; i < n; i++) {
                for (int j = 0; j <= i; j++) permuted[i * n + j] = h[order[i] * n + order[j]];
            }
            definite = cholesky.decompose(permuted, n);
            lap("  at the minimum: factor " + n + "², that order" + (definite ? "" : " (not definite)"));
        }

        PostfitCovariance post = PostfitCovariance.of(nll, best);
        lap("block post-fit covariance" + (post == null ? " (not positive definite)" : ""));
        if (post == null) return;
        List<Yields.ChannelYields> yields = Yields.compute(problem, best, post);
        lap("yields with errors (" + yields.size() + " channels)");
        Impacts impacts = new Impacts(problem, best, false);
        impacts.postfitCovariance();
        lap("impacts: block post-fit covariance");
        impacts.linearised();
        lap("impacts: linearised ranking");
        Impacts.Breakdown breakdown = impacts.breakdown();
        lap("impacts: grouped breakdown (σ(POI) " + String.format(Locale.ROOT, "%.6f", breakdown.total()) + ")");

        long t = THREADS.getCurrentThreadCpuTime(), p = OS.getProcessCpuTime(), w = System.nanoTime();
        System.out.printf(Locale.ROOT, "%-52s %8.2f %8.2f %8.2f%n", "all stages", (t - threadStart) * 1e-9,
                (p - processStart) * 1e-9, (w - wallStart) * 1e-9);
        System.out.printf(Locale.ROOT, "heap in use at the end %.2f GB (max %.2f GB)%n",
                MEMORY.getHeapMemoryUsage().getUsed() / 1e9, Runtime.getRuntime().maxMemory() / 1e9);
    }
}
