package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.w3c.dom.Element;
import plumb.cli.report.HeadlessChromium;
import plumb.cli.report.RunSummary;

import javax.imageio.ImageIO;
import javax.xml.parsers.DocumentBuilderFactory;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code plumb demo} end to end, rendered once for the class with few toys: every figure a valid
 * PNG and SVG of sensible size, every link and image of the page resolving inside the report, each
 * section present, the report's JSON equal to what the individual commands write, and the page
 * showing its figures in headless Chromium without console errors.
 */
class DemoReportTest {

    private static final String TOYS = "20";

    @TempDir
    static Path tmp;
    static Path dir;
    static Path model;
    static String html;
    static CommandLineTestSupport.Run demo;

    @BeforeAll
    static void renderTheDemo() throws IOException {
        dir = tmp.resolve("demo");
        demo = CommandLineTestSupport.run("demo", "--out", dir.toString(), "--toys", TOYS, "--threads", "2");
        model = dir.resolve("model.json");
        html = Files.readString(dir.resolve("index.html"), StandardCharsets.UTF_8);
    }

    @Test
    void demoSucceedsAndSaysWhereThePageIs() {
        assertEquals(ExitCodes.OK, demo.status(), demo.err());
        assertTrue(demo.out().contains(dir.toAbsolutePath().normalize().resolve("index.html").toString()), demo.out());
        assertEquals("", demo.err());
        // the headline repeats the numbers of the report's own JSON files
        var fit = CommandLineTestSupport.readJson(dir.resolve("json/fit.json"));
        var mu = fit.get("parameters").get(0);
        String expected = "best fit mu = " + plumb.cli.table.Table.measurement(mu.get("value").asDouble(), mu.get("error").asDouble());
        assertTrue(demo.out().contains(expected), demo.out());
        var discovery = CommandLineTestSupport.readJson(dir.resolve("json/discovery.json"));
        assertTrue(demo.out().contains(String.format(java.util.Locale.ROOT, "observed %.2f σ",
                discovery.get("observed").get("z").asDouble())), demo.out());
        assertTrue(demo.out().contains("95% CLs upper limit on mu"), demo.out());
    }

    @Test
    void everyFigureIsAValidPngAndSvg() throws Exception {
        List<String> figures = new ArrayList<>(List.of("correlation", "pulls", "impacts", "scan", "injection",
                "sensitivity", "projection", "contour"));
        for (String channel : List.of("sr_tight", "cr_loose_isolation", "cr_low_mass")) {
            figures.add("yields_" + channel + "_prefit");
            figures.add("yields_" + channel + "_postfit");
        }
        for (String name : figures) {
            Path png = dir.resolve("figures/" + name + ".png");
            BufferedImage image = ImageIO.read(png.toFile());
            assertNotNull(image, name + ".png is not a readable PNG");
            // Drawn at twice the nominal size of 450 to 1000 points for print.
            assertTrue(image.getWidth() >= 1200 && image.getWidth() <= 4000, name + " width " + image.getWidth());
            assertTrue(image.getHeight() >= 800 && image.getHeight() <= 6000, name + " height " + image.getHeight());

            Path svg = dir.resolve("figures/" + name + ".svg");
            assertTrue(Files.size(svg) > 5_000, name + ".svg is only " + Files.size(svg) + " bytes");
            Element root = DocumentBuilderFactory.newInstance().newDocumentBuilder().parse(svg.toFile()).getDocumentElement();
            assertEquals("svg", root.getTagName(), name);
            double width = Double.parseDouble(root.getAttribute("width").replace("px", ""));
            assertEquals(image.getWidth() / 2.0, width, 1.0, name + ": the SVG and PNG show the same figure");
        }
        // One <img> per figure on the page, and nothing else.
        assertEquals(figures.size(), count(html, "<img "));
    }

    @Test
    void everyLinkAndImageResolvesInsideTheReport() {
        Matcher refs = Pattern.compile("(?:src|href)=\"([^\"]*)\"").matcher(html);
        int checked = 0;
        while (refs.find()) {
            String ref = refs.group(1);
            if (ref.startsWith("#")) {
                assertTrue(html.contains("id=\"" + ref.substring(1) + "\""), "anchor " + ref);
                continue;
            }
            assertFalse(ref.contains(":"), "absolute or external reference " + ref);
            Path file = dir.resolve(ref).normalize();
            assertTrue(file.startsWith(dir), "reference leaves the report: " + ref);
            assertTrue(Files.isRegularFile(file), "missing " + ref);
            checked++;
        }
        // 14 figures (image, link, SVG and PNG links), 12 JSON files, tables in three formats.
        assertTrue(checked > 14 * 4 + 12 + 3 * 10, "only " + checked + " references");
    }

