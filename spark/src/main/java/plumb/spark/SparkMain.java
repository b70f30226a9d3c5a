package plumb.spark;

/**
 * Entry point of the cluster jar (target/plumb-spark.jar): the plumb command line with the spark
 * module on the classpath, so {@code --spark} works; under spark-submit the master spark-submit
 * was given is used when the command has no --spark. {@code spark-speed} runs the benchmark of
 * {@link plumb.spark.campaign.SparkSpeed}, {@code build-speed} that of
 * {@link plumb.spark.build.BuildSpeed}.
 */
public final class SparkMain {

    private SparkMain() {
    }

    public static void main(String[] args) throws Exception {
        if (args.length > 0 && args[0].equals("spark-speed")) {
            plumb.spark.campaign.SparkSpeed.main(java.util.Arrays.copyOfRange(args, 1, args.length));
            return;
        }
        if (args.length > 0 && args[0].equals("build-speed")) {
            plumb.spark.build.BuildSpeed.main(java.util.Arrays.copyOfRange(args, 1, args.length));
            return;
        }
        plumb.cli.Main.main(args);
    }
}
