package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import plumb.spark.campaign.SparkRunner;

/**
 * The Spark session a build runs in, on the context of a {@link SparkRunner}, with the SQL
 * settings that suit one pass per set of tables.
 */
final class BuildSession {

    private BuildSession() {
    }

    static SparkSession of(SparkRunner runner) {
        SparkSession spark = SparkSession.builder().sparkContext(runner.context().sc()).getOrCreate();
        return spark;
    }
}
