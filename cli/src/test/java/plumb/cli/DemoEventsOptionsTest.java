package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.build.EventBuilds;

import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The options of {@code plumb demo --events} as the command line alone sees them (no spark module
 * on this classpath): bad combinations and the missing module end with one line, exit 2, nothing written.
 */
class DemoEventsOptionsTest {

    @TempDir
    Path dir;

    @Test
    void withoutTheSparkModuleOneLineSaysHowToBuildItAndNothingIsWritten() {
        Path out = dir.resolve("events-demo");
        CommandLineTestSupport.Run r = CommandLineTestSupport.run("demo", "--events", out.toString());
        assertEquals(2, r.status(), r.err());
        assertEquals("plumb demo: " + EventBuilds.HOW_TO_BUILD, r.err().strip());
        assertFalse(Files.exists(out));
    }

    @Test
    void sparkWithoutEventsAndTwoFoldersAreRefused() {
        CommandLineTestSupport.Run r = CommandLineTestSupport.run("demo", "--out", dir.resolve("a").toString(), "--spark", "local[2]");
        assertEquals(2, r.status(), r.err());
        assertTrue(r.err().contains("--spark: only with --events"), r.err());
        r = CommandLineTestSupport.run("demo", "--events", dir.resolve("a").toString(), "--out", dir.resolve("b").toString());
        assertEquals(2, r.status(), r.err());
        assertTrue(r.err().contains("give the folder once"), r.err());
        r = CommandLineTestSupport.run("demo", "--events", "--spark-timeout", "0");
        assertEquals(2, r.status(), r.err());
        assertTrue(r.err().contains("--spark-timeout") && r.err().contains("must be at least 1"), r.err());
        assertFalse(Files.exists(dir.resolve("a")));
        assertFalse(Files.exists(dir.resolve("b")));
    }
}
