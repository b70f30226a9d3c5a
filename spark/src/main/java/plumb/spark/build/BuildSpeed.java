package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import plumb.spark.campaign.SparkRunner;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * The speed comparison of {@code plumb build}, printed side by side from one run: a build of N
 * generated events (10 samples, 3 regions of 20 bins, 20 weight variations stored as columns, each
 * giving an up and a down weight: 41 weights summed with their squares) on Spark {@code local[*]};
 * a Spark scan that only reads the same columns (the cost of Parquet alone); and a single-threaded
 * plain-Java loop that does the same sums over the same kind of columns held in memory (the bound
 * for one core). Every line gives wall time and CPU time: on a shared machine the CPU seconds per
 * event are the figure to compare, wall time also counts the other processes' turns.
 * Table generation (Parquet through Spark, reused when DIR already has it) is not timed.
 *
 * <p>Run: {@code ./plumb build-speed N DIR [BOUND_EVENTS]}.
 */
public final class BuildSpeed {

    static final int SAMPLES = 10;
    static final int VARIATIONS = 20;
    static final int BINS = 20;

    private BuildSpeed() {
    }

    /** CPU seconds of this process so far (every thread: Spark's tasks, the driver, JIT and GC). */
    static double processCpu() {
        return ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean())
                .getProcessCpuTime() * 1e-9;
    }

    /** Wall and CPU seconds of one timed step. */
    record Timing(double wall, double cpu) {
        static Timing of(Runnable step) {
            double c0 = processCpu();
            long t0 = System.nanoTime();
            step.run();
            return new Timing((System.nanoTime() - t0) * 1e-9, processCpu() - c0);
        }
    }

    // "try": the runner is opened for its side effect, the Spark context that the session below
    // is built on, and closed at the end of the block; the body need not name it
    @SuppressWarnings("try")
    public static void main(String[] args) throws Exception {
        long n = args.length > 0 ? Long.parseLong(args[0]) : 10_000_000L;
        Path dir = Path.of(args.length > 1 ? args[1] : "build-speed");
        long boundEvents = args.length > 2 ? Long.parseLong(args[2]) : Math.min(n, 10_000_000L);
        Files.createDirectories(dir);
        long perSample = n / SAMPLES;
        try (SparkRunner runner = SparkRunner.open("local[*]", 120)) {
            SparkSession spark = SparkSession.builder().getOrCreate();
            int cores = spark.sparkContext().defaultParallelism();
            long g0 = System.nanoTime();
            for (int s = 0; s < SAMPLES; s++) generate(spark, dir.resolve("s" + s), s, perSample);
            double generation = (System.nanoTime() - g0) * 1e-9;
            Path spec = Files.writeString(dir.resolve("build.json"), spec());

            Timing scan = Timing.of(() -> scanOnly(spark, dir));
            Timing build = Timing.of(() -> EventBuild.build(BuildSpecReader.read(spec), spark, dir.resolve("model.json"),
                    new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter())));
            double[] loop = plainJava(boundEvents);

            System.out.printf(Locale.ROOT, "events %d (generation %.1f s, not timed below), %d samples, 3 regions x %d bins, "
                    + "%d weight variations (%d weights summed with squares); Spark local[*] on %d cores%n", n, generation,
                    SAMPLES, BINS, VARIATIONS, 2 * VARIATIONS + 1, cores);
            System.out.printf(Locale.ROOT, "%-44s %9s %9s %14s %16s%n", "", "wall s", "CPU s", "events/s wall", "events/CPU-s");
            line("plumb build (Spark, all cores)", n, build);
            line("Spark reading the same columns only", n, scan);
            line("plain Java, one thread, columns in memory", boundEvents, new Timing(loop[0], loop[1]));
            double boundRate = boundEvents / loop[1];
            System.out.printf(Locale.ROOT, "CPU per event, plumb build / plain-Java bound: %.2f (reading alone: %.2f)%n",
                    boundRate / (n / build.cpu()), boundRate / (n / scan.cpu()));
            System.out.printf(Locale.ROOT, "1e8 events at the measured CPU rate on %d cores: %.0f s; at the measured wall rate: %.0f s%n",
                    cores, 1e8 / (n / build.cpu()) / cores, 1e8 / (n / build.wall()));
        }
    }

    private static void line(String what, long events, Timing t) {
        System.out.printf(Locale.ROOT, "%-44s %9.2f %9.2f %14.3g %16.3g%n", what, t.wall(), t.cpu(), events / t.wall(),
                events / t.cpu());
    }

    /** One sample's table as Parquet (left as it is when already there): random columns from spark.range. */
    static void generate(SparkSession spark, Path out, int s, long events) {
        if (Files.exists(out.resolve("_SUCCESS"))) return;
        List<String> cols = new ArrayList<>(List.of("rand(" + (100 * s + 1) + ") * 1000 AS m",
                "CAST(rand(" + (100 * s + 2) + ") * 4 AS INT) AS n_ph", "rand(" + (100 * s + 3) + ") AS iso",
                "0.5 + rand(" + (100 * s + 4) + ") AS w"));
        for (int v = 0; v < VARIATIONS; v++) {
            cols.add("(0.5 + rand(" + (100 * s + 4) + ")) * (0.9 + 0.2 * rand(" + (100 * s + 10 + v) + ")) AS wv" + v);
        }
        // files of ~1e6 events (~200 MB): enough tasks for every core, few enough to list quickly
        int files = (int) Math.max(2, events / 1_000_000);
        // random doubles never fit a dictionary: writing without one spares the writer the attempt
        spark.range(0, events, 1, files).selectExpr(cols.toArray(String[]::new)).write().mode("overwrite")
                .option("parquet.enable.dictionary", "false").parquet(out.toString());
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

    static String spec() {
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
        for (int i = 0; i < SAMPLES; i++) {
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
     * The same sums in one thread over columns in arrays, best of three passes (the first also
     * lets the JIT compile the loop): {wall, CPU} seconds of that pass.
     */
    static double[] plainJava(long count) {
        int n = Math.toIntExact(count);
        SplittableRandom rng = new SplittableRandom(7);
        double[] m = new double[n], iso = new double[n], w = new double[n];
        int[] nph = new int[n];
        double[][] wv = new double[VARIATIONS][n];
        for (int i = 0; i < n; i++) {
            m[i] = rng.nextDouble() * 1000;
            nph[i] = rng.nextInt(4);
            iso[i] = rng.nextDouble();
            w[i] = 0.5 + rng.nextDouble();
            for (int v = 0; v < VARIATIONS; v++) wv[v][i] = w[i] * (0.9 + 0.2 * rng.nextDouble());
        }
        ThreadMXBean threads = ManagementFactory.getThreadMXBean();
        double[] best = {Double.MAX_VALUE, Double.MAX_VALUE};
        for (int pass = 0; pass < 3; pass++) {
            long c0 = threads.getCurrentThreadCpuTime(), t0 = System.nanoTime();
            double check = loop(m, nph, iso, w, wv);
            double cpu = (threads.getCurrentThreadCpuTime() - c0) * 1e-9, wall = (System.nanoTime() - t0) * 1e-9;
            if (!(check > 0)) throw new IllegalStateException("no event selected");
            if (cpu < best[1]) best = new double[] {wall, cpu};
        }
        return best;
    }

    /** One pass: the cut flow of the two steps and the 41 sums and squares per bin; the total of the sums. */
    static double loop(double[] m, int[] nph, double[] iso, double[] w, double[][] wv) {
        int n = m.length;
        int weights = 2 * VARIATIONS + 1;
        double[] sums = new double[3 * BINS * weights], squares = new double[sums.length];
        double[] flow = new double[6];
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
}
