package plumb.validation.bench;

import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.*;
import plumb.engine.likelihood.DataSet;
import java.io.File;
import java.io.IOException;
import java.lang.management.*;
import java.nio.file.Files;

/**
 * CPU-time figures of the small-model and large-model work, for a machine too busy for JMH's wall
 * times: each figure is the thread CPU time of this (main) thread, or the process CPU time where
 * worker threads do the work, printed per round (every round the same work; toy rounds take the
 * next toys). {@code java -cp validation/target/benchmarks.jar plumb.validation.bench.CpuFigures WHAT N [SIZE|THREADS]}
 * with WHAT one of {@code toy N} (N toys of the medium model, a best fit from the toys' start and a
 * conditional fit each, as the toy loops make them),
 * {@code fit N SIZE}, {@code limit N SIZE}, {@code inject N THREADS}, {@code rank ROUNDS SIZE}.
 */
public final class CpuFigures {
    private CpuFigures() {
    }

    static ThreadMXBean tm = ManagementFactory.getThreadMXBean();
    static double cpu() { return tm.getCurrentThreadCpuTime() * 1e-9; }

    static double processCpu() {
        return ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean()).getProcessCpuTime() * 1e-9;
    }

    /**
     * CPU seconds of the JIT compiler's threads so far (Linux: from /proc/self/task, where their
     * names start with "C1 Compiler" or "C2 Compiler"); NaN where that is not readable.
     */
    static double jitCpu() {
        File[] tasks = new File("/proc/self/task").listFiles();
        if (tasks == null) return Double.NaN;
        long ticks = 0;
        for (File t : tasks) {
            try {
                String stat = Files.readString(new File(t, "stat").toPath());
                String name = stat.substring(stat.indexOf('(') + 1, stat.lastIndexOf(')'));
                if (!name.startsWith("C1 Compiler") && !name.startsWith("C2 Compiler")) continue;
                String[] f = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
                ticks += Long.parseLong(f[11]) + Long.parseLong(f[12]); // utime, stime
            } catch (IOException | RuntimeException gone) {
                // a thread that ended meanwhile
            }
        }
        return ticks / 100.0; // clock ticks of 10 ms (USER_HZ)
    }

    public static void main(String[] a) throws Exception {
        String what = a[0];
        int reps = Integer.parseInt(a[1]);
        if (what.equals("toy")) {
            CompiledModel m = BenchModels.compiled("medium");
            DataSet observed = DataSet.observed(m);
            double mu = 1;
            double[] generating = DataSets.asimovAt(m, mu, new int[0], new double[0], true, FitSettings.defaults()).values();
            double[] expected = DataSets.expectedCounts(m, generating);
            Fitter f = Fitter.valuesOnly(m, observed, FitSettings.defaults(), new int[0], new double[0]);
            ToyStart start = new ToyStart(f, generating, expected, observed.channelIncluded(), new int[0]);
            int toy = 0;
            for (int round = 0; round < 6; round++) {
                double t0 = cpu(); int fits = 0; double sum = 0;
                for (int r = 0; r < reps; r++) {
                    f.setData(Toys.generate(m, expected, generating, observed.channelIncluded(), 99, toy++, true));
                    FitResult best = f.fit(start.of(f), -1, 0);
                    FitResult at = f.refitHolding(best, m.poi(), mu);
                    sum += best.nll() + at.nll(); fits += 2;
                }
                double t = cpu() - t0;
                System.out.printf("toy fit: %.3f ms cpu per fit, %.0f fits/s/core (sum %.6f)%n", 1e3 * t / fits, fits / t, sum);
            }
        } else if (what.equals("fit")) {
            CompiledModel m = BenchModels.compiled(a[2]);
            DataSet data = DataSet.observed(m);
            Fitter f = new Fitter(m, data, FitSettings.defaults());
            for (int round = 0; round < 6; round++) {
                double t0 = cpu(); FitResult r = null;
                for (int k = 0; k < reps; k++) r = f.fit();
                System.out.printf("%s fit: %.2f ms cpu (nll %.12f, iters %d, evals %d)%n", a[2], 1e3 * (cpu() - t0) / reps, r.nll(), r.iterations(), r.evaluations());
            }
        } else if (what.equals("limit")) {
            CompiledModel m = BenchModels.compiled(a[2]);
            DataSet observed = DataSet.observed(m);
            for (int round = 0; round < 5; round++) {
                double t0 = cpu(); LimitResult r = null;
                for (int k = 0; k < reps; k++) {
                    DataSet az = DataSets.asimovAt(m, 0, new int[0], new double[0], true, FitSettings.defaults()).data();
                    r = AsymptoticUpperLimit.compute(m, observed, az, FitSettings.defaults(), new int[0], new double[0], 0.95);
                }
                System.out.printf("%s limit: %.1f ms cpu  %s%n", a[2], 1e3 * (cpu() - t0) / reps, r);
            }
        } else if (what.equals("inject")) {
            CompiledModel m = BenchModels.compiled("medium");
            InjectionToys toys = new InjectionToys(m, FitSettings.defaults(), new int[0], new double[0]);
            double[] point = toys.generatingPoint(1, false).values();
            int threads = Integer.parseInt(a[2]);
            long seed = 0;
            // 8 rounds: the JIT compiler keeps compiling through the first ~5,000 toys; on two
            // cores a second worker thread competes with it, one thread leaves it the free core
            for (int round = 0; round < 8; round++) {
                long w0 = System.nanoTime();
                double c0 = processCpu(), j0 = jitCpu();
                ToyFit[] fits = toys.run(point, ++seed, true, 0, reps, threads, null);
                double c1 = processCpu(), j1 = jitCpu();
                double s = 0; for (ToyFit t : fits) s += t.poi();
                System.out.printf("inject %d toys %d threads: wall %.2f s, process cpu %.2f s, of it JIT compiler %.2f s (mean mu %.9f)%n",
                        reps, threads, (System.nanoTime() - w0) * 1e-9, c1 - c0, j1 - j0, s / reps);
            }
        } else if (what.equals("rank")) {
            CompiledModel m = BenchModels.compiled(a[2]);
            DataSet data = DataSet.observed(m);
            FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();
            Impacts imp = new Impacts(m, data, FitSettings.defaults(), new int[0], new double[0], best, false);
            for (int round = 0; round < reps; round++) {
                long w0 = System.nanoTime();
                double c0 = ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean()).getProcessCpuTime() * 1e-9;
                var l = imp.rank(-1, 2, null);
                double c1 = ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean()).getProcessCpuTime() * 1e-9;
                System.out.printf("rank %s: wall %.2f s, process cpu %.2f s, first %s%n", a[2], (System.nanoTime() - w0) * 1e-9, c1 - c0, l.get(0));
            }
        }
    }
}
