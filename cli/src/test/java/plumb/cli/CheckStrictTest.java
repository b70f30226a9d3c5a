package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** {@code check --strict}: status 1 with any warning (compiler or lint), 0 without. */
class CheckStrictTest {

    private static final String CLEAN = """
            {"format": "plumb-model/1", "name": "clean", "channels": [{"name": "sr", "observed": [98, 52],
              "samples": [{"name": "bkg", "yields": [100, 50], "factors": ["k"],
                "variations": [{"parameter": "a", "norm": {"down": 0.95, "up": 1.05}}]}]}]}
            """;

    @Test
    void warningsFailOnlyWhenStrict(@TempDir Path dir) throws IOException {
        Path clean = dir.resolve("clean.json");
        Files.writeString(clean, CLEAN);
        assertEquals(0, run("check", clean.toString(), "--strict").status());
        Path lint = dir.resolve("lint.json");
        Files.writeString(lint, CLEAN.replace("\"down\": 0.95, \"up\": 1.05", "\"down\": 0.9995, \"up\": 1.0005"));
        var r = run("check", lint.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("warning: sr/bkg/a: moves no yield by 0.1 % or more"), r.out());
        r = run("check", lint.toString(), "--strict", "--json", "-");
        assertEquals(1, r.status());
        assertEquals(1, r.json().get("warnings").size());
        assertTrue(r.err().contains("--strict: 1 warning"), r.err());
        // a compiler warning (one-sided variation) counts too
        Files.writeString(lint, CLEAN.replace("\"down\": 0.95, \"up\": 1.05", "\"down\": 1.02, \"up\": 1.05"));
        assertEquals(1, run("check", lint.toString(), "--strict").status());
    }
}
