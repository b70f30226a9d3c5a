package plumb.spark.build;

import java.io.PrintWriter;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicInteger;
import org.apache.spark.scheduler.SparkListener;
import org.apache.spark.scheduler.SparkListenerStageSubmitted;
import org.apache.spark.scheduler.SparkListenerTaskEnd;
import org.apache.spark.sql.SparkSession;

/**
 * Prints how many of the build's Spark tasks have ended while its passes run. All passes run in
 * one job, so without this a long build is silent between planning and the model. A line is
 * printed at each further tenth of the tasks known so far, at most one per second otherwise.
 */
final class TaskProgress extends SparkListener implements AutoCloseable {

    private final SparkSession spark;
    private final PrintWriter err;
    private final AtomicInteger submitted = new AtomicInteger();
    private final AtomicInteger ended = new AtomicInteger();
    private long lastPrint;
    private int lastTenth;

    private TaskProgress(SparkSession spark, PrintWriter err) {
        this.spark = spark;
        this.err = err;
    }

    /** Listens to the session's tasks until closed. */
    static TaskProgress start(SparkSession spark, PrintWriter err) {
        TaskProgress p = new TaskProgress(spark, err);
        spark.sparkContext().addSparkListener(p);
        return p;
    }

    @Override
    public void onStageSubmitted(SparkListenerStageSubmitted stage) {
        submitted.addAndGet(stage.stageInfo().numTasks());
    }

    @Override
    public void onTaskEnd(SparkListenerTaskEnd task) {
        int done = ended.incrementAndGet();
        int all = Math.max(done, submitted.get());
        int tenth = (int) (10L * done / all);
        long now = System.nanoTime();
        synchronized (this) {
            if (tenth > lastTenth || now - lastPrint > 1_000_000_000L) {
                lastTenth = tenth;
                lastPrint = now;
                err.printf(Locale.ROOT, "build: reading events: %d of %d tasks done%n", done, all);
                err.flush();
            }
        }
    }

    @Override
    public void close() {
        spark.sparkContext().removeSparkListener(this);
    }
}
