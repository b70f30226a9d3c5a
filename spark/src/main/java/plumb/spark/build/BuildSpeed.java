package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import plumb.spark.campaign.SparkRunner;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * The speed comparison of {@code plumb build}, printed side by side from one run: a build of N
 * generated events (10 samples, 3 regions of 20 bins, 20 weight variations stored as columns, each
 * giving an up and a down weight: 41 weights summed with their squares) on Spark {@code local[*]},
 * against a single-threaded plain-Java loop that does the same sums over the same kind of columns
 * held in memory (the bound for one core). Table generation is not timed.
 *
 * <p>Run: {@code java <spark opens> -cp spark/target/plumb-spark.jar:$(cat spark/target/spark-classpath.txt)
 * plumb.spark.build.BuildSpeed N DIR}.
 */
public final class BuildSpeed {

    static final int SAMPLES = 10;
    static final int VARIATIONS = 20;
    static final int BINS = 20;

    private BuildSpeed() {
    }

    // "try": the runner is opened for its side effect, the Spark context that the session below
    // is built on, and closed at the end of the block; the body need not name it
    @SuppressWarnings("try")
    public static void main(String[] args) throws Exception {
        long n = args.length > 0 ? Long.parseLong(args[0]) : 1_000_000L;
        Path dir = Path.of(args.length > 1 ? args[1] : "build-speed");
        Files.createDirectories(dir);
        long perSample = n / SAMPLES;
        try (SparkRunner runner = SparkRunner.open("local[*]", 120)) {
            SparkSession spark = SparkSession.builder().getOrCreate();
            int cores = spark.sparkContext().defaultParallelism();
            long g0 = System.nanoTime();
            for (int s = 0; s < SAMPLES; s++) {
                Path out = dir.resolve("s" + s);
                if (Files.exists(out)) continue;
                List<String> cols = new ArrayList<>(List.of("rand(" + (100 * s + 1) + ") * 1000 AS m",
                        "CAST(rand(" + (100 * s + 2) + ") * 4 AS INT) AS n_ph", "rand(" + (100 * s + 3) + ") AS iso",
                        "0.5 + rand(" + (100 * s + 4) + ") AS w"));
                for (int v = 0; v < VARIATIONS; v++) {
                    cols.add("(0.5 + rand(" + (100 * s + 4) + ")) * (0.9 + 0.2 * rand(" + (100 * s + 10 + v) + ")) AS wv" + v);
                }
                spark.range(0, perSample, 1, Math.max(2, (int) (perSample / 2_000_000))).selectExpr(cols.toArray(String[]::new))
                        .write().parquet(out.toString());
            }
            double generation = (System.nanoTime() - g0) * 1e-9;
            Path spec = Files.writeString(dir.resolve("build.json"), spec());
            long t0 = System.nanoTime();
            EventBuild.build(BuildSpecReader.read(spec), spark, dir.resolve("model.json"),
                    new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter()));
            double build = (System.nanoTime() - t0) * 1e-9;

            long javaEvents = Math.min(n, 10_000_000L);
            double loop = plainJava(javaEvents);
            double sparkRate = n / build, javaRate = javaEvents / loop;
            System.out.printf(Locale.ROOT, "events %d (generation %.1f s, not timed below), %d samples, 3 regions x %d bins, "
                    + "%d weight variations (%d weights summed with squares)%n", n, generation, SAMPLES, BINS, VARIATIONS,
                    2 * VARIATIONS + 1);
            System.out.printf(Locale.ROOT, "plumb build, Spark local[*] on %d cores: %.1f s, %.3g events/s, %.3g events/s per core%n",
                    cores, build, sparkRate, sparkRate / cores);
            System.out.printf(Locale.ROOT, "plain Java, one thread, columns in memory (%d events): %.2f s, %.3g events/s%n",
                    javaEvents, loop, javaRate);
            System.out.printf(Locale.ROOT, "ratio per core (bound / Spark): %.2f; 1e8 events at the Spark rate: %.0f s%n",
                    javaRate / (sparkRate / cores), 1e8 / sparkRate);
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

    /** The same sums in one thread over columns in arrays; seconds. */
    static double plainJava(long count) {
        int n = (int) count;
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
        int weights = 2 * VARIATIONS + 1;
        double[] sums = new double[3 * BINS * weights], squares = new double[sums.length];
        long t0 = System.nanoTime();
        for (int i = 0; i < n; i++) {
            int region = nph[i] >= 2 ? (iso[i] < 0.1 ? 0 : iso[i] < 0.3 ? 1 : -1) : iso[i] < 0.1 ? 2 : -1;
            if (region < 0) continue;
            double x = m[i];
            int bin = -1;
            for (int b = 1; b <= BINS && bin < 0; b++) if (x < b * (1000.0 / BINS)) bin = b - 1;
            if (bin < 0) continue;
            int base = (region * BINS + bin) * weights;
            double wi = w[i];
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
        double seconds = (System.nanoTime() - t0) * 1e-9;
        double check = 0;
        for (double v : sums) check += v;
        if (!(check > 0)) throw new IllegalStateException("no event selected");
        return seconds;
    }
}
