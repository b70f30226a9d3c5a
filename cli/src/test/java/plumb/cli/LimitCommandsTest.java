package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The limit, discovery and gof commands through Main.execute: exit codes, JSON keys of docs/cli-contract.md, text. */
class LimitCommandsTest {

    @TempDir Path dir;

    private record Run(int code, String out, String err) {
        JsonNode json() throws IOException {
            return Json.mapper().readTree(out);
        }
    }

    private static Run run(String... args) {
        StringWriter out = new StringWriter(), err = new StringWriter();
        int code = Main.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(code, out.toString(), err.toString());
    }

    /** Two bins: signal s·mu over a background with a 10 % norm nuisance; observed counts, or blinded. */
    private Path model(String file, double s, double mass, boolean blinded, double poiHigh) throws IOException {
        Sample sig = new Sample("signal", new double[] {s, s / 2}, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", new double[] {20, 30}, null, List.of(),
                List.of(new Variation("bkg_norm", new Variation.NormEffect(0.9, 1.1), null, null, null)));
        Channel ch = new Channel("sr", "m [GeV]", null, blinded ? null : new double[] {23, 29}, List.of(sig, bkg));
        Model m = new Model(Model.FORMAT, "toy-" + (int) mass, null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, poiHigh}, null, null, false)),
                Map.of(), Map.of("mass", mass), null);
        Path p = dir.resolve(file);
        ModelWriter.write(m, p);
        return p;
    }

    private static void assertBandsOrdered(JsonNode e) {
        double[] v = {e.get("minus2").asDouble(), e.get("minus1").asDouble(), e.get("median").asDouble(),
                e.get("plus1").asDouble(), e.get("plus2").asDouble()};
        for (int k = 1; k < v.length; k++) assertTrue(v[k - 1] < v[k], "bands " + e);
    }

    @Test
    void asymptoticLimitOfOneModel() throws IOException {
        Path m = model("a.json", 10, 500, false, 20);
        Run r = run("limit", m.toString(), "--json", "-");
        assertEquals(0, r.code(), r.err());
        JsonNode j = r.json();
        assertEquals(0.95, j.get("cl").asDouble());
        assertEquals("asymptotic", j.get("method").asText());
        // docs/cli-contract.md names the statistic qtilde_mu
        assertEquals("qtilde_mu", j.get("statistic").asText());
        assertEquals("observed", j.get("data").asText());
        assertEquals(500, j.get("labels").get("mass").asDouble());
        assertTrue(j.get("observed").asDouble() > 0);
        assertBandsOrdered(j.get("expected"));
        assertEquals(1, j.get("points").size());

        Run text = run("limit", m.toString(), "--cl", "0.9");
        assertEquals(0, text.code(), text.err());
        assertTrue(text.out().contains("CLs upper limit on mu at 90% CL"), text.out());
        assertTrue(text.out().contains("q~mu") && text.out().contains("observed data"), text.out());

        // the terminal table: the CL in its heading, one row per outcome with the number of the JSON file
        Run same = run("limit", m.toString(), "--json", "-", "--cl", "0.9");
        JsonNode e = same.json().get("expected");
        assertTrue(text.out().contains("upper limit, 90% CL"), text.out());
        assertEquals(same.json().get("observed").asDouble(), rowValue(text.out(), "observed"), 1e-5 * same.json().get("observed").asDouble());
        String[][] rows = {{"expected median", "median"}, {"expected −1σ", "minus1"}, {"expected +1σ", "plus1"},
                {"expected −2σ", "minus2"}, {"expected +2σ", "plus2"}};
        assertEquals("qtilde_mu", same.json().get("statistic").asText());   // the key of docs/cli-contract.md
        for (String[] row : rows) {
            double want = e.get(row[1]).asDouble();
            assertEquals(want, rowValue(text.out(), row[0]), 1e-5 * want, row[0]);   // printed to 6 significant digits
        }
    }

    /** The number at the end of the terminal table's row that starts with {@code label}. */
    private static double rowValue(String out, String label) {
        return out.lines().map(String::strip).filter(l -> l.startsWith(label + " "))
                .mapToDouble(l -> Double.parseDouble(l.substring(l.lastIndexOf(' ') + 1))).findFirst().orElseThrow();
    }

    @Test
    void blindedModelHasNoObservedLimit() throws IOException {
        Run r = run("limit", model("b.json", 10, 500, true, 20).toString(), "--json", "-");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.json().get("observed").isNull());
        assertEquals("asimov", r.json().get("data").asText());
        assertBandsOrdered(r.json().get("expected"));
        Run d = run("discovery", model("b2.json", 10, 500, true, 20).toString(), "--json", "-");
        assertEquals(0, d.code(), d.err());
        assertTrue(d.json().get("observed").isNull());
        assertTrue(d.json().get("expected").get("z").asDouble() > 0);
    }

    @Test
    void limitOutsideThePoiRangeFailsWithExitOne() throws IOException {
        Run r = run("limit", model("c.json", 1, 500, false, 2).toString());
        assertEquals(1, r.code());
        assertTrue(r.err().contains("could not be bracketed"), r.err());
    }

    @Test
    void limitsAcrossMassPoints() throws IOException {
        Path a = model("m500.json", 10, 500, false, 20);
        Path b = model("m300.json", 4, 300, false, 20);
        Path csv = dir.resolve("limits.csv");
        Run r = run("limit", a.toString(), b.toString(), "--label", "mass", "--json", "-", "--csv", csv.toString());
        assertEquals(0, r.code(), r.err());
        JsonNode points = r.json().get("points");
        assertEquals("mass", r.json().get("label").asText());
        assertEquals(2, points.size());
        assertEquals(300, points.get(0).get("x").asDouble());
        assertEquals(500, points.get(1).get("x").asDouble());
        // a weaker signal per unit of mu gives a higher limit
        assertTrue(points.get(0).get("expected").get("median").asDouble()
                > points.get(1).get("expected").get("median").asDouble());
        List<String> lines = Files.readAllLines(csv);
        assertEquals(3, lines.size(), String.join("\n", lines));
        assertTrue(lines.get(1).startsWith("300"), lines.get(1));

        Run folder = run("limit", dir.toString(), "--threads", "1");
        assertEquals(0, folder.code(), folder.err());
        assertTrue(folder.out().contains("m300.json") && folder.out().contains("m500.json"), folder.out());

        Run badLabel = run("limit", a.toString(), b.toString(), "--label", "width");
        assertEquals(2, badLabel.code());
        assertTrue(badLabel.err().contains("--label width"), badLabel.err());
    }

    @Test
    void toyLimitIsReproducibleAcrossThreadCounts() throws IOException {
        Path m = model("t.json", 10, 500, false, 20);
        List<JsonNode> results = new ArrayList<>();
        for (String threads : new String[] {"1", "2"}) {
            Run r = run("limit", m.toString(), "--toys", "150", "--seed", "5", "--threads", threads, "--json", "-");
            assertEquals(0, r.code(), r.err());
            results.add(r.json());
        }
        JsonNode j = results.get(0);
        assertEquals("toys", j.get("method").asText());
        assertTrue(j.get("observedError").asDouble() > 0);
        assertTrue(j.get("clsPoints").size() >= 2);
        assertEquals(j.get("observed").asDouble(), results.get(1).get("observed").asDouble());
        assertEquals(j.get("expected"), results.get(1).get("expected"));
    }

    @Test
    void discoveryAndGoodnessOfFitFiles() throws IOException {
        Path m = model("d.json", 10, 500, false, 20);
        Run d = run("discovery", m.toString(), "--json", "-", "--toys", "200");
        assertEquals(0, d.code(), d.err());
        JsonNode dj = d.json();
        for (String k : new String[] {"q0", "z", "p"}) {
            assertTrue(dj.get("observed").has(k) && dj.get("expected").has(k), k);
        }
        assertEquals(Math.sqrt(dj.get("observed").get("q0").asDouble()), dj.get("observed").get("z").asDouble(), 1e-12);
        assertTrue(dj.get("toys").get("p").asDouble() > 0);

        Run g = run("gof", m.toString(), "--json", "-");
        assertEquals(0, g.code(), g.err());
        JsonNode gj = g.json();
        assertEquals(1, gj.get("ndof").asInt());    // 2 bins − 1 free parameter (mu); bkg_norm brings its own constraint
        assertTrue(gj.get("statistic").asDouble() >= 0);
        assertTrue(gj.get("p").asDouble() > 0 && gj.get("p").asDouble() <= 1);
        assertEquals("sr", gj.get("channels").get(0).get("name").asText());
        Run text = run("gof", m.toString());
        assertTrue(text.out().contains("saturated") && text.out().contains("ndof = 1"), text.out());
        assertFalse(text.out().contains("NaN"));
    }
}
