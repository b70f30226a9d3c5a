package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.models.SyntheticModels;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** impacts, scan, yields and fit --intervals through Main.execute: exit codes, JSON keys of docs/cli-contract.md. */
class ImpactsScanYieldsCommandTest {

    @TempDir
    static Path dir;
    static Path model;

    @BeforeAll
    static void writeModel() throws Exception {
        model = dir.resolve("small.json");
        SyntheticModels.generateFile(2, 5, 3, 6, 3, model);
    }

    private record Run(int code, String out, String err) {
        JsonNode json() throws Exception {
            return Json.mapper().readTree(out);
        }
    }

    private static Run run(String... args) {
        StringWriter out = new StringWriter(), err = new StringWriter();
        int code = Main.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(code, out.toString(), err.toString());
    }

    @Test
    void impactsJsonHasTheContractKeysSortedBySize() throws Exception {
        Run r = run("impacts", model.toString(), "--threads", "2", "--json", "-");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        JsonNode j = r.json();
        for (String key : new String[] {"labels", "data", "poi", "poiValue", "poiError", "impacts", "breakdown"}) {
            assertTrue(j.has(key), key);
        }
        assertEquals("mu", j.get("poi").asText());
        JsonNode list = j.get("impacts");
        assertTrue(list.size() >= 6);
        double previous = Double.POSITIVE_INFINITY;
        for (JsonNode e : list) {
            for (String key : new String[] {"parameter", "pull", "constraint", "prefit", "postfit", "linearised"}) assertTrue(e.has(key), key);
            assertFalse(e.get("parameter").asText().startsWith("mcstat:"), "MC statistics left out by default");
            double size = Math.max(Math.abs(e.get("postfit").get("up").asDouble()), Math.abs(e.get("postfit").get("down").asDouble()));
            assertTrue(size <= previous + 1e-15, "sorted largest first");
            previous = size;
        }
        JsonNode b = j.get("breakdown");
        double total = b.get("total").asDouble(), stat = b.get("statOnly").asDouble();
        assertTrue(stat > 0 && stat <= total);
        JsonNode last = b.get("groups").get(b.get("groups").size() - 1);
        assertEquals("all systematics", last.get("name").asText());
        assertEquals(total * total, stat * stat + Math.pow(last.get("error").asDouble(), 2), 1e-9 * total * total);
    }

    @Test
    void impactsExactTopRefitsOnlyThatManyAndMcStatOnRequest() throws Exception {
        Run r = run("impacts", model.toString(), "--threads", "1", "--exact-top", "2", "--include-mcstat", "--json", "-");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        int refitted = 0;
        boolean mcstat = false;
        for (JsonNode e : r.json().get("impacts")) {
            if (e.get("refitted").asBoolean()) refitted++;
            else assertTrue(e.get("postfit").isNull());
            mcstat |= e.get("parameter").asText().startsWith("mcstat:");
        }
        assertEquals(2, refitted);
        assertTrue(mcstat);
    }

    @Test
    void impactsTableAndBadOptions() {
        Run r = run("impacts", model.toString(), "--top", "3");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        assertTrue(r.out().contains("Breakdown of the uncertainty on mu"));
        assertTrue(r.out().contains("statistical only"));
        Run bad = run("impacts", model.toString(), "--top", "0");
        assertEquals(ExitCodes.BAD_INPUT, bad.code());
        assertTrue(bad.err().contains("--top"));
    }

    @Test
    void scanJsonHasPointsAndIntervalsAroundTheBestFit() throws Exception {
        Run r = run("scan", model.toString(), "--parameter", "np_0", "--points", "5", "--range", "-2:2", "--threads", "2", "--json", "-");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        JsonNode j = r.json();
        assertEquals("np_0", j.get("parameter").asText());
        assertEquals(5, j.get("points").size());
        assertEquals(-2, j.get("points").get(0).get("value").asDouble(), 1e-12);
        double best = j.get("best").asDouble();
        JsonNode i68 = j.get("interval68"), i95 = j.get("interval95");
        assertTrue(i95.get(0).asDouble() < i68.get(0).asDouble() && i68.get(0).asDouble() < best);
        assertTrue(best < i68.get(1).asDouble() && i68.get(1).asDouble() < i95.get(1).asDouble());
        for (JsonNode p : j.get("points")) assertTrue(p.get("nllAboveMin").asDouble() >= 0);
    }

    @Test
    void scanRejectsUnknownParameterAndBadRange() {
        assertEquals(ExitCodes.BAD_INPUT, run("scan", model.toString(), "--parameter", "nope").code());
        Run r = run("scan", model.toString(), "--range", "3:1");
        assertEquals(ExitCodes.BAD_INPUT, r.code());
        assertTrue(r.err().contains("--range"));
    }

    @Test
    void yieldsJsonAndFormats() throws Exception {
        Run r = run("yields", model.toString(), "--json", "-");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        JsonNode ch = r.json().get("channels").get(0);
        assertTrue(ch.has("name") && ch.get("observed").isArray());
        JsonNode s = ch.get("samples").get(0);
        assertEquals(5, s.get("prefit").get("yields").size());
        assertEquals(5, s.get("postfit").get("errors").size());
        assertTrue(ch.get("total").get("postfit").get("errors").get(0).asDouble() > 0);
        Path csv = dir.resolve("yields.csv");
        Run c = run("yields", model.toString(), "--format", "csv", "--out", csv.toString());
        assertEquals(ExitCodes.OK, c.code(), c.err());
        assertTrue(Files.readString(csv).startsWith("bin,signal,"));
        Run tex = run("yields", model.toString(), "--format", "latex");
        assertTrue(tex.out().contains("\\begin{tabular}"));
        assertEquals(ExitCodes.BAD_INPUT, run("yields", model.toString(), "--format", "pdf").code());
    }

    @Test
    void fitIntervalsAddAsymmetricErrors() throws Exception {
        Run r = run("fit", model.toString(), "--intervals", "np_1", "--json", "-");
        assertEquals(ExitCodes.OK, r.code(), r.err());
        for (JsonNode p : r.json().get("parameters")) {
            String name = p.get("name").asText();
            if (name.equals("np_1")) {
                assertTrue(p.get("errorLow").asDouble() < 0 && p.get("errorHigh").asDouble() > 0);
                // near-Gaussian: the profile ends sit close to ± the Hessian error
                assertEquals(p.get("error").asDouble(), p.get("errorHigh").asDouble(), 0.2 * p.get("error").asDouble());
            } else if (name.equals("mu")) {
                assertTrue(p.has("errorHigh"));
            } else {
                assertFalse(p.has("errorLow"), name);
            }
        }
        assertEquals(ExitCodes.BAD_INPUT, run("fit", model.toString(), "--intervals", "nope").code());
    }
}
