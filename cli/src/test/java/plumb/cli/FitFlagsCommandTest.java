package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** fit reports suspicious fits: the flags in the JSON, the warning, values printed as they are. */
class FitFlagsCommandTest {

    @TempDir
    Path dir;

    private Path model(String name, String extra, String samples, String observed) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, "{\"format\": \"plumb-model/1\", \"name\": \"" + name + "\", " + extra
                + "\"channels\": [{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": " + observed
                + ", \"samples\": [" + samples + "]}]}");
        return p;
    }

    @Test
    void aFlatDirectionIsWarnedAboutAndItsParametersNamed() throws IOException {
        Path m = model("flat.json", "", "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\", \"b\"]}", "[12, 20, 9]");
        var r = run("fit", m.toString(), "--json", "-");
        assertEquals(0, r.status(), r.err());
        JsonNode j = r.json();
        assertTrue(j.get("nearSingular").asBoolean());
        assertEquals("[\"a\",\"b\"]", j.get("degenerate").toString());
        assertTrue(j.get("smallestCorrelationEigenvalue").asDouble() < 1e-6);
        assertTrue(r.err().startsWith("plumb fit: warning: the Hessian is near-singular"), r.err());
        assertTrue(r.err().contains("a combination of a, b"), r.err());

        var text = run("fit", m.toString());
        // the value keeps its digits instead of being rounded to the huge error ("0 ± 7100")
        String row = text.out().lines().filter(l -> l.startsWith("a ")).findFirst().orElseThrow();
        assertTrue(row.matches("a\\s+1\\.\\d{3} ± \\d+\\s.*degenerate.*"), row);
    }

    @Test
    void aPoiOnItsBoundIsFlaggedAndPrintedAtItsValue() throws IOException {
        Path m = model("bound.json", "\"poi\": \"mu\", \"parameters\": [{\"name\": \"mu\", \"range\": [0, 10]}], ",
                "{\"name\": \"sig\", \"yields\": [1, 1, 1], \"factors\": [\"mu\"]}, {\"name\": \"bkg\", \"yields\": [10, 10, 10]}",
                "[60, 70, 65]");
        var r = run("fit", m.toString(), "--json", "-");
        assertEquals(0, r.status(), r.err());
        JsonNode mu = r.json().get("parameters").get(0);
        assertEquals("mu", mu.get("name").asText());
        assertEquals(10.0, mu.get("value").asDouble(), 1e-9);
        assertEquals("upper", mu.get("atBound").asText());
        assertTrue(mu.get("error").isNull(), "no symmetric error on a bound");
        assertFalse(r.json().get("nearSingular").asBoolean());

        var text = run("fit", m.toString());
        String row = text.out().lines().filter(l -> l.startsWith("mu ")).findFirst().orElseThrow();
        assertTrue(row.contains("10.00 (bound)") && row.contains("at upper bound"), row);
    }
}
