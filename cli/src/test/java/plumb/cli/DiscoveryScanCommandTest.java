package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** plumb discovery with several models: the local p-value scan and the global significance. */
class DiscoveryScanCommandTest {

    @TempDir Path dir;

    /** A falling two-photon spectrum with an excess near 400 in the data; signal hypotheses at {@code mass}. */
    private Path model(double mass) throws Exception {
        int bins = 30;
        double[] edges = new double[bins + 1], b = new double[bins], s = new double[bins], n = new double[bins];
        for (int i = 0; i <= bins; i++) edges[i] = 200 + 20 * i;
        for (int i = 0; i < bins; i++) {
            double c = 210 + 20 * i;
            b[i] = Math.round(800 * Math.exp(-(c - 200) / 200));
            s[i] = 30 * Math.exp(-0.5 * Math.pow((c - mass) / 25, 2));
            n[i] = b[i] + Math.round(45 * Math.exp(-0.5 * Math.pow((c - 410) / 25, 2)) + 6 * Math.sin(1.3 * i));
        }
        Channel ch = new Channel("diphoton", "m [GeV]", edges, n, List.of(
                new Sample("resonance", s, null, List.of("mu"), List.of()),
                new Sample("continuum", b, null, List.of(), List.of())));
        Model m = new Model(Model.FORMAT, "res-" + (int) mass, null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, 20}, null, null, false)), Map.of(),
                Map.of("mass", mass), null);
        Path p = dir.resolve("res-" + (int) mass + ".json");
        ModelWriter.write(m, p);
        return p;
    }

    @Test
    void scanGivesLocalCurveAndGlobalSignificance() throws Exception {
        List<String> args = new ArrayList<>(List.of("discovery"));
        for (double mass = 260; mass <= 700; mass += 20) args.add(model(mass).toString());
        Path figs = dir.resolve("figs");
        args.addAll(List.of("--label", "mass", "--toys", "40", "--threads", "2", "--json", "-", "--figure", figs.toString()));
        var r = run(args.toArray(new String[0]));
        assertEquals(0, r.status(), r.err());
        String text = r.out();
        JsonNode j = CommandLineTestSupport.readJsonText(text.substring(0, text.lastIndexOf('}') + 1));
        assertEquals(23, j.get("points").size());
        JsonNode g = j.get("global");
        assertEquals(400, g.get("x").asDouble(), 40, "the excess is near 410");
        assertTrue(g.get("localZ").asDouble() > 1.5, g.toString());
        assertTrue(g.get("z").asDouble() < g.get("localZ").asDouble(), "the global significance is smaller");
        assertTrue(g.get("trials").asDouble() >= 1);
        assertEquals(40, j.get("toys").get("toys").asInt());
        assertEquals(5, j.get("toys").get("meanUpcrossings").size());
        assertTrue(Files.size(figs.resolve("local-p.png")) > 1000);
    }
}
