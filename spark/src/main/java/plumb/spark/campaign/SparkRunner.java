package plumb.spark.campaign;

import org.apache.spark.SparkConf;
import org.apache.spark.SparkContext;
import org.apache.spark.TaskContext;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.Function;
import org.apache.spark.scheduler.SparkListener;
import org.apache.spark.scheduler.SparkListenerTaskEnd;
import org.apache.spark.Success$;
import plumb.cli.ComputationException;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.RangeWork;
import plumb.engine.inference.WorkRunner;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.Executors;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.AtomicReference;
import java.util.function.IntConsumer;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Runs {@link RangeWork} on Apache Spark. The indices are cut into contiguous ranges, one Spark
 * task each; a task compiles nothing and reads no file: it takes the model from the broadcast
 * bytes (deserialised once per executor, {@link ModelBytes}), runs its range with one worker and
 * returns the compact results. Results are put back in index order, so they equal a run on
 * threads; a retried task recomputes the same numbers because each index depends only on itself.
 */
public final class SparkRunner implements WorkRunner {

    /** Tasks per core of the cluster: enough for load balance and a moving progress bar. */
    static final int TASKS_PER_CORE = 16;
    /** Attempts of a task in an embedded run (Spark's local mode tries once unless told otherwise). */
    static final int LOCAL_ATTEMPTS = 4;

    /**
     * For the fault test: the task (range number) that throws on its first attempt in the next
     * runs, or −1. Read on the driver and shipped with the tasks.
     */
    static volatile int failFirstAttemptOf = -1;

    /** Failures injected so far (executors of an embedded run share this process). */
    static final java.util.concurrent.atomic.AtomicInteger INJECTED = new java.util.concurrent.atomic.AtomicInteger();

    private final JavaSparkContext sc;
    private final String master;
    private final Map<CompiledModel, ModelBytes.Shared> broadcasts = new IdentityHashMap<>();
    private final AtomicReference<RunProgress> active = new AtomicReference<>();

    private SparkRunner(JavaSparkContext sc, String master) {
        this.sc = sc;
        this.master = master;
        sc.sc().addSparkListener(new SparkListener() {
            @Override
            public void onTaskEnd(SparkListenerTaskEnd end) {
                RunProgress p = active.get();
                if (p != null && end.reason() == Success$.MODULE$ && "ResultTask".equals(end.taskType())) {
                    p.finished(end.taskInfo().index());
                }
            }
        });
    }

