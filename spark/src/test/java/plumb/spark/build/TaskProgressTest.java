package plumb.spark.build;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import plumb.spark.campaign.SparkRunner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The build's progress lines count the Spark tasks that have ended, up to all of them. */
class TaskProgressTest {

    static SparkRunner runner;
    static SparkSession spark;

    @BeforeAll
    static void start() {
        runner = SparkRunner.open("local[2]", 600);
        spark = SparkSession.builder().getOrCreate();
    }

    @AfterAll
    static void stop() {
        runner.close();
    }

    @Test
    void countsTheTasksOfAJobUpToAll() throws InterruptedException {
        StringWriter text = new StringWriter();
        String last;
        try (TaskProgress shown = TaskProgress.start(spark, new PrintWriter(text))) {
            assertEquals(1000, spark.range(0, 1000, 1, 20).javaRDD().count());
            // the listener hears of tasks on Spark's own thread, a little after the job returns
            long until = System.nanoTime() + 30_000_000_000L;
            while (!text.toString().contains("20 of 20") && System.nanoTime() < until) Thread.sleep(20);
            last = text.toString();
        }
        assertTrue(last.contains("build: reading events: 20 of 20 tasks done"), last);
        // a line at each tenth at least: 2, 4, ..., 20 of 20
        assertTrue(last.lines().count() >= 10, last);
        // after close nothing more is heard
        int before = text.toString().length();
        spark.range(0, 10, 1, 4).javaRDD().count();
        Thread.sleep(500);
        assertEquals(before, text.toString().length());
    }
}
