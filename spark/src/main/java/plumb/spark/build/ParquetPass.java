package plumb.spark.build;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.mapreduce.TaskAttemptID;
import org.apache.hadoop.mapred.FileSplit;
import org.apache.hadoop.mapreduce.task.TaskAttemptContextImpl;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.catalyst.expressions.Expression;
import org.apache.spark.sql.execution.datasources.parquet.ParquetReadSupport;
import org.apache.spark.sql.execution.datasources.parquet.VectorizedParquetRecordReader;
import org.apache.spark.sql.internal.SQLConf;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.apache.spark.util.SerializableConfiguration;
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

    /** One pass to run: its Parquet files in order, its compiled program and its layout. */
    record Input(List<String> files, Program program, Tally.Layout layout) {
    }

    /**
     * Runs one pass (see {@link #runAll}): the sums, or null when a task refused its events or
     * the reading failed.
     */
    static HistogramJob.Sums run(SparkSession spark, List<String> files, Program program, Tally.Layout layout) {
        return runAll(spark, List.of(new Input(files, program, layout))).get(0);
    }

    /**
     * Runs every pass in ONE Spark job, so that the cores stay busy from the first table to the
     * last instead of idling at the end of each pass. The files are cut into tasks by
     * {@link TaskPlan} (whole row groups, about {@link TaskPlan#TASK_BYTES} of the columns read
     * per task); each task sums its ranges in order into one tally, and the driver adds the
     * tasks' tallies of each pass in order. The cut depends on the files alone, not on the
     * number of cores: a build gives the same numbers on every run and any cluster. Per pass the
     * sums, or null where a task refused its events; when the job fails, each pass is tried
     * once more on its own, so that one unreadable table sends only itself to the row path.
     */
    static List<HistogramJob.Sums> runAll(SparkSession spark, List<Input> inputs) {
        return runAll(spark, inputs, TaskPlan.TASK_BYTES, MERGED_ABOVE);
    }

    /** As above, with tasks of {@code taskBytes} (tests cut files into more tasks). */
    static List<HistogramJob.Sums> runAll(SparkSession spark, List<Input> inputs, long taskBytes) {
        return runAll(spark, inputs, taskBytes, MERGED_ABOVE);
    }

    /**
     * Above this many tasks the executors add up the tallies of {@link #MERGED} consecutive tasks
     * before the driver gets them: a cluster's thousands of tasks would otherwise each send their
     * sums to the driver (tens of KB each, up to MB for many bins and weights), past Spark's
     * default limit of 1 GB of results per job.
     */
    static final int MERGED_ABOVE = 1024;

    /** Consecutive tasks of one pass whose tallies an executor adds up, in order. */
    static final int MERGED = 32;

    /** As above; above {@code mergedAbove} tasks the executors merge blocks of {@link #MERGED} tasks' tallies. */
    static List<HistogramJob.Sums> runAll(SparkSession spark, List<Input> inputs, long taskBytes, int mergedAbove) {
        List<HistogramJob.Sums> out = new ArrayList<>();
        List<TaskPlan.Task> tasks;
        try {
            tasks = TaskPlan.tasks(spark.sparkContext().hadoopConfiguration(), inputs, taskBytes);
        } catch (IOException | RuntimeException e) {   // a footer that cannot be read: the row path says why
            for (int i = 0; i < inputs.size(); i++) out.add(null);
            return out;
        }
        List<Tally> parts;
        int[] passOf;
        try {
            if (tasks.size() > mergedAbove) {
                int[] blockOf = blocks(tasks, MERGED);
                parts = collectMerged(spark, inputs, tasks, blockOf);
                passOf = new int[parts.size()];
                for (int t = 0; t < tasks.size(); t++) passOf[blockOf[t]] = tasks.get(t).pass();
            } else {
                parts = collect(spark, inputs, tasks);
                passOf = tasks.stream().mapToInt(TaskPlan.Task::pass).toArray();
            }
        } catch (Exception e) {   // reading failed (Spark's exceptions are checked ones in Java's eyes): the row path reads again and says why in Spark's words
            if (inputs.size() == 1) {
                out.add(null);
                return out;
            }
            for (Input in : inputs) out.add(runAll(spark, List.of(in), taskBytes, mergedAbove).get(0));
            return out;
        }
        Tally[] totals = new Tally[inputs.size()];
        boolean[] refused = new boolean[inputs.size()];
        for (int i = 0; i < totals.length; i++) totals[i] = new Tally(inputs.get(i).layout());
        for (int t = 0; t < parts.size(); t++) {   // in task order: the same sums on every run
            int pass = passOf[t];
            if (parts.get(t).refused != null) refused[pass] = true;
            else totals[pass].merge(parts.get(t));
        }
        for (int i = 0; i < totals.length; i++) {
            if (refused[i]) {
                out.add(null);
            } else {
                PASSES.incrementAndGet();
                out.add(totals[i].sums());
            }
        }
        return out;
    }

    /** The Spark job: one task per planned task, its tally back in the same order. */
    private static List<Tally> collect(SparkSession spark, List<Input> inputs, List<TaskPlan.Task> tasks) {
        return tallies(spark, inputs, tasks).collect();
    }

    /**
     * Blocks of at most {@code size} consecutive tasks of one pass: the block of each task (the
     * tasks are in pass order).
     */
    static int[] blocks(List<TaskPlan.Task> tasks, int size) {
        int[] blockOf = new int[tasks.size()];
        int block = -1, inBlock = size;
        for (int t = 0; t < tasks.size(); t++) {
            if (inBlock == size || tasks.get(t).pass() != tasks.get(t - 1).pass()) {
                block++;
                inBlock = 0;
            }
            blockOf[t] = block;
            inBlock++;
        }
        return blockOf;
    }

    /**
     * The job with the executors adding up each block's tallies in task order (Spark groups a
     * block's tallies on one executor, in no set order: they are sorted by task first), one
     * tally per block back, in block order. A refused tally makes its block's refused.
     */
    private static List<Tally> collectMerged(SparkSession spark, List<Input> inputs, List<TaskPlan.Task> tasks,
                                             int[] blockOf) {
        int blocks = blockOf.length == 0 ? 0 : blockOf[blockOf.length - 1] + 1;
        List<scala.Tuple2<Integer, Tally>> merged = tallies(spark, inputs, tasks)
                .mapPartitionsWithIndex((task, it) -> {
                    List<scala.Tuple2<Integer, scala.Tuple2<Integer, Tally>>> out = new ArrayList<>();
                    while (it.hasNext()) out.add(new scala.Tuple2<>(blockOf[task], new scala.Tuple2<>(task, it.next())));
                    return out.iterator();
                }, true)
                .mapToPair(x -> x)
                .groupByKey(Math.max(1, Math.min(blocks, spark.sparkContext().defaultParallelism() * 4)))
                .mapValues(block -> {
                    List<scala.Tuple2<Integer, Tally>> inOrder = new ArrayList<>();
                    block.forEach(inOrder::add);
                    inOrder.sort(java.util.Comparator.comparing(scala.Tuple2::_1));
                    Tally sum = null;
                    for (scala.Tuple2<Integer, Tally> t : inOrder) {
                        if (sum == null) sum = t._2();
                        else if (t._2().refused != null) sum.refused = t._2().refused;
                        else if (sum.refused == null) sum.merge(t._2());
                    }
                    return sum;
                })
                .collect();
        Tally[] byBlock = new Tally[blocks];
        for (scala.Tuple2<Integer, Tally> b : merged) byBlock[b._1()] = b._2();
        return List.of(byBlock);
    }

    /** The tasks' tallies, one partition per task in plan order. */
    private static org.apache.spark.api.java.JavaRDD<Tally> tallies(SparkSession spark, List<Input> inputs,
                                                                  List<TaskPlan.Task> tasks) {
        JavaSparkContext sc = JavaSparkContext.fromSparkContext(spark.sparkContext());
        Program[] programs = inputs.stream().map(Input::program).toArray(Program[]::new);
        Tally.Layout[] layouts = inputs.stream().map(Input::layout).toArray(Tally.Layout[]::new);
        String[] schemas = inputs.stream().map(in -> requested(in.program()).json()).toArray(String[]::new);
        // The driver's Hadoop settings, shipped once per job and read once per executor (parsing
        // Hadoop's default XML files per file cost more than reading a small file's footer).
        boolean local = inputs.stream().allMatch(in -> in.files().stream().allMatch(ParquetPass::onLocalDisk));
        Broadcast<SerializableConfiguration> conf = sc.broadcast(new SerializableConfiguration(readerConf(spark, local)));
        JOBS.incrementAndGet();
        return sc.parallelize(tasks, Math.max(1, tasks.size()))
                .map(task -> tally(task, programs[task.pass()], layouts[task.pass()],
                        taskConf(conf.value().value(), schemas[task.pass()])));
    }

    /** Jobs run by {@link #runAll} in this process (tests check that a build's passes share one). */
    static final java.util.concurrent.atomic.AtomicLong JOBS = new java.util.concurrent.atomic.AtomicLong();

    /** Parquet's switch for reading a row group's column chunks as one vectored (asynchronous) read. */
    static final String VECTORED_READS = "parquet.hadoop.vectored.io.enabled";

    /**
     * The reader's Hadoop settings: the session's, with those Spark's Parquet scan sets for its
     * own reader (binary is not text, INT96 is not a timestamp, names match whatever their case).
     * On the local disk ({@code localFiles}) column chunks are read plainly in the task's thread
     * unless the session says otherwise: Parquet's vectored reads go through Java's asynchronous
     * file channel and its thread pool there, which cost about a third more CPU per event in the
     * benchmark's tasks (README, "Building from events: speed"); on a remote store they fetch
     * ranges in parallel and stay.
     */
    static Configuration readerConf(SparkSession spark, boolean localFiles) {
        Configuration c = new Configuration(spark.sparkContext().hadoopConfiguration());
        c.set("parquet.read.support.class", ParquetReadSupport.class.getName());
        c.setBoolean(SQLConf.PARQUET_BINARY_AS_STRING().key(), false);
        c.setBoolean(SQLConf.PARQUET_INT96_AS_TIMESTAMP().key(), false);
        c.setBoolean(SQLConf.CASE_SENSITIVE().key(), false);
        c.setBoolean(SQLConf.PARQUET_INFER_TIMESTAMP_NTZ_ENABLED().key(), false);
        c.setBoolean(SQLConf.LEGACY_PARQUET_NANOS_AS_LONG().key(), false);
        if (localFiles && c.get(VECTORED_READS) == null) c.setBoolean(VECTORED_READS, false);
        return c;
    }

    /** Whether a file is on this machine's file system (a file: URI or a path without scheme). */
    static boolean onLocalDisk(String file) {
        String scheme = new Path(file).toUri().getScheme();
        return scheme == null || scheme.equals("file");
    }

    /** A task's own copy of the shared settings, with the columns its pass reads (a copy, not a parse). */
    static Configuration taskConf(Configuration shared, String requestedSchema) {
        Configuration c = new Configuration(shared);
        c.set(ParquetReadSupport.SPARK_ROW_REQUESTED_SCHEMA(), requestedSchema);
        return c;
    }

    /** The columns the program reads, with the types it was compiled for. */
    static StructType requested(Program program) {
        StructType t = new StructType();
        for (BatchExpr.Column c : program.columns()) {
            DataType type = switch (c.kind) {
                case DOUBLE -> DataTypes.DoubleType;
                case LONG -> c.bits == 32 ? DataTypes.IntegerType : DataTypes.LongType;
                case BOOL -> DataTypes.BooleanType;
            };
            t = t.add(c.name, type, true);
        }
        return t;
    }

    /** One task: the tally of its ranges, summed in order. */
    static Tally tally(TaskPlan.Task task, Program program, Tally.Layout layout, Configuration conf)
            throws IOException, InterruptedException {
        Tally tally = new Tally(layout);
        BatchExpr.Column[] columns = program.columns();
        BatchTally loop = new BatchTally(program, tally, BATCH);
        TaskAttemptContextImpl context = new TaskAttemptContextImpl(conf, new TaskAttemptID());
        for (TaskPlan.Range range : task.ranges()) {
            String file = range.file();
            VectorizedParquetRecordReader reader = new VectorizedParquetRecordReader(false, BATCH);
            try {
                reader.initialize(new FileSplit(new Path(file), range.start(), range.end() - range.start(), new String[0]),
                        context);
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
                    tally.refused = loop.add(read);
                    if (tally.refused != null) return tally;
                }
            } finally {
                reader.close();
            }
        }
        return tally;
    }
}
