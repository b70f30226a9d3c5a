package plumb.spark.campaign;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.spark.campaign.SparkCampaignTest.run;

import plumb.spark.campaign.SparkCampaignTest.Run;

/**
 * A master that does not answer. Runs after the other Spark tests (surefire runs the classes in
 * alphabetical order): the half-started context it leaves is stopped in the background, and
 * stopping a context clears Spark's process-wide environment, which a context started meanwhile
 * would lose.
 */
class SparkUnreachableMasterTest {

    @TempDir
    static Path dir;

    @Test
    void anUnreachableMasterIsOneLineAndExitOneWithinTheTimeout() {
        long t0 = System.nanoTime();
        Run r = run("inject", model().toString(), "--mu", "1", "--toys", "10", "--spark", "spark://127.0.0.1:9",
                "--spark-timeout", "5");
        double seconds = (System.nanoTime() - t0) * 1e-9;
        assertEquals(1, r.status(), r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().contains("--spark-timeout"), r.err());
        // the timeout, at most 30 s to stop the half-started context, and slack for a loaded machine
        assertTrue(seconds < 5 + 30 + 15, "took " + seconds + " s");
        assertEquals("", r.out().replaceAll("(?s)^Signal injection.*", ""));
    }

    private static Path model() {
        Path small = dir.resolve("small.json");
        try {
            SyntheticModels.generateFile(2, 8, 3, 4, 5, small);
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
        return small;
    }
}
