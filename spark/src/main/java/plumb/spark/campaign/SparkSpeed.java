package plumb.spark.campaign;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.InjectionToys;
import plumb.engine.inference.ToyFit;
import plumb.engine.inference.WorkRunner;
import plumb.models.SyntheticModels;

import java.util.Arrays;
import java.util.Locale;

/**
 * {@code ./plumb spark-speed --spark local[2] [--toys N] [--threads T]}: injection toys of the
 * medium generated model (seed 1) on threads and on Spark, side by side in one process, and
 * Spark's fixed costs: start-up (context and first task) and an almost empty job (one toy per
 * core). Prints the figures the README quotes; both runs' results are checked equal.
 */
public final class SparkSpeed {

    private SparkSpeed() {
    }

    public static void main(String[] args) {
        String master = "local[2]";
        int toys = 10_000, threads = 2;
        for (int k = 0; k < args.length; k++) {
            switch (args[k]) {
                case "--spark" -> master = args[++k];
                case "--toys" -> toys = Integer.parseInt(args[++k]);
                case "--threads" -> threads = Integer.parseInt(args[++k]);
                default -> {
                    System.err.println("plumb spark-speed: unknown option " + args[k]
                            + " (options: --spark MASTER, --toys N, --threads T)");
                    System.exit(2);
                }
            }
        }
        CompiledModel m = ModelCompiler.compile(SyntheticModels.medium(1));
        InjectionToys engine = new InjectionToys(m, FitSettings.defaults(), new int[0], new double[0]);
        double[] point = engine.generatingPoint(1, false).values();
        System.out.printf(Locale.ROOT, "medium model (%d bins, %d parameters), %d injection toys at POI = 1%n",
                m.nBins(), m.nAll(), toys);

        WorkRunner local = WorkRunner.threads(threads);
        engine.run(point, 99, true, 0, Math.max(200, toys / 10), local, null);   // warm-up (JIT), not timed
        long t0 = System.nanoTime(), c0 = cpu();
        ToyFit[] onThreads = engine.run(point, 7, true, 0, toys, local, null);
        double threadSeconds = seconds(t0), threadCpu = (cpu() - c0) * 1e-9;

        t0 = System.nanoTime();
        double startSeconds;
        double emptyJob, sparkSeconds, sparkCpu;
        ToyFit[] onSpark;
        try (SparkRunner spark = SparkRunner.open(master, 120)) {
            startSeconds = seconds(t0);
            int cores = spark.cores();
            engine.run(point, 98, true, 0, cores, spark, null);   // broadcast and task code warmed
            t0 = System.nanoTime();
            engine.run(point, 97, true, 0, cores, spark, null);
            emptyJob = seconds(t0);
            t0 = System.nanoTime();
            c0 = cpu();
            onSpark = engine.run(point, 7, true, 0, toys, spark, null);
            sparkSeconds = seconds(t0);
            sparkCpu = (cpu() - c0) * 1e-9;
        }
        boolean same = Arrays.deepEquals(describe(onThreads), describe(onSpark));
        double perToyThreads = threadSeconds / toys, perToySpark = (sparkSeconds - emptyJob) / toys;
        System.out.printf(Locale.ROOT, "%-44s %10s %12s%n", "", "wall s", "process CPU s");
        System.out.printf(Locale.ROOT, "%-44s %10.2f %12.2f%n", threads + " threads of this process", threadSeconds, threadCpu);
        System.out.printf(Locale.ROOT, "%-44s %10.2f %12.2f%n", "--spark " + master + " (after start-up)", sparkSeconds, sparkCpu);
        System.out.printf(Locale.ROOT, "%-44s %10.2f%n", "Spark start-up (context + first task)", startSeconds);
        System.out.printf(Locale.ROOT, "%-44s %10.3f%n", "Spark job of one toy per core (fixed cost)", emptyJob);
        System.out.printf(Locale.ROOT, "per toy: threads %.3f ms, Spark %.3f ms (overhead beyond start-up %+.1f %% wall, %+.1f %% CPU)%n",
                1e3 * perToyThreads, 1e3 * perToySpark, 100 * (sparkSeconds / threadSeconds - 1), 100 * (sparkCpu / threadCpu - 1));
        System.out.printf(Locale.ROOT, "results equal: %s%n", same ? "yes" : "NO");
        if (!same) System.exit(1);
    }

    /** The toys' results as comparable values (records holding arrays compare by identity). */
    private static Object[][] describe(ToyFit[] fits) {
        Object[][] out = new Object[fits.length][];
        for (int i = 0; i < fits.length; i++) {
            ToyFit f = fits[i];
            out[i] = new Object[] {f.index(), f.status(), f.poi(), f.poiError(), f.nuisancePulls()};
        }
        return out;
    }

    /**
     * CPU time of this whole process (every thread, Spark's own included), in ns: unlike wall time
     * it does not grow when other programs share the cores.
     */
    private static long cpu() {
        return ((com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory.getOperatingSystemMXBean())
                .getProcessCpuTime();
    }

    private static double seconds(long t0) {
        return (System.nanoTime() - t0) * 1e-9;
    }
}
