package plumb.cli;

import picocli.CommandLine.Option;
import plumb.engine.inference.WorkRunner;

import java.lang.reflect.InvocationTargetException;

/**
 * {@code --spark MASTER} and {@code --spark-timeout S}: where a command's toys or refits run.
 * Without --spark they run on this process's threads. With it they run on Apache Spark through the
 * spark module, which is looked up by name so that the command line itself never needs Spark.
 * Under spark-submit the master spark-submit was given is the default.
 */
public final class ClusterOptions {

    /** The class of the spark module that opens a Spark runner. */
    static final String SPARK_RUNNER = "plumb.spark.campaign.SparkRunner";

    /** The one line printed when the spark module or Spark's jars are missing. */
    static final String HOW_TO_BUILD = "--spark needs the spark module and Spark's jars: run through ./plumb, which "
            + "builds them, or build them with 'mvn -B -DskipTests package -pl spark -am' and run spark/target/plumb-spark.jar "
            + "with spark-submit";

    @Option(names = "--spark", paramLabel = "MASTER",
            description = "Run the toys or refits on Apache Spark: local[*] (or local[N]) in this process, "
                    + "spark://HOST:PORT or yarn on a cluster. Results equal those of a run on threads.")
    public String spark;

    @Option(names = "--spark-timeout", converter = OptionValues.Positive.class, paramLabel = "S", defaultValue = "60",
            description = "Seconds to wait for the Spark master and a first executor (default: ${DEFAULT-VALUE}).")
    public int sparkTimeout;

    /** The runner of {@code options} (threads when null: a command called from another one, the report). */
    public static WorkRunner runner(ClusterOptions options, int threads) {
        return options == null ? WorkRunner.threads(threads) : options.runner(threads);
    }

    /** The master to use: --spark, or under spark-submit the one it was given; null for threads. */
    public String master() {
        if (spark != null) return spark;
        return System.getProperty("spark.master");
    }

    /** True when the work runs on Spark. */
    public boolean onSpark() {
        return master() != null;
    }

    /**
     * The runner of the command's work: threads of this process, or a Spark runner (opened here;
     * close it when done).
     *
     * @throws InputException when --spark is given but the spark module or Spark's jars are missing
     * @throws ComputationException when the master cannot be reached within --spark-timeout
     */
    public WorkRunner runner(int threads) {
        String master = master();
        if (master == null) return WorkRunner.threads(threads);
        if (master.isBlank()) throw new InputException("--spark: the master is empty (local[*], spark://HOST:PORT or yarn)");
        if (sparkTimeout < 1) throw new InputException("--spark-timeout must be at least 1 second, got " + sparkTimeout);
        try {
            Class<?> c = Class.forName(SPARK_RUNNER);
            return (WorkRunner) c.getMethod("open", String.class, int.class).invoke(null, master, sparkTimeout);
        } catch (ClassNotFoundException | NoClassDefFoundError e) {
            throw new InputException(HOW_TO_BUILD);
        } catch (InvocationTargetException e) {
            Throwable t = e.getCause();
            if (t instanceof NoClassDefFoundError) throw new InputException(HOW_TO_BUILD);
            if (t instanceof RuntimeException r) throw r;
            throw new ComputationException("--spark " + master + ": " + t);
        } catch (ReflectiveOperationException e) {
            throw new IllegalStateException(e);
        }
    }
}
