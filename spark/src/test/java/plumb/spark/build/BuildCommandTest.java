package plumb.spark.build;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.Main;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** plumb build through the command line, with --spark local[2]: exit 0 and the files, or exit 2 and nothing. */
class BuildCommandTest {

    @TempDir
    Path dir;

    @Test
    void buildsThroughTheCommandLineAndRefusesBadInputWithExitTwo() throws IOException {
        SmallEvents.write(dir.resolve("bkg.csv"), 7, 300, 2.0, 1.0);
        String spec = """
                {"format": "plumb-build/1", "name": "cli_small",
                 "regions": [{"name": "sr", "observable": "m", "edges": [100, 120, 140],
                              "steps": [{"name": "two photons", "keep": "n_ph >= 2"}]}],
                 "samples": [{"name": "bkg", "events": ["bkg.csv"], "weight": "%s"}]}
                """;
        Path good = Files.writeString(dir.resolve("good.json"), spec.formatted("w"));
        StringWriter out = new StringWriter(), err = new StringWriter();
        int code = Main.execute(new String[] {"build", good.toString(), "--out", dir.resolve("m.json").toString(),
                "--spark", "local[2]", "--spark-timeout", "600"}, new PrintWriter(out), new PrintWriter(err));
        assertEquals(0, code, err.toString());
        Model m = ModelReader.read(dir.resolve("m.json"));
        assertArrayEquals(new double[] {100, 120, 140}, m.channels().get(0).edges());
        assertTrue(out.toString().contains("in the bins"), out.toString());
        assertTrue(err.toString().contains("build: [1/1] sample bkg: nominal"), err.toString());

        Path bad = Files.writeString(dir.resolve("bad.json"), spec.formatted("weight_that_is_not_there"));
        StringWriter err2 = new StringWriter();
        code = Main.execute(new String[] {"build", bad.toString(), "--out", dir.resolve("b.json").toString(),
                "--spark", "local[2]", "--spark-timeout", "600"}, new PrintWriter(new StringWriter()), new PrintWriter(err2));
        assertEquals(2, code, err2.toString());
        String line = err2.toString().lines().filter(l -> l.startsWith("plumb build: ")).findFirst().orElse("");
        assertTrue(line.contains("bad.json: samples[0].weight: Spark: ") && line.contains("weight_that_is_not_there"), err2.toString());
        assertFalse(Files.exists(dir.resolve("b.json")));
        assertFalse(Files.exists(dir.resolve("b.cutflow.csv")));
    }
}
