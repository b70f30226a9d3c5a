package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import plumb.spark.campaign.SparkRunner;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * The speed comparison of {@code plumb build}, printed side by side from one run: a build of N
 * generated events (10 samples, 3 regions of 20 bins, 20 weight variations stored as columns, each
 * giving an up and a down weight: 41 weights summed with their squares) on Spark {@code local[*]};
 * a Spark scan that only reads the same columns (the cost of Parquet alone); and a single-threaded
 * plain-Java loop that does the same sums over the first events of the same tables held in memory
 * (the bound for one core). Every line gives wall time and CPU time: on a shared machine the CPU
 * seconds per event are the figure to compare, wall time also counts the other processes' turns.
 * Spark's start (context, session, a first task) is a line of its own; the build runs first after
 * it, as in the command, the scan after the build.
 *
 * <p>The tables ({@link BenchTables}) are written on every core before Spark starts, or used as
 * they are when DIR holds them already (its manifest matches).
 *
 * <p>Run: {@code ./plumb build-speed N DIR [BOUND_EVENTS]}.
 */
public final class BuildSpeed {

    static final int SAMPLES = 10;
    static final int VARIATIONS = 20;
    static final int BINS = 20;
    static final long SEED = 1;

    private BuildSpeed() {
    }

    /** CPU seconds of this process so far (every thread: Spark's tasks, the driver, JIT and GC). */
    static double processCpu() {
        return ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean())
                .getProcessCpuTime() * 1e-9;
    }

    /** Wall and CPU seconds of one timed step. */
    record Timing(double wall, double cpu) {
        static Timing of(Step step) throws Exception {
            double c0 = processCpu();
            long t0 = System.nanoTime();
            step.run();
            return new Timing((System.nanoTime() - t0) * 1e-9, processCpu() - c0);
        }
    }

    interface Step {
        void run() throws Exception;
    }

    public static void main(String[] args) throws Exception {
        if (args.length < 2 || args.length > 3) {
            System.err.println("usage: plumb build-speed N DIR [BOUND_EVENTS]");
            System.exit(2);
        }
        long n = Long.parseLong(args[0]);
        Path dir = Path.of(args[1]);
        long boundEvents = Math.min(n, args.length > 2 ? Long.parseLong(args[2]) : 10_000_000L);   // the bound takes events of the tables
        Files.createDirectories(dir);
        BenchTables tables = new BenchTables(n, SAMPLES, VARIATIONS, SEED);
        int threads = Runtime.getRuntime().availableProcessors();
        boolean[] written = {false};
        Timing generation = Timing.of(() -> written[0] = tables.ensure(dir, threads));
        Path spec = Files.writeString(dir.resolve("build.json"), spec(SAMPLES));

        SparkRunner[] runner = new SparkRunner[1];
        SparkSession[] session = new SparkSession[1];
        Timing start = Timing.of(() -> {
            runner[0] = SparkRunner.open("local[*]", 600);
            session[0] = BuildSession.of(runner[0]);
        });
        SparkSession spark = session[0];
        int cores = spark.sparkContext().defaultParallelism();
        Timing build, scan;
        java.util.Map<String, Double> before, after;
        try {
            before = ThreadCpu.byGroup();
            build = Timing.of(() -> EventBuild.build(BuildSpecReader.read(spec), spark, dir.resolve("model.json"),
                    new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter())));
            after = ThreadCpu.byGroup();
            scan = Timing.of(() -> scanOnly(spark, dir));
        } finally {
            runner[0].close();
        }
        double[] loop = plainJava(tables, boundEvents);

        System.out.printf(Locale.ROOT, "events %d, %d samples, 3 regions x %d bins, %d weight variations (%d weights summed "
                + "with squares); Spark local[*] on %d cores%n", n, SAMPLES, BINS, VARIATIONS, 2 * VARIATIONS + 1, cores);
        System.out.printf(Locale.ROOT, "tables in %s: %s%n", dir, written[0] ? String.format(Locale.ROOT,
                "written on %d threads in %.1f s wall, %.1f CPU-s (not part of the figures below)", threads,
                generation.wall(), generation.cpu()) : "used as they were (manifest matches)");
        System.out.printf(Locale.ROOT, "%-44s %9s %9s %14s %16s%n", "", "wall s", "CPU s", "events/s wall", "events/CPU-s");
        System.out.printf(Locale.ROOT, "%-44s %9.2f %9.2f%n", "Spark start (context, session, first task)", start.wall(),
                start.cpu());
        line("plumb build (Spark, all cores)", n, build);
        if (!after.isEmpty()) {
            StringBuilder split = new StringBuilder("  the build's CPU s by thread:");
            for (String g : after.keySet()) {
                split.append(String.format(Locale.ROOT, " %s %.2f,", g, after.get(g) - before.getOrDefault(g, 0.0)));
            }
            System.out.println(split.substring(0, split.length() - 1));
        }
        line("Spark reading the same columns only", n, scan);
        line("plain Java, one thread, columns in memory", boundEvents, new Timing(loop[0], loop[1]));
        double boundRate = boundEvents / loop[1];
        System.out.printf(Locale.ROOT, "CPU per event, plumb build / plain-Java bound: %.2f (reading alone: %.2f)%n",
                boundRate / (n / build.cpu()), boundRate / (n / scan.cpu()));
        System.out.printf(Locale.ROOT, "1e8 events at this build's CPU rate on %d cores: %.0f s; at its wall rate: %.0f s%n",
                cores, 1e8 / (n / build.cpu()) / cores, 1e8 / (n / build.wall()));
    }

    private static void line(String what, long events, Timing t) {
        System.out.printf(Locale.ROOT, "%-44s %9.2f %9.2f %14.3g %16.3g%n", what, t.wall(), t.cpu(), events / t.wall(),
                events / t.cpu());
    }

    /** Spark reads every column the build reads and adds them up: what Parquet and the scan cost alone. */
    static void scanOnly(SparkSession spark, Path dir) {
        StringBuilder sum = new StringBuilder("sum(m + n_ph + iso + w");
        for (int v = 0; v < VARIATIONS; v++) sum.append(" + wv").append(v);
        sum.append(")");
        for (int s = 0; s < SAMPLES; s++) {
            spark.read().parquet(dir.resolve("s" + s).toString()).selectExpr(sum.toString()).first();
        }
    }

    /** The description of the build over {@code samples} samples of the tables. */
    static String spec(int samples) {
        StringBuilder s = new StringBuilder("{\"format\": \"plumb-build/1\", \"name\": \"speed\", \"regions\": [");
        String[][] regions = {{"sr", "n_ph >= 2", "iso < 0.1"}, {"cr_iso", "n_ph >= 2", "iso >= 0.1 AND iso < 0.3"},
                {"cr_one", "n_ph < 2", "iso < 0.1"}};
        StringBuilder edges = new StringBuilder();
        for (int b = 0; b <= BINS; b++) edges.append(b == 0 ? "" : ", ").append(b * 1000 / BINS);
        for (int r = 0; r < regions.length; r++) {
            s.append(r == 0 ? "" : ", ").append("{\"name\": \"").append(regions[r][0]).append("\", \"observable\": \"m\", \"edges\": [")
             .append(edges).append("], \"steps\": [{\"name\": \"photons\", \"keep\": \"").append(regions[r][1])
             .append("\"}, {\"name\": \"isolation\", \"keep\": \"").append(regions[r][2]).append("\"}]}");
        }
        s.append("], \"samples\": [");
        for (int i = 0; i < samples; i++) {
            s.append(i == 0 ? "" : ", ").append("{\"name\": \"s").append(i).append("\", \"events\": [\"s").append(i)
             .append("/*.parquet\"], \"weight\": \"w\", \"variations\": [");
            for (int v = 0; v < VARIATIONS; v++) {
                s.append(v == 0 ? "" : ", ").append("{\"parameter\": \"v").append(v).append("\", \"weights\": {\"up\": \"wv")
                 .append(v).append("\", \"down\": \"2 * w - wv").append(v).append("\"}}");
            }
            s.append("]}");
        }
        return s.append("]}").toString();
    }

    /**
     * The same sums in one thread over the first {@code count} events of the tables (sample 0's
     * files in order, then sample 1's, …) held in arrays, best of three passes (the first also lets
     * the JIT compile the loop): {wall, CPU} seconds of that pass.
     */
    static double[] plainJava(BenchTables tables, long count) {
        Columns c = Columns.of(tables, count);
        ThreadMXBean threads = ManagementFactory.getThreadMXBean();
        double[] best = {Double.MAX_VALUE, Double.MAX_VALUE};
        for (int pass = 0; pass < 3; pass++) {
            long c0 = threads.getCurrentThreadCpuTime(), t0 = System.nanoTime();
            double check = loop(c, new double[3 * BINS * (2 * VARIATIONS + 1)], new double[3 * BINS * (2 * VARIATIONS + 1)],
                    new double[6]);
            double cpu = (threads.getCurrentThreadCpuTime() - c0) * 1e-9, wall = (System.nanoTime() - t0) * 1e-9;
            if (!(check > 0)) throw new IllegalStateException("no event selected");
            if (cpu < best[1]) best = new double[] {wall, cpu};
        }
        return best;
    }

    /** The columns of the benchmark's tables in arrays. */
    record Columns(double[] m, int[] nph, double[] iso, double[] w, double[][] wv) {
        /** The first {@code count} events of {@code tables}, in the order of the samples and their files. */
        static Columns of(BenchTables tables, long count) {
            int n = Math.toIntExact(Math.min(count, tables.events));
            Columns c = new Columns(new double[n], new int[n], new double[n], new double[n], new double[tables.variations][n]);
            double[] row = new double[4 + tables.variations];
            int i = 0;
            for (int s = 0; s < tables.samples && i < n; s++) {
                for (int f = 0; f < tables.files(s) && i < n; f++) {
                    BenchTables.Events e = tables.events(s, f);
                    for (int k = tables.fileEvents(s, f); k > 0 && i < n; k--, i++) {
                        e.next(row);
                        c.m[i] = row[0];
                        c.nph[i] = (int) row[1];
                        c.iso[i] = row[2];
                        c.w[i] = row[3];
                        for (int v = 0; v < tables.variations; v++) c.wv[v][i] = row[4 + v];
                    }
                }
            }
            return c;
        }
    }

    /**
     * One pass: into {@code flow} the cut flow of the two steps ([region × 2 + step], weighted),
     * into {@code sums} and {@code squares} the 41 sums of w and w² per region and bin
     * ([(region × bins + bin) × 41 + weight]: nominal, then up and down of each variation); returns
     * the total of the sums and the flow.
     */
    static double loop(Columns c, double[] sums, double[] squares, double[] flow) {
        double[] m = c.m(), iso = c.iso(), w = c.w();
        int[] nph = c.nph();
        double[][] wv = c.wv();
        int n = m.length;
        int weights = 2 * VARIATIONS + 1;
        for (int i = 0; i < n; i++) {
            double wi = w[i];
            boolean two = nph[i] >= 2;
            if (two) {   // [region * 2 + step], cumulative; the first step of regions 0 and 1 is the same
                flow[0] += wi;
                flow[2] += wi;
            } else {
                flow[4] += wi;
            }
            int region = two ? (iso[i] < 0.1 ? 0 : iso[i] < 0.3 ? 1 : -1) : iso[i] < 0.1 ? 2 : -1;
            if (region < 0) continue;
            flow[region * 2 + 1] += wi;
            double x = m[i];
            if (x < 0 || x >= 1000) continue;
            int bin = (int) (x * (BINS / 1000.0));
            int base = (region * BINS + bin) * weights;
            sums[base] += wi;
            squares[base] += wi * wi;
            for (int v = 0; v < VARIATIONS; v++) {
                double up = wv[v][i], down = 2 * wi - up;
                sums[base + 1 + 2 * v] += up;
                squares[base + 1 + 2 * v] += up * up;
                sums[base + 2 + 2 * v] += down;
                squares[base + 2 + 2 * v] += down * down;
            }
        }
        double check = 0;
        for (double v : sums) check += v;
        for (double v : flow) check += v;
        return check;
    }

    /**
     * CPU seconds of this process's threads so far, by kind (Linux: read from /proc/self/task;
     * empty elsewhere): Spark's tasks, the driver's main thread, the JIT compilers, the garbage
     * collector, and the rest (Spark's scheduler and I/O threads, exited threads not counted).
     */
    static final class ThreadCpu {
        private ThreadCpu() {
        }

        static String kind(String thread) {
            if (thread.startsWith("Executor task")) return "tasks";
            if (thread.equals("main") || thread.equals("java")) return "driver";
            if (thread.startsWith("C1 Compiler") || thread.startsWith("C2 Compiler")) return "JIT";
            if (thread.startsWith("GC Thread") || thread.startsWith("G1 ")) return "GC";
            return "other";
        }

        static java.util.Map<String, Double> byGroup() {
            java.util.Map<String, Double> out = new java.util.LinkedHashMap<>();
            for (String k : new String[] {"tasks", "driver", "JIT", "GC", "other"}) out.put(k, 0.0);
            Path tasks = Path.of("/proc/self/task");
            if (!Files.isDirectory(tasks)) return java.util.Map.of();
            try (var list = Files.list(tasks)) {
                for (Path t : (Iterable<Path>) list::iterator) {
                    String stat;
                    try {
                        stat = Files.readString(t.resolve("stat"));
                    } catch (java.io.IOException e) {   // the thread ended meanwhile
                        continue;
                    }
                    String name = stat.substring(stat.indexOf('(') + 1, stat.lastIndexOf(')'));
                    String[] f = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
                    // user + system time in clock ticks, 100 per second on Linux
                    out.merge(kind(name), (Long.parseLong(f[11]) + Long.parseLong(f[12])) / 100.0, Double::sum);
                }
            } catch (java.io.IOException | RuntimeException e) {
                return java.util.Map.of();
            }
            return out;
        }
    }
}