    /**
     * Connects to {@code master} (or starts an embedded Spark for local[…]) and checks that a
     * first task runs, all within {@code timeoutSeconds}.
     *
     * @throws ComputationException when that does not happen in time or Spark refuses the master
     */
    public static SparkRunner open(String master, int timeoutSeconds) {
        if (master.equals("yarn") && !onClasspath("org.apache.spark.deploy.yarn.YarnClusterManager")) {
            throw new ComputationException("--spark yarn: this process has no YARN support; submit "
                    + "spark/target/plumb-spark.jar with spark-submit --master yarn (README, Spark)");
        }
        String effective = withRetries(master);
        ExecutorService starter = Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "plumb-spark-start");
            t.setDaemon(true);
            return t;
        });
        AtomicReference<JavaSparkContext> started = new AtomicReference<>();
        Future<JavaSparkContext> f = starter.submit(() -> {
            JavaSparkContext sc = JavaSparkContext.fromSparkContext(SparkContext.getOrCreate(conf(effective)));
            started.set(sc);
            sc.parallelize(List.of(1), 1).count();   // a first task: the master and an executor answer
            return sc;
        });
        starter.shutdown();
        try {
            return new SparkRunner(f.get(timeoutSeconds, TimeUnit.SECONDS), master);
        } catch (TimeoutException e) {
            f.cancel(true);
            stopQuietly(started.get());
            throw new ComputationException(String.format(Locale.ROOT,
                    "--spark %s: no answer from the master or no executor within %d s (--spark-timeout)", master, timeoutSeconds));
        } catch (ExecutionException e) {
            stopQuietly(started.get());
            Throwable t = e.getCause();
            String why = t.getMessage() == null ? t.getClass().getSimpleName() : t.getMessage().lines().findFirst().orElse("");
            throw new ComputationException("--spark " + master + ": Spark did not start: " + why);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new ComputationException("--spark " + master + ": interrupted while starting Spark");
        }
    }

    private static boolean onClasspath(String name) {
        try {
            Class.forName(name, false, SparkRunner.class.getClassLoader());
            return true;
        } catch (ClassNotFoundException e) {
            return false;
        }
    }

    /** Stops a context that started but did not answer, waiting 30 s at most (it may hang). */
    private static void stopQuietly(JavaSparkContext sc) {
        if (sc == null) return;
        Thread t = new Thread(() -> {
            try {
                sc.stop();
            } catch (RuntimeException ignored) {
                // already failing: the one-line message is what the user sees
            }
        }, "plumb-spark-stop");
        t.setDaemon(true);
        t.start();
        try {
            t.join(30_000);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /** local, local[N] and local[*] with retries (local[N, attempts]); other masters as given. */
    static String withRetries(String master) {
        if (master.equals("local")) return "local[1," + LOCAL_ATTEMPTS + "]";
        Matcher m = Pattern.compile("local\\[([0-9]+|\\*)]").matcher(master);
        if (m.matches()) return "local[" + m.group(1) + "," + LOCAL_ATTEMPTS + "]";
        return master;
    }

    private static SparkConf conf(String master) {
        SparkConf conf = new SparkConf().setAppName("plumb").setMaster(master);
        if (master.startsWith("local")) {
            conf.set("spark.ui.enabled", "false");
            conf.set("spark.driver.host", "127.0.0.1");
            conf.set("spark.driver.bindAddress", "127.0.0.1");
        } else if (!conf.contains("spark.jars")) {
            // Outside spark-submit: ship this jar (Plumb and its libraries) to the executors.
            scala.Option<String> jar = SparkContext.jarOfClass(SparkRunner.class);
            if (jar.isDefined()) conf.setJars(new String[] {jar.get()});
        }
        return conf;
    }

    /** The Spark context (for tests and for other work of the spark module). */
    public JavaSparkContext context() {
        return sc;
    }

    /** Cores the cluster offers now (Spark's default parallelism). */
    int cores() {
        return Math.max(1, sc.defaultParallelism());
    }

    @Override
    public <W, R extends Serializable> List<R> run(CompiledModel m, RangeWork<W, R> work, int count, IntConsumer progress) {
        if (count == 0) return List.of();
        int tasks = Math.min(count, TASKS_PER_CORE * cores());
        List<IndexRange> ranges = new ArrayList<>(tasks);
        int[] sizes = new int[tasks];
        for (int t = 0, start = 0; t < tasks; t++) {
            int size = count / tasks + (t < count % tasks ? 1 : 0);
            ranges.add(new IndexRange(t, start, size));
            sizes[t] = size;
            start += size;
        }
        RangeTask<W, R> task = new RangeTask<>(broadcast(m), work, failFirstAttemptOf);
        List<RangeResult> chunks = collect(ranges, sizes, progress, task);
        Object[] out = new Object[count];
        for (RangeResult c : chunks) System.arraycopy(c.results(), 0, out, c.start(), c.results().length);
        List<R> list = new ArrayList<>(count);
        for (Object o : out) {
            @SuppressWarnings("unchecked") R r = (R) o;
            list.add(r);
        }
        return list;
    }

    @Override
    public <R extends Serializable> List<R> runEach(List<CompiledModel> models, ModelWork<R> work, IntConsumer progress) {
        if (models.isEmpty()) return List.of();
        List<ModelBytes.Shared> bytes = new ArrayList<>();
        for (CompiledModel m : models) bytes.add(broadcast(m));
        List<IndexRange> ranges = new ArrayList<>();
        int[] sizes = new int[models.size()];
        for (int i = 0; i < models.size(); i++) {
            ranges.add(new IndexRange(i, i, 1));
            sizes[i] = 1;
        }
        List<RangeResult> chunks = collect(ranges, sizes, progress, new EachTask<>(bytes, work, failFirstAttemptOf));
        Object[] out = new Object[models.size()];
        for (RangeResult c : chunks) out[c.start()] = c.results()[0];
        List<R> list = new ArrayList<>();
        for (Object o : out) {
            @SuppressWarnings("unchecked") R r = (R) o;
            list.add(r);
        }
        return list;
    }

    /** Runs one Spark job, a task per range, with progress fed by the tasks that finish. */
    private List<RangeResult> collect(List<IndexRange> ranges, int[] sizes, IntConsumer progress,
                                      Function<IndexRange, RangeResult> task) {
        var rdd = sc.parallelize(ranges, ranges.size()).map(task);
        RunProgress p = new RunProgress(sizes, progress);
        active.set(p);
        try {
            sc.setJobDescription("plumb " + ranges.size() + " tasks");
            List<RangeResult> out = rdd.collect();
            if (progress != null) progress.accept(Arrays.stream(sizes).sum());
            return out;
        } catch (RuntimeException e) {
            throw new ComputationException("--spark " + master + ": the Spark job failed: "
                    + String.valueOf(rootMessage(e)).lines().findFirst().orElse(""));
        } finally {
            active.set(null);
        }
    }

    private static String rootMessage(Throwable e) {
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }

    private ModelBytes.Shared broadcast(CompiledModel m) {
        return broadcasts.computeIfAbsent(m, k -> ModelBytes.Shared.of(sc, k));
    }

    @Override
    public void close() {
        for (ModelBytes.Shared b : broadcasts.values()) b.bytes().destroy();
        broadcasts.clear();
        sc.stop();
    }

    /** Indices {@code start .. start + size − 1}, task {@code task} of a run. */
    record IndexRange(int task, int start, int size) implements Serializable { }

    /** The compact results of one range, in index order. */
    record RangeResult(int start, Object[] results) implements Serializable { }

    /** A task: one range of the work on the broadcast model. */
    record RangeTask<W, R extends Serializable>(ModelBytes.Shared model, RangeWork<W, R> work, int failTask)
            implements Function<IndexRange, RangeResult> {
        @Override
        public RangeResult call(IndexRange range) {
            injectedFailure(range, failTask);
            CompiledModel m = model.model();
            W worker = work.worker(m);
            Object[] out = new Object[range.size()];
            for (int i = 0; i < out.length; i++) out[i] = work.run(worker, m, range.start() + i);
            return new RangeResult(range.start(), out);
        }
    }

    /** A task: the work of one model of several. */
    record EachTask<R extends Serializable>(List<ModelBytes.Shared> models, ModelWork<R> work, int failTask)
            implements Function<IndexRange, RangeResult> {
        @Override
        public RangeResult call(IndexRange range) {
            injectedFailure(range, failTask);
            CompiledModel m = models.get(range.start()).model();
            return new RangeResult(range.start(), new Object[] {work.run(m, range.start())});
        }
    }

    private static void injectedFailure(IndexRange range, int failTask) {
        TaskContext c = TaskContext.get();
        if (range.task() == failTask && c != null && c.attemptNumber() == 0) {
            INJECTED.incrementAndGet();
            throw new IllegalStateException("injected failure of task " + failTask + " on its first attempt");
        }
    }

    /** Progress of the running job: task ends add their range's size (once per range). */
    private static final class RunProgress {
        private final int[] sizes;
        private final boolean[] done;
        private final IntConsumer progress;
        private int finished;

        RunProgress(int[] sizes, IntConsumer progress) {
            this.sizes = sizes;
            this.done = new boolean[sizes.length];
            this.progress = progress;
        }

        synchronized void finished(int task) {
            if (task < 0 || task >= sizes.length || done[task]) return;
            done[task] = true;
            finished += sizes[task];
            if (progress != null) progress.accept(finished);
        }
    }
}
