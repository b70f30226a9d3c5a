package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.ModelReader;
import plumb.engine.tooling.Templates;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** {@code plumb templates}: one PNG and one SVG per variation and sample of a small model, nothing else left behind (no staging folder). */
class TemplatesCommandTest {

    private static final String MODEL = """
            {"format": "plumb-model/1", "name": "small", "channels": [{"name": "sr", "edges": [0, 1, 2, 3], "observed": [98, 52, 20],
              "samples": [{"name": "bkg", "yields": [100, 50, 20],
                           "variations": [{"parameter": "lumi", "norm": {"down": 0.97, "up": 1.03}},
                                          {"parameter": "jes", "shape": {"down": [95, 52, 21], "up": [104, 49, 19]}}]},
                          {"name": "sig", "yields": [1, 4, 1], "factors": ["mu"],
                           "variations": [{"parameter": "jes", "norm": {"down": 0.9, "up": 1.1}, "shape": {"down": [1, 3.5, 1.5], "up": [1, 4.5, 0.5]}}]}]}]}
            """;

    @Test
    void drawsEveryVariationOfEverySample(@TempDir Path dir) throws IOException {
        Path demo = dir.resolve("small.json");
        Files.writeString(demo, MODEL);
        Path out = dir.resolve("templates");
        var r = run("templates", demo.toString(), "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        int expected = Templates.of(ModelReader.read(demo)).size();
        assertEquals(3, expected);
        try (Stream<Path> files = Files.list(out)) {
            var names = files.map(p -> p.getFileName().toString()).sorted().toList();
            assertEquals(2 * expected, names.size(), names.toString());
            assertTrue(names.stream().allMatch(n -> n.startsWith("template-") && (n.endsWith(".png") || n.endsWith(".svg"))), names.toString());
        }
        Path svg = out.resolve(TemplatesCommand.fileName(0, Templates.of(ModelReader.read(demo)).get(0)) + ".svg");
        String text = Files.readString(svg);
        assertTrue(text.contains("<svg"), "an SVG document");
        assertTrue(Files.size(out.resolve(TemplatesCommand.fileName(2, Templates.of(ModelReader.read(demo)).get(2)) + ".png")) > 1000);
        assertTrue(r.out().contains("wrote " + expected + " template figures"), r.out());
    }
}
