package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

/** --spark without the spark module on the classpath (as in plumb.jar): one line on how to build it. */
class ClusterOptionsTest {

    @TempDir
    Path dir;

    @Test
    void withoutTheSparkModuleOneLineSaysHowToBuildIt() throws IOException {
        Path model = dir.resolve("m.json");
        SyntheticModels.generateFile(1, 4, 2, 2, 1, model);
        Path json = dir.resolve("out.json");
        StringWriter out = new StringWriter(), err = new StringWriter();
        int status = Main.execute(new String[] {"gof", model.toString(), "--toys", "5", "--spark", "local[2]",
                "--json", json.toString()}, new PrintWriter(out), new PrintWriter(err));
        assertEquals(ExitCodes.BAD_INPUT, status);
        assertEquals("plumb gof: " + ClusterOptions.HOW_TO_BUILD + System.lineSeparator(), err.toString());
        assertFalse(Files.exists(json), "no output file");
    }

    @Test
    void aBadTimeoutIsRefused() throws IOException {
        Path model = dir.resolve("m.json");
        SyntheticModels.generateFile(1, 4, 2, 2, 1, model);
        StringWriter out = new StringWriter(), err = new StringWriter();
        int status = Main.execute(new String[] {"discovery", model.toString(), "--toys", "5", "--spark", "local[2]",
                "--spark-timeout", "0"}, new PrintWriter(out), new PrintWriter(err));
        assertEquals(ExitCodes.BAD_INPUT, status);
        assertEquals("plumb discovery: Invalid value for option '--spark-timeout': must be at least 1, got 0" + System.lineSeparator(), err.toString());
    }
}
