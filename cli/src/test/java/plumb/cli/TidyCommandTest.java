package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** {@code plumb tidy}: the named operations only, a log of each change, bad options exit 2 writing nothing. */
class TidyCommandTest {

    @Test
    void writesAValidModelAndItsChangeLog(@TempDir Path dir) throws IOException {
        Path demo = CommandLineTestSupport.demoModel(dir);
        Path out = dir.resolve("tidy.json"), log = dir.resolve("changes.txt");
        var r = run("tidy", demo.toString(), "--out", out.toString(), "--log", log.toString(),
                "--smooth", "--symmetrise", "mean", "--prune-shape", "0.02");
        assertEquals(0, r.status(), r.err());
        Model tidied = ModelReader.read(out);
        String changes = Files.readString(log);
        long lines = changes.lines().count();
        assertTrue(lines > 0, r.out());
        assertTrue(r.out().contains("wrote " + out + " (" + lines + " change"), r.out());
        assertTrue(changes.lines().allMatch(l -> l.contains(": ")), changes);
        assertEquals(ModelReader.read(demo).channels().size(), tidied.channels().size());
    }

    @Test
    void refusesWithoutAnOperationOrWithABadOne(@TempDir Path dir) {
        Path demo = CommandLineTestSupport.demoModel(dir);
        Path out = dir.resolve("tidy.json");
        var r = run("tidy", demo.toString(), "--out", out.toString());
        assertEquals(2, r.status());
        assertTrue(r.err().contains("name at least one operation"), r.err());
        r = run("tidy", demo.toString(), "--out", out.toString(), "--symmetrise", "both");
        assertEquals(2, r.status());
        assertTrue(r.err().contains("--symmetrise both: expected larger or mean"), r.err());
        r = run("tidy", demo.toString(), "--out", out.toString(), "--prune-norm", "-1");
        assertEquals(2, r.status());
        assertFalse(Files.exists(out));
    }
}
