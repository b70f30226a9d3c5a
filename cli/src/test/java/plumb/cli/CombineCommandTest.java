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

/** {@code plumb combine}: renames, the written model, conflicts naming both files with exit 2. */
class CombineCommandTest {

    private static final String PART = """
            {"format": "plumb-model/1", "name": "NAME", "poi": "mu", "channels": [{"name": "CH", "observed": [98, 52],
              "samples": [{"name": "sig", "yields": [3, 5], "factors": ["mu"]},
                          {"name": "bkg", "yields": [100, 50], "factors": ["k"],
                           "variations": [{"parameter": "lumi", "norm": {"down": 0.97, "up": 1.03}},
                                          {"parameter": "eff", "norm": {"down": 0.95, "up": 1.05}}]}]}]}
            """;

    @Test
    void combinesWithRenamesAndRefusesConflicts(@TempDir Path dir) throws IOException {
        Path a = dir.resolve("a.json"), b = dir.resolve("b.json"), out = dir.resolve("ab.json");
        Files.writeString(a, PART.replace("NAME", "a").replace("CH", "sr_a"));
        Files.writeString(b, PART.replace("NAME", "b").replace("CH", "sr_b"));
        var r = run("combine", a.toString(), b.toString(), "--rename", b + ":eff=eff_b", "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        Model ab = ModelReader.read(out);
        assertEquals("a+b", ab.name());
        assertEquals(2, ab.channels().size());
        assertEquals("eff_b", ab.channels().get(1).samples().get(1).variations().get(1).parameter());
        assertEquals("lumi", ab.channels().get(1).samples().get(1).variations().get(0).parameter());
        Files.delete(out);
        Files.writeString(b, PART.replace("NAME", "b").replace("CH", "sr_a"));
        r = run("combine", a.toString(), b.toString(), "--out", out.toString());
        assertEquals(2, r.status());
        assertTrue(r.err().contains("channel \"sr_a\" is in both " + a + " and " + b), r.err());
        assertFalse(Files.exists(out));
        r = run("combine", a.toString(), b.toString(), "--rename", "c.json:eff=x", "--out", out.toString());
        assertEquals(2, r.status());
        assertTrue(r.err().contains("--rename c.json:eff=x: expected FILE:OLD=NEW"), r.err());
    }
}
