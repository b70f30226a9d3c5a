package plumb.spark.build;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.build.BuildOutcome;
import plumb.spark.build.BuildSpec.Expr;
import plumb.spark.build.BuildSpec.Outside;
import plumb.spark.build.BuildSpec.Region;
import plumb.spark.build.BuildSpec.Step;
import plumb.spark.campaign.SparkRunner;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The column-batch pass over Parquet ({@link ParquetPass}) against the row path through Spark's
 * SQL projection: the same histograms, Σw², cut flow and bad-value counts, on tables with nulls
 * and NaN, and the fallback to the row path for expressions outside the batch subset.
 */
class ParquetPassTest {

    static SparkRunner runner;
    static SparkSession spark;

    @TempDir
    static Path dir;

    @BeforeAll
    static void start() {
        runner = SparkRunner.open("local[2]", 600);   // generous: the machine running the tests may be busy
        spark = SparkSession.builder().getOrCreate();
    }

    @AfterAll
    static void stop() {
        runner.close();
    }

    static final StructType SCHEMA = new StructType()
            .add("m", DataTypes.DoubleType, true).add("n_ph", DataTypes.IntegerType, true)
            .add("iso", DataTypes.DoubleType, true).add("w", DataTypes.DoubleType, true)
            .add("w_alt", DataTypes.DoubleType, true).add("j", DataTypes.LongType, true)
            .add("x", DataTypes.FloatType, true);

