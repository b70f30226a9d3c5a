package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import plumb.spark.campaign.SparkRunner;

/**
 * The Spark session a build runs in, on the context of a {@link SparkRunner}. On a local master
 * (all cores of this machine) three SQL settings differ from Spark's defaults, which are made
 * for clusters:
 * <ul>
 *   <li>file listing stays on the driver whatever the number of paths (Spark starts a listing job
 *       above 32 paths, which costs more than listing a local folder);</li>
 *   <li>a query that groups (Spark's own scan of the speed benchmark, the row path's fallbacks)
 *       shuffles into one partition per core instead of 200;</li>
 *   <li>no adaptive re-planning between stages: with one partition per core there is nothing to
 *       coalesce, and each re-planning is one more job.</li>
 * </ul>
 * The build's own passes run no SQL (one task per file, {@link ParquetPass}); the settings cut the
 * fixed cost of the steps around them. On a cluster the session keeps Spark's defaults (or the
 * ones spark-submit was given).
 */
final class BuildSession {

    /** Paths listed on the driver before Spark would list them with a job. */
    static final int LISTED_ON_DRIVER = 100_000;

    private BuildSession() {
    }

    static SparkSession of(SparkRunner runner) {
        SparkSession spark = SparkSession.builder().sparkContext(runner.context().sc()).getOrCreate();
        if (spark.sparkContext().isLocal()) {
            spark.conf().set("spark.sql.sources.parallelPartitionDiscovery.threshold", LISTED_ON_DRIVER);
            spark.conf().set("spark.sql.shuffle.partitions", Math.max(1, spark.sparkContext().defaultParallelism()));
            spark.conf().set("spark.sql.adaptive.enabled", false);
        }
        return spark;
    }
}
