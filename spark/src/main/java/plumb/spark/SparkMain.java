package plumb.spark;

/**
 * Entry point of the cluster jar (target/plumb-spark.jar): the plumb command line with the spark
 * module on the classpath, so {@code --spark} works; under spark-submit the master spark-submit
 * was given is used when the command has no --spark.
 */
public final class SparkMain {

    private SparkMain() {
    }

    public static void main(String[] args) {
        plumb.cli.Main.main(args);
    }
}