    /** A table in three Parquet files: some nulls in every column, a few NaN observables and weights. */
    static List<String> table(String name, long seed, int n) throws IOException {
        SplittableRandom rng = new SplittableRandom(seed);
        List<Row> rows = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            Object m = rng.nextInt(50) == 0 ? null : rng.nextInt(80) == 0 ? Double.NaN : 95 + 50 * rng.nextDouble();
            Object nph = rng.nextInt(40) == 0 ? null : rng.nextInt(4);
            Object iso = rng.nextInt(40) == 0 ? null : rng.nextDouble() * 0.5;
            double wv = 0.5 + rng.nextDouble();
            Object w = rng.nextInt(200) == 0 ? null : rng.nextInt(300) == 0 ? Double.POSITIVE_INFINITY : wv;
            Object alt = rng.nextInt(30) == 0 ? null : wv * (0.9 + 0.2 * rng.nextDouble());
            Object j = rng.nextInt(10) == 0 ? null : rng.nextLong(-5, 5);
            rows.add(RowFactory.create(m, nph, iso, w, alt, j, (float) rng.nextDouble()));
        }
        Path out = dir.resolve(name);
        spark.createDataFrame(rows, SCHEMA).repartition(3).write().parquet(out.toString());
        List<String> files = new ArrayList<>();
        try (var s = Files.list(out)) {
            s.filter(p -> p.getFileName().toString().endsWith(".parquet")).sorted().forEach(p -> files.add(p.toUri().toString()));
        }
        assertEquals(3, files.size(), "three files, three tasks");
        return files;
    }

    static Region region(String name, double[] edges, Outside outside, String observable, String... steps) {
        List<Step> s = new ArrayList<>();
        for (int k = 0; k < steps.length; k++) s.add(new Step("step " + k, new Expr(steps[k], name + ".steps[" + k + "]")));
        return new Region(name, null, s, new Expr(observable, name + ".observable"), edges, outside, false);
    }

    /** A job with two regions (folded, dropped), a shifted observable and weights with nulls and NaN. */
    static HistogramJob job(String weight) {
        double[] edges = {100, 110, 120, 130, 140};
        Region sr = region("sr", edges, Outside.FOLD, "m", "n_ph >= 2", "iso < 0.2 OR j IS NULL");
        Region cr = region("cr", new double[] {100, 120, 140}, Outside.DROP, "m", "n_ph >= 2", "NOT (iso < 0.2)", "j <=> 1 OR j < 0");
        HistogramJob job = new HistogramJob(List.of(sr, cr), List.of("m", "m"),
                List.of(weight, "coalesce(w_alt, w)", "w_alt", "2 * w - w_alt", "CASE WHEN j > 0 THEN w * 1.1 ELSE w END"));
        return job.plus(List.of(sr), "CASE WHEN j > 0 THEN m * 1.01 ELSE m / 1.01 END");
    }

    static String view(List<String> files) {
        String name = "pq_" + Math.abs(files.hashCode());
        spark.read().parquet(files.toArray(String[]::new)).createOrReplaceTempView(name);
        return name;
    }

    /** Counts exactly equal, sums to 1e-12 relative (the two paths group the events in other partitions). */
    static void assertSameSums(HistogramJob.Sums rows, HistogramJob.Sums batches) {
        assertArrayEquals(rows.entries(), batches.entries(), "entries per cell");
        assertArrayEquals(rows.badObservable(), batches.badObservable(), "bad observables");
        assertArrayEquals(rows.badWeights(), batches.badWeights(), "bad weights");
        for (int r = 0; r < rows.flow().raw().length; r++) {
            assertArrayEquals(rows.flow().raw()[r], batches.flow().raw()[r], "cut flow counts");
            assertClose(rows.flow().weighted()[r], batches.flow().weighted()[r], "cut flow Σw");
        }
        for (int k = 0; k < rows.sums().length; k++) {
            assertClose(rows.sums()[k], batches.sums()[k], "Σw of weight " + k);
            assertClose(rows.squares()[k], batches.squares()[k], "Σw² of weight " + k);
        }
    }

    static void assertClose(double[] expected, double[] actual, String what) {
        assertEquals(expected.length, actual.length, what);
        for (int i = 0; i < expected.length; i++) {
            double e = expected[i], a = actual[i];
            if (Double.isNaN(e) || Double.isInfinite(e)) {
                assertEquals(e, a, what + " [" + i + "]");
                continue;
            }
            assertEquals(e, a, 1e-12 * Math.max(Math.abs(e), 1e-300), what + " [" + i + "]");
        }
    }

    @Test
    void batchesGiveTheRowPathsNumbersWithNullsAndNaN() throws IOException {
        List<String> files = table("mixed", 21, 20_000);
        String view = view(files);
        HistogramJob job = job("w");
        HistogramJob.Sums rows = job.run(spark, view, null);
        long before = ParquetPass.PASSES.get();
        HistogramJob.Sums batches = job.run(spark, view, files);
        assertEquals(before + 1, ParquetPass.PASSES.get(), "the pass went over column batches");
        assertSameSums(rows, batches);
        assertTrue(rows.badWeights()[0] > 0 && rows.badWeights()[2] > 0 && rows.badObservable()[0] > 0,
                "the table has bad weights and observables in selected events");
        assertTrue(rows.flow().raw()[1][2] > 100, "events pass the three steps of the second region");
        HistogramJob.Sums again = job.run(spark, view, files);
        for (int k = 0; k < batches.sums().length; k++) {
            assertArrayEquals(batches.sums()[k], again.sums()[k], 0.0, "the same sums on every run");
        }
    }

    /** The row groups of each file, read from the footers. */
    static int[] rowGroups(List<String> files) throws IOException {
        int[] out = new int[files.size()];
        for (int f = 0; f < out.length; f++) {
            try (var r = org.apache.parquet.hadoop.ParquetFileReader.open(org.apache.parquet.hadoop.util.HadoopInputFile.fromPath(
                    new org.apache.hadoop.fs.Path(files.get(f)), spark.sparkContext().hadoopConfiguration()))) {
                out[f] = r.getFooter().getBlocks().size();
            }
        }
        return out;
    }

    static ParquetPass.Input input(HistogramJob job, String view, List<String> files) {
        Map<String, Integer> distinct = new java.util.LinkedHashMap<>();
        Tally.Layout layout = job.layout(distinct);
        ParquetPass.Program program = ParquetPass.compile(spark, view, job, distinct, null);
        assertTrue(program != null, "the job compiles to column batches");
        return new ParquetPass.Input(files, program, layout);
    }

    static void assertIdentical(HistogramJob.Sums a, HistogramJob.Sums b, String what) {
        assertArrayEquals(a.entries(), b.entries(), what);
        assertArrayEquals(a.badWeights(), b.badWeights(), what);
        assertArrayEquals(a.badObservable(), b.badObservable(), what);
        for (int k = 0; k < a.sums().length; k++) {
            assertArrayEquals(a.sums()[k], b.sums()[k], 0.0, what + ": Σw of weight " + k);
            assertArrayEquals(a.squares()[k], b.squares()[k], 0.0, what + ": Σw² of weight " + k);
        }
        for (int r = 0; r < a.flow().raw().length; r++) {
            assertArrayEquals(a.flow().raw()[r], b.flow().raw()[r], what);
            assertArrayEquals(a.flow().weighted()[r], b.flow().weighted()[r], 0.0, what);
        }
    }

    @Test
    void filesCutIntoRowGroupTasksGiveTheSameSumsInOneJobOnOneOrTwoCores() throws IOException {
        // three files of several row groups each (Parquet's writer closes a group every ~16 KB here)
        SplittableRandom rng = new SplittableRandom(23);
        List<Row> rows = new ArrayList<>();
        for (int i = 0; i < 30_000; i++) {
            double wv = 0.5 + rng.nextDouble();
            rows.add(RowFactory.create(95 + 50 * rng.nextDouble(), rng.nextInt(4), rng.nextDouble() * 0.5, wv,
                    wv * (0.9 + 0.2 * rng.nextDouble()), rng.nextLong(-5, 5), (float) rng.nextDouble()));
        }
        Path out = dir.resolve("groups");
        spark.createDataFrame(rows, SCHEMA).repartition(3).write().option("parquet.block.size", 16 * 1024)
                .option("parquet.page.size", 4 * 1024).parquet(out.toString());
        List<String> files = new ArrayList<>();
        try (var s = Files.list(out)) {
            s.filter(p -> p.getFileName().toString().endsWith(".parquet")).sorted().forEach(p -> files.add(p.toUri().toString()));
        }
        int[] groups = rowGroups(files);
        for (int g : groups) assertTrue(g >= 4, "several row groups per file: " + java.util.Arrays.toString(groups));
        String view = view(files);
        ParquetPass.Input a = input(job("w"), view, files);
        ParquetPass.Input b = input(job("coalesce(w_alt, 1.5)"), view, files);

        // one task per row group against one task for everything, read in one sequence
        List<TaskPlan.Task> perGroup = TaskPlan.tasks(spark.sparkContext().hadoopConfiguration(), List.of(a), 1);
        assertEquals(java.util.Arrays.stream(groups).sum(), perGroup.size(), "a task per row group");
        HistogramJob.Sums split = ParquetPass.runAll(spark, List.of(a), 1).get(0);
        HistogramJob.Sums whole = ParquetPass.runAll(spark, List.of(a), Long.MAX_VALUE).get(0);
        assertSameSums(whole, split);
        assertSameSums(job("w").run(spark, view, null), split);   // and the row path's numbers

        // two passes in one job: each the sums of its own job, bit for bit, with a task per ~50 KB
        long jobs = ParquetPass.JOBS.get();
        List<HistogramJob.Sums> both = ParquetPass.runAll(spark, List.of(a, b), 50_000);
        assertEquals(jobs + 1, ParquetPass.JOBS.get(), "one Spark job for both passes");
        assertIdentical(ParquetPass.runAll(spark, List.of(a), 50_000).get(0), both.get(0), "pass a");
        assertIdentical(ParquetPass.runAll(spark, List.of(b), 50_000).get(0), both.get(1), "pass b");

        // the same tasks run one after the other in this thread (one core) and by Spark on two cores
        List<TaskPlan.Task> tasks = TaskPlan.tasks(spark.sparkContext().hadoopConfiguration(), List.of(a, b), 50_000);
        assertTrue(tasks.size() > 2 * files.size(), tasks.size() + " tasks");
        Tally[] one = {new Tally(a.layout()), new Tally(b.layout())};
        org.apache.hadoop.conf.Configuration shared = ParquetPass.readerConf(spark, true);
        for (TaskPlan.Task t : tasks) {
            ParquetPass.Input in = t.pass() == 0 ? a : b;
            try {
                one[t.pass()].merge(ParquetPass.tally(t, in.program(), in.layout(),
                        ParquetPass.taskConf(shared, ParquetPass.requested(in.program()).json())));
            } catch (InterruptedException e) {
                throw new AssertionError(e);
            }
        }
        assertIdentical(one[0].sums(), both.get(0), "pass a on one core");
        assertIdentical(one[1].sums(), both.get(1), "pass b on one core");

        // Parquet's vectored reads (off on the local disk unless the session sets them): the same bits
        assertTrue(ParquetPass.onLocalDisk(files.get(0)) && !ParquetPass.onLocalDisk("s3a://bucket/t.parquet"));
        assertEquals("false", ParquetPass.readerConf(spark, true).get(ParquetPass.VECTORED_READS));
        assertEquals(null, ParquetPass.readerConf(spark, false).get(ParquetPass.VECTORED_READS));
        spark.sparkContext().hadoopConfiguration().setBoolean(ParquetPass.VECTORED_READS, true);
        try {
            assertEquals("true", ParquetPass.readerConf(spark, true).get(ParquetPass.VECTORED_READS), "the session's choice");
            List<HistogramJob.Sums> vectored = ParquetPass.runAll(spark, List.of(a, b), 50_000);
            assertIdentical(both.get(0), vectored.get(0), "vectored reads");
            assertIdentical(both.get(1), vectored.get(1), "vectored reads");
        } finally {
            spark.sparkContext().hadoopConfiguration().unset(ParquetPass.VECTORED_READS);
        }

        // the executors adding up blocks of tasks' tallies before the driver (as above 1,024 tasks)
        List<HistogramJob.Sums> merged = ParquetPass.runAll(spark, List.of(a, b), 50_000, 0);
        assertSameSums(both.get(0), merged.get(0));
        assertSameSums(both.get(1), merged.get(1));
        List<HistogramJob.Sums> again = ParquetPass.runAll(spark, List.of(a, b), 50_000, 0);
        assertIdentical(merged.get(0), again.get(0), "merged blocks, second run");
        assertIdentical(merged.get(1), again.get(1), "merged blocks, second run");
    }

    @Test
    void eachFileGivesTheRowPathsSumsBitForBit() throws IOException {
        // one file is one partition of the row path and one task of the batches: the same events
        // added in the same order, so the same bits (cut flow, Σw, Σw², counts)
        List<String> files = table("bits", 23, 9_000);
        // some events in no region's cut flow, some in a cut flow but not selected; and one-step
        // regions, one of them keeping every event (every event in the cut flow and selected)
        Region all = region("all", new double[] {100, 120, 140}, Outside.DROP, "m", "true");
        Region one = region("one", new double[] {100, 110, 120, 130, 140}, Outside.FOLD, "m", "n_ph >= 1");
        for (HistogramJob job : List.of(job("CASE WHEN n_ph > 2 THEN w * 0.9 ELSE w END"),
                new HistogramJob(List.of(all, one), List.of("m", "m"), List.of("w", "w_alt", "2 * w - w_alt")))) {
            for (String file : files) {
                String view = view(List.of(file));
                HistogramJob.Sums rows = job.run(spark, view, null);
                long before = ParquetPass.PASSES.get();
                HistogramJob.Sums batches = job.run(spark, view, List.of(file));
                assertEquals(before + 1, ParquetPass.PASSES.get(), "the pass went over column batches");
                assertArrayEquals(rows.entries(), batches.entries());
                assertArrayEquals(rows.badObservable(), batches.badObservable());
                assertArrayEquals(rows.badWeights(), batches.badWeights());
                for (int r = 0; r < rows.flow().raw().length; r++) {
                    assertArrayEquals(rows.flow().raw()[r], batches.flow().raw()[r], "cut flow counts");
                    assertArrayEquals(bits(rows.flow().weighted()[r]), bits(batches.flow().weighted()[r]), "cut flow Σw");
                }
                for (int k = 0; k < rows.sums().length; k++) {
                    assertArrayEquals(bits(rows.sums()[k]), bits(batches.sums()[k]), "Σw of weight " + k);
                    assertArrayEquals(bits(rows.squares()[k]), bits(batches.squares()[k]), "Σw² of weight " + k);
                }
            }
        }
    }

    static long[] bits(double[] a) {
        long[] out = new long[a.length];
        for (int i = 0; i < a.length; i++) out[i] = Double.doubleToRawLongBits(a[i]);
        return out;
    }

    @Test
    void weightsAreEvaluatedOnlyWhereTheSelectionNeedsThem() throws IOException {
        // CAST(NaN AS INT) is an error in ANSI mode (and saturates without it, which the nodes do not
        // reproduce): a batch would refuse it. Spark's row path evaluates the weights only for the
        // events a region selects (the first weight: that pass a first step), and so do the
        // batches: the NaN observables fail the first step, the table stays on the batch path.
        List<String> files = table("selected", 24, 6_000);
        String view = view(files);
        assertTrue(spark.table(view).where("isnan(m)").count() > 0, "the table has NaN in m");
        Region r = region("r", new double[] {100, 120, 140}, Outside.FOLD, "m", "m < 1000", "n_ph >= 1");
        HistogramJob job = new HistogramJob(List.of(r), List.of("m"),
                List.of("w * CAST(m AS INT) / 100", "w + CAST(m AS INT)", "w_alt"));
        HistogramJob.Sums rows = job.run(spark, view, null);
        long before = ParquetPass.PASSES.get();
        HistogramJob.Sums batches = job.run(spark, view, files);
        assertEquals(before + 1, ParquetPass.PASSES.get(), "the pass went over column batches");
        assertSameSums(rows, batches);
        assertTrue(rows.flow().raw()[0][1] > 1000, "events selected: " + rows.flow().raw()[0][1]);
    }

    @Test
    void expressionsOutsideTheSubsetGoThroughTheRowPath() throws IOException {
        List<String> files = table("fallback", 22, 3_000);
        String view = view(files);
        for (String weight : List.of("w * sin(iso) + 1", "w + x")) {   // a function and a float column outside the subset
            HistogramJob job = job(weight);
            HistogramJob.Sums rows = job.run(spark, view, null);
            long before = ParquetPass.PASSES.get();
            HistogramJob.Sums other = job.run(spark, view, files);
            assertEquals(before, ParquetPass.PASSES.get(), weight + ": no pass over column batches");
            assertSameSums(rows, other);
        }
    }

    @Test
    void aBuildFromParquetEqualsTheBuildFromTheSameEventsAsCsv() throws IOException {
        Path csv = dir.resolve("csv");
        Files.createDirectories(csv);
        Path csvSpec = EventBuildTest.fixture(csv);
        Path pq = dir.resolve("pq");
        Files.createDirectories(pq);
        for (String t : List.of("sig", "bkg_a", "bkg_b", "alt_bkg_up", "data")) {
            spark.read().option("header", "true").option("inferSchema", "true").csv(csv.resolve(t + ".csv").toString())
                    .repartition(2).write().parquet(pq.resolve(t + ".parquet").toString());
        }
        Path pqSpec = Files.writeString(pq.resolve("build.json"), Files.readString(csvSpec).replace(".csv", ".parquet"));
        BuildOutcome fromCsv = build(csvSpec, csv.resolve("model.json"));
        long before = ParquetPass.PASSES.get(), jobs = ParquetPass.JOBS.get();
        BuildOutcome fromParquet = build(pqSpec, pq.resolve("model.json"));
        assertEquals(before + 4, ParquetPass.PASSES.get(), "sig, bkg, the alternative tables and the data over column batches");
        assertEquals(jobs + 1, ParquetPass.JOBS.get(), "the four passes in one Spark job");
        ObjectMapper json = new ObjectMapper();
        assertJsonClose(json.readTree(fromCsv.model().toFile()), json.readTree(fromParquet.model().toFile()), "model");
        assertEquals(fromCsv.cutFlow().size(), fromParquet.cutFlow().size());
        for (int i = 0; i < fromCsv.cutFlow().size(); i++) {
            var a = fromCsv.cutFlow().get(i);
            var b = fromParquet.cutFlow().get(i);
            assertEquals(a.raw(), b.raw(), "cut flow events " + a);
            assertEquals(a.weighted(), b.weighted(), 1e-12 * Math.abs(a.weighted()), "cut flow Σw " + a);
        }
    }

    static BuildOutcome build(Path spec, Path out) {
        return EventBuild.build(BuildSpecReader.read(spec), spark, out, new PrintWriter(new StringWriter()),
                new PrintWriter(new StringWriter()));
    }

    /** The same JSON tree, numbers to 1e-12 relative. */
    static void assertJsonClose(JsonNode a, JsonNode b, String path) {
        if (a.isNumber()) {
            assertTrue(b.isNumber(), path);
            assertEquals(a.doubleValue(), b.doubleValue(), 1e-12 * Math.abs(a.doubleValue()), path);
        } else if (a.isObject()) {
            assertEquals(a.size(), b.size(), path + ": keys");
            for (Iterator<Map.Entry<String, JsonNode>> it = a.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                assertTrue(b.has(e.getKey()), path + "." + e.getKey());
                assertJsonClose(e.getValue(), b.get(e.getKey()), path + "." + e.getKey());
            }
        } else if (a.isArray()) {
            assertEquals(a.size(), b.size(), path + ": length");
            for (int i = 0; i < a.size(); i++) assertJsonClose(a.get(i), b.get(i), path + "[" + i + "]");
        } else {
            assertEquals(a, b, path);
        }
    }
}