    @Test
    void everySectionIsThereAndTheSummaryNamesTheRun() throws IOException {
        for (String s : List.of("summary", "fit", "pulls", "impacts", "yields", "scan", "discovery", "limits", "planning",
                "gof", "injection", "files")) {
            assertTrue(html.contains("<section id=\"" + s + "\">"), s);
        }
        assertFalse(html.contains("Not run for this report."), "every section ran");
        assertFalse(html.contains("This section failed"), "nothing failed on the demo");
        String summary = html.substring(html.indexOf("<section id=\"summary\">"), html.indexOf("<section id=\"fit\">"));
        assertFalse(summary.contains("class=\"bad"), summary);
        assertTrue(summary.contains(RunSummary.sha256(model)), "model hash");
        assertTrue(summary.contains("<dd>lumen_ring_diphoton_demo</dd>"), summary);
        assertTrue(summary.contains("<dd>" + Main.VERSION + "</dd>"), "tool version");
        assertTrue(summary.contains("<dt>Seed</dt><dd>1</dd>"), "seed");
        assertTrue(summary.contains("<dt>Data set</dt><dd>observed</dd>"), "data set");
        assertTrue(summary.contains("Every fit converged."), summary);
        // The check's warning on the demo model reaches the summary.
        assertTrue(summary.contains("shape variation of photon_energy_scale exceeds 100%"), summary);
        for (String t : List.of("fit_parameters", "impacts", "impacts_breakdown", "yields_sr_tight_postfit", "scan_intervals",
                "discovery", "limits", "goodness_of_fit", "asimov_closure", "injection", "sensitivity", "projection")) {
            for (String ext : List.of("csv", "md", "tex")) {
                assertTrue(Files.size(dir.resolve("tables/" + t + "." + ext)) > 20, t + "." + ext);
            }
        }
    }

    @Test
    void jsonFilesEqualTheIndividualCommands() throws IOException {
        String m = model.toString();
        assertSameJson("check", json("check", m));
        assertSameJson("fit", json("fit", m, "--threads", "2"));
        assertSameJson("impacts", json("impacts", m, "--exact-top", "30", "--threads", "2"));
        assertSameJson("yields", json("yields", m, "--threads", "2"));
        assertSameJson("scan", json("scan", m, "--threads", "2"));
        assertSameJson("discovery", json("discovery", m));
        assertSameJson("limit", json("limit", m, "--threads", "2"));
        assertSameJson("gof", json("gof", m));
        assertSameJson("sensitivity", json("sensitivity", m, "--threads", "2"));
        assertSameJson("project", json("project", m, "--threads", "2"));
        assertSameJson("inject", json("inject", m, "--mu", "1,2,3", "--toys", TOYS, "--asimov", "--threads", "2"));
    }

    @Test
    void thePageShowsItsFiguresInABrowserWithoutConsoleErrors() throws Exception {
        Assumptions.assumeTrue(HeadlessChromium.available(), "chromium is not installed");
        HeadlessChromium.Page page = HeadlessChromium.open(dir.resolve("index.html"), tmp);
        String attributes = page.bodyAttributes();
        assertTrue(attributes.contains("data-check=\"ok\""), "page check failed: " + attributes);
        assertTrue(attributes.contains("data-images=\"14\""), attributes);
        assertEquals(List.of(), page.consoleLines(), "console messages");
    }

    private static JsonNode json(String... args) {
        List<String> a = new ArrayList<>(List.of(args));
        a.add("--json");
        a.add("-");
        CommandLineTestSupport.Run r = CommandLineTestSupport.run(a.toArray(new String[0]));
        assertEquals(ExitCodes.OK, r.status(), String.join(" ", args) + ": " + r.err());
        return r.json();
    }

    /** The report's file equals the command's output, wall-clock times aside. */
    private static void assertSameJson(String name, JsonNode command) throws IOException {
        JsonNode report = Json.mapper().readTree(dir.resolve("json/" + name + ".json").toFile());
        assertEquals(withoutTimes(command), withoutTimes(report), name + ".json");
    }

    private static JsonNode withoutTimes(JsonNode node) {
        JsonNode copy = node.deepCopy();
        strip(copy);
        return copy;
    }

    private static void strip(JsonNode node) {
        if (node instanceof ObjectNode o) {
            o.remove(List.of("timing", "seconds", "fastSeconds", "exactSeconds"));
            o.forEach(DemoReportTest::strip);
        } else if (node instanceof ArrayNode a) {
            a.forEach(DemoReportTest::strip);
        }
    }

    private static int count(String s, String what) {
        return s.split(Pattern.quote(what), -1).length - 1;
    }
}
