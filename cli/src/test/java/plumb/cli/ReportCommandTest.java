package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@code plumb report} on small models: a failing section, several models, bad options. */
class ReportCommandTest {

    @TempDir Path dir;

    /**
     * Two bins, signal s·mu over a background with a 10 % norm nuisance, POI range [0, poiHigh],
     * a mass label. With a weak signal and a narrow range no limit can be bracketed inside it.
     */
    private Path model(String file, double s, double mass, double poiHigh) throws IOException {
        Sample sig = new Sample("signal", new double[] {s, s / 2}, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", new double[] {20, 30}, null, List.of(),
                List.of(new Variation("bkg_norm", new Variation.NormEffect(0.9, 1.1), null, null, null)));
        Channel ch = new Channel("sr", "m [GeV]", new double[] {100, 200, 300}, new double[] {23, 29}, List.of(sig, bkg));
        Model m = new Model(Model.FORMAT, "toy-" + (int) mass, null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, poiHigh}, null, null, false)),
                Map.of(), Map.of("mass", mass), null);
        Path p = dir.resolve(file);
        ModelWriter.write(m, p);
        return p;
    }

    @Test
    void aFailingSectionIsShownInRedAndTheRestIsStillWritten() throws IOException {
        // A limit above the POI's upper bound 1 cannot be bracketed: the limits section fails, and
        // with it the expected limits of the planning section.
        Path m = model("weak.json", 2, 500, 1);
        Path out = dir.resolve("report");
        CommandLineTestSupport.Run r = CommandLineTestSupport.run("report", m.toString(), "--out", out.toString(),
                "--toys", "10", "--threads", "2");
        assertEquals(ExitCodes.FAILED, r.status(), r.err());
        assertTrue(r.err().contains("plumb report: limits failed: ") && r.err().contains("could not be bracketed"), r.err());
        String html = Files.readString(out.resolve("index.html"));
        String summary = html.substring(html.indexOf("<section id=\"summary\">"), html.indexOf("<section id=\"fit\">"));
        assertTrue(summary.contains("<div class=\"bad box\"><strong>Sections that failed (2)</strong><ul><li><a href=\"#limits\">Limits</a>: "),
                summary);
        assertTrue(summary.contains("<a href=\"#planning\">Reach</a>: "), summary);
        String limits = html.substring(html.indexOf("<section id=\"limits\">"), html.indexOf("<section id=\"planning\">"));
        assertTrue(limits.contains("<p class=\"bad\">This section failed: ") && limits.contains("could not be bracketed"), limits);
        // The other sections ran: fit, scan, discovery, injection (at mu = 1 only: 2 and 3 are outside [0, 1]).
        assertFalse(html.contains("Not run for this report."));
        assertTrue(Files.isRegularFile(out.resolve("figures/contour.png")), "the contour needs no limit");
        assertTrue(Files.isRegularFile(out.resolve("figures/scan.png")));
        assertTrue(Files.isRegularFile(out.resolve("json/limit.json")));
        assertEquals(1, Json.mapper().readTree(out.resolve("json/inject.json").toFile()).get("closure").get("injected").asInt());
    }

    @Test
    void severalModelsGiveTheLimitsAgainstTheLabel() throws IOException {
        Path main = model("m500.json", 10, 500, 20);
        Path other = model("m700.json", 6, 700, 20);
        Path third = model("m900.json", 4, 900, 20);
        Path out = dir.resolve("report");
        CommandLineTestSupport.Run r = CommandLineTestSupport.run("report", main.toString(), other.toString(), third.toString(),
                "--out", out.toString(), "--toys", "0", "--label", "mass");
        assertEquals(ExitCodes.OK, r.status(), r.err());
        String html = Files.readString(out.resolve("index.html"));
        assertTrue(html.contains("<img src=\"figures/limits.png\""), "limits figure");
        String csv = Files.readString(out.resolve("tables/limits.csv"));
        assertEquals(4, csv.strip().split("\r?\n").length, csv);   // header and one row per model
        assertTrue(csv.contains("\r\n500,") && csv.contains("\r\n700,") && csv.contains("\r\n900,"), csv);
        assertEquals(3, Json.mapper().readTree(out.resolve("json/limit.json").toFile()).get("points").size());
        // --toys 0: the Asimov closure alone, no toy figure.
        assertFalse(Files.exists(out.resolve("figures/injection.png")));
        assertTrue(html.contains("Every closure check passed."));
    }

    @Test
    void badOptionsExitWithStatusTwoAndWriteNothing() throws IOException {
        Path m = model("a.json", 10, 500, 20);
        Path out = dir.resolve("report");
        for (String[] args : new String[][] {
            {"report", m.toString(), "--out", out.toString(), "--fix", "nope=1"},
            {"report", m.toString(), "--out", out.toString(), "--toys", "-1"},
            {"report", m.toString(), "--out", out.toString(), "--impacts-top", "0"},
            {"report", m.toString(), "--out", out.toString(), "--label", "energy"},
            {"report", m.toString()},
        }) {
            CommandLineTestSupport.Run r = CommandLineTestSupport.run(args);
            assertEquals(ExitCodes.BAD_INPUT, r.status(), String.join(" ", args) + ": " + r.err());
            assertEquals(1, r.err().strip().split("\n").length, r.err());
            assertFalse(Files.exists(out), "nothing written for " + String.join(" ", args));
        }
    }

    /** A folder holding anything but an earlier report is refused before any work, and left as it was. */
    @Test
    void aFolderOfOtherFilesIsRefusedBeforeAnyWork() throws IOException {
        Path m = model("a.json", 10, 500, 20);
        Path out = Files.createDirectories(dir.resolve("busy"));
        Files.writeString(out.resolve("thesis.tex"), "mine");
        for (String[] args : new String[][] {
            {"report", m.toString(), "--out", out.toString()},
            {"demo", "--out", out.toString()},
        }) {
            CommandLineTestSupport.Run r = CommandLineTestSupport.run(args);
            assertEquals(ExitCodes.BAD_INPUT, r.status(), r.err());
            assertEquals(1, r.err().strip().split("\n").length, r.err());
            assertTrue(r.err().startsWith("plumb " + args[0] + ": --out " + out + ": is not empty"), r.err());
            assertTrue(r.err().contains("thesis.tex"), r.err());
            try (var left = Files.list(out)) {
                assertEquals(java.util.List.of(out.resolve("thesis.tex")), left.toList());
            }
        }
    }

    /** A blinded model: the fit uses the unblinded channels only, and the report and headline say so. */
    @Test
    void blindedModelIsReportedAsBlinded() throws IOException {
        Model demo = plumb.models.DemoModel.load();
        List<Channel> channels = new java.util.ArrayList<>(demo.channels());
        channels.set(0, channels.get(0).withObserved(null));
        Model blinded = new Model(demo.format(), demo.name(), demo.description(), demo.poi(), channels,
                demo.parameters(), demo.groups(), demo.labels(), demo.options());
        Path model = dir.resolve("blinded.json");
        ModelWriter.write(blinded, model);
        Path out = dir.resolve("blinded-report");
        var r = CommandLineTestSupport.run("report", model.toString(), "--out", out.toString(), "--toys", "0");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("the model is blinded"), r.out());
        assertTrue(r.out().contains("significance of the excess: observed –"), r.out());
        String page = Files.readString(out.resolve("index.html"));
        assertTrue(page.contains("blinded, left out of the fit: sr_tight"), "run summary names the blinded channel");
        assertTrue(CommandLineTestSupport.readJson(out.resolve("json/limit.json")).get("observed").isNull());
    }
}
