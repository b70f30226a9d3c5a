package plumb.spark.build;

import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.catalyst.expressions.Expression;
import org.apache.spark.sql.execution.datasources.parquet.VectorizedParquetRecordReader;
import org.apache.spark.sql.vectorized.ColumnVector;
import org.apache.spark.sql.vectorized.ColumnarBatch;
import plumb.spark.build.BuildSpec.Region;

import java.io.IOException;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The pass of {@link HistogramJob} over Parquet tables without Spark's SQL engine: Spark schedules
 * one task per file (so a cluster given by {@code --spark} still shares the work), each task reads
 * the columns the expressions use with Spark's vectorized Parquet reader, a batch of 4,096 events
 * at a time, evaluates the expressions over the batch with {@link BatchExpr} nodes and fills a
 * {@link Tally}; the driver adds the tallies up in file order. The row path spent most of its
 * time turning column batches into rows and evaluating one event at a time.
 *
 * <p>The expressions are the trees Spark's analysis resolved, compiled by {@link BatchCompiler};
 * when one is outside its subset, when a batch is refused (a value where Spark would raise an
 * error) or when the reading fails, {@link #run} returns null and the caller runs the row path,
 * which gives Spark's own numbers and messages.
 */
final class ParquetPass {

    /** Passes run over column batches in this process (tests check which path a build took). */
    static final java.util.concurrent.atomic.AtomicLong PASSES = new java.util.concurrent.atomic.AtomicLong();

    /** Events per batch: Spark's own default for its vectorized reader. */
    static final int BATCH = 4096;

    private ParquetPass() {
    }

    /**
     * What each task evaluates: the columns read, each step of each distinct region (in the
     * order of the job's layout), each distinct observable and each weight.
     */
    record Program(BatchExpr.Column[] columns, BatchExpr[][] steps, BatchExpr[] observables, BatchExpr[] weights)
            implements Serializable {
    }

    /**
     * Compiles the job's expressions over {@code view}: the trees in {@code analysed} (by SQL;
     * may be null) as they are, the others after one analysis by Spark; null when one of them is
     * outside the subset.
     */
    static Program compile(SparkSession spark, String view, HistogramJob job, Map<String, Integer> distinct,
                           Map<String, Expression> analysed) {
        List<Region> regions = job.distinctRegions();
        List<String> sql = new ArrayList<>();
        for (Region r : regions) for (BuildSpec.Step s : r.steps()) sql.add(s.keep().sql());
        sql.addAll(distinct.keySet());   // in the order of their columns in the layout
        sql.addAll(job.weights());
        Map<String, BatchExpr.Column> columns = new LinkedHashMap<>();
        BatchCompiler compiler = new BatchCompiler(columns);
        try {
            List<String> missing = sql.stream().filter(e -> analysed == null || !analysed.containsKey(e)).distinct().toList();
            Map<String, Expression> known = new java.util.HashMap<>(analysed == null ? Map.of() : analysed);
            if (!missing.isEmpty()) {
                List<Expression> more = BatchCompiler.analysed(spark.table(view), missing);
                for (int i = 0; i < missing.size(); i++) known.put(missing.get(i), more.get(i));
            }
            List<Expression> trees = sql.stream().map(known::get).toList();
            int k = 0;
            BatchExpr[][] steps = new BatchExpr[regions.size()][];
            for (int r = 0; r < regions.size(); r++) {
                steps[r] = new BatchExpr[regions.get(r).steps().size()];
                for (int s = 0; s < steps[r].length; s++) {
                    steps[r][s] = compiler.compile(trees.get(k++));
                    if (steps[r][s].kind != BatchExpr.Kind.BOOL) return null;
                }
            }
            BatchExpr[] observables = new BatchExpr[distinct.size()], weights = new BatchExpr[job.weights().size()];
            for (int o = 0; o < observables.length; o++) observables[o] = number(compiler.compile(trees.get(k++)));
            for (int w = 0; w < weights.length; w++) weights[w] = number(compiler.compile(trees.get(k++)));
            if (columns.isEmpty()) return null;   // nothing to read: no batches to count the events by
            return new Program(columns.values().toArray(BatchExpr.Column[]::new), steps, observables, weights);
        } catch (BatchCompiler.Unsupported | NumberExpected e) {
            return null;
        }
    }

    private static final class NumberExpected extends Exception {
        private static final long serialVersionUID = 1L;

        NumberExpected() {
            super(null, null, false, false);
        }
    }

    private static BatchExpr number(BatchExpr e) throws NumberExpected {
        if (e.kind == BatchExpr.Kind.BOOL) throw new NumberExpected();
        return e;
    }

    /**
     * Runs the program over the files, one Spark task per file; the sums in file order, or null
     * when a task refused its events or failed.
     */
    static HistogramJob.Sums run(SparkSession spark, List<String> files, Program program, Tally.Layout layout) {
        List<Tally> parts;
        try {
            parts = JavaSparkContext.fromSparkContext(spark.sparkContext())
                    .parallelize(files, files.size())
                    .map(file -> tally(file, program, layout))
                    .collect();
        } catch (RuntimeException e) {   // reading failed: the row path reads again and says why in Spark's words
            return null;
        }
        Tally total = new Tally(layout);
        for (Tally t : parts) {
            if (t.refused != null) return null;
            total.merge(t);   // in file order: the same sums on every run
        }
        PASSES.incrementAndGet();
        return total.sums();
    }

    /** One task: the tally of one file. */
    static Tally tally(String file, Program program, Tally.Layout layout) throws IOException {
        Tally tally = new Tally(layout);
        BatchExpr.Column[] columns = program.columns();
        List<String> names = new ArrayList<>();
        for (BatchExpr.Column c : columns) names.add(c.name);
        List<BatchExpr> roots = new ArrayList<>();
        for (BatchExpr[] s : program.steps()) roots.addAll(List.of(s));
        roots.addAll(List.of(program.observables()));
        roots.addAll(List.of(program.weights()));
        for (BatchExpr c : columns) c.allocate(BATCH);
        for (BatchExpr r : roots) r.allocate(BATCH);
        int[][] depth = new int[program.steps().length][BATCH];
        double[][] x = new double[program.observables().length][], w = new double[program.weights().length][];
        BatchExpr.Batch batch = new BatchExpr.Batch();
        VectorizedParquetRecordReader reader = new VectorizedParquetRecordReader(false, BATCH);
        try {
            reader.initialize(file, names);
            ColumnarBatch read = reader.resultBatch();
            for (int j = 0; j < columns.length; j++) {
                BatchExpr.Column c = columns[j];
                try {
                    BatchExpr.Kind kind = BatchCompiler.kind(read.column(j).dataType());
                    if (kind != c.kind || BatchCompiler.bits(read.column(j).dataType()) != c.bits) {
                        tally.refused = "column " + c.name + " has another type in " + file;
                    }
                } catch (BatchCompiler.Unsupported e) {
                    tally.refused = "column " + c.name + ": " + e.getMessage();
                }
            }
            if (tally.refused != null) return tally;
            while (reader.nextBatch()) {
                int n = read.numRows();
                for (int j = 0; j < columns.length; j++) load(read.column(j), columns[j], n);
                batch.n = n;
                for (BatchExpr r : roots) r.eval(batch);
                if (batch.refused != null) {
                    tally.refused = batch.refused;
                    return tally;
                }
                for (int r = 0; r < depth.length; r++) depth(program.steps()[r], depth[r], n);
                for (int o = 0; o < x.length; o++) x[o] = doubles(program.observables()[o], x[o], n);
                for (int k = 0; k < w.length; k++) w[k] = doubles(program.weights()[k], w[k], n);
                tally.add(n, depth, x, w);
            }
        } finally {
            reader.close();
        }
        return tally;
    }

    /**
     * A number node's values as doubles with NaN where null: its own array when it holds doubles
     * without nulls, else {@code buffer} (made when null) filled.
     */
    private static double[] doubles(BatchExpr e, double[] buffer, int n) {
        if (e.kind == BatchExpr.Kind.DOUBLE && !e.anyNull) return e.d;
        double[] out = buffer == null || buffer == e.d ? new double[BATCH] : buffer;
        for (int i = 0; i < n; i++) out[i] = e.asDouble(i);
        return out;
    }

    /** How many steps each event passes in a row (a null step fails, as in the row path). */
    private static void depth(BatchExpr[] steps, int[] out, int n) {
        java.util.Arrays.fill(out, 0, n, steps.length);
        for (int k = steps.length - 1; k >= 0; k--) {
            BatchExpr s = steps[k];
            for (int i = 0; i < n; i++) if (!s.isTrue(i)) out[i] = k;
        }
    }

    /** Copies one column of the batch into its node's arrays (zero where null). */
    private static void load(ColumnVector v, BatchExpr.Column c, int n) {
        boolean nulls = v.hasNull();
        c.anyNull = nulls;
        switch (c.kind) {
            case DOUBLE -> { for (int i = 0; i < n; i++) c.d[i] = v.getDouble(i); }
            case LONG -> {
                if (c.bits == 32) for (int i = 0; i < n; i++) c.l[i] = v.getInt(i);
                else for (int i = 0; i < n; i++) c.l[i] = v.getLong(i);
            }
            case BOOL -> { for (int i = 0; i < n; i++) c.b[i] = v.getBoolean(i); }
        }
        if (!nulls) return;
        for (int i = 0; i < n; i++) {
            boolean isNull = v.isNullAt(i);
            c.nul[i] = isNull;
            if (!isNull) continue;
            switch (c.kind) {
                case DOUBLE -> c.d[i] = 0;
                case LONG -> c.l[i] = 0;
                case BOOL -> c.b[i] = false;
            }
        }
    }
}
