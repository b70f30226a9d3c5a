package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Every {@code json/NAME.json} of a report equals what the command writes with {@code --json}
 * and the same options: the report and the commands share one engine call and one JSON mapping
 * per result. Only run times are masked (they are measured, so two runs never agree).
 */
class ReportJsonEqualsCommandsTest {

    @TempDir static Path dir;

    static Path model;
    static Path report;

    /**
     * Two channels, a signal s·mu with a shape variation, a background with a norm and a shape
     * variation, MC-statistics errors, and a mass label: every section of the report has work.
     */
    @BeforeAll
    static void writeReport() throws IOException {
        model = writeModel("model.json", 750.0, new double[] {6, 12, 5}, new double[] {5.5, 12.6, 5.2},
                new double[] {6.4, 11.5, 4.9});
        report = dir.resolve("report");
        // What `plumb report MODEL --out DIR --toys 6 ...` runs, kept in memory for the figure check.
        ReportCommand command = new ReportCommand();
        new picocli.CommandLine(command).parseArgs(model.toString(), "--out", report.toString(), "--toys", "6",
                "--impacts-top", "3", "--threads", "2", "--seed", "5");
        ReportJob job = new ReportJob(List.of(model), command.fit, command.toys, command.impactsTop, command.label);
        assembled = job.assemble();
        assertTrue(assembled.summary().failures().isEmpty(), assembled.summary().failures().toString());
        plumb.cli.report.ReportWriter.write(assembled, report);
    }

    static plumb.cli.report.ReportInput assembled;

    /**
     * The model of the report: {@code mass} is its label, {@code signal} the signal counts of the
     * signal region's three bins, {@code up}/{@code down} those of the signal's shape variation.
     */
    private static Path writeModel(String file, double mass, double[] signal, double[] up, double[] down) throws IOException {
        Variation lumi = new Variation("lumi", new Variation.NormEffect(0.97, 1.03), null, null, null);
        Sample sig = new Sample("signal", signal, null, List.of("mu"), List.of(lumi,
                new Variation("sig_shape", null, new Variation.ShapeEffect(up, down), null, null)));
        Sample bkg = new Sample("background", new double[] {40, 35, 30}, new double[] {2, 2, 1.5}, List.of(), List.of(lumi,
                new Variation("bkg_norm", new Variation.NormEffect(0.9, 1.1), null, null, null),
                new Variation("bkg_shape", null, new Variation.ShapeEffect(new double[] {42, 35, 28}, new double[] {38, 35, 32}), null, null)));
        Sample side = new Sample("background", new double[] {80, 70}, null, List.of(), List.of(
                new Variation("bkg_norm", new Variation.NormEffect(0.9, 1.1), null, null, null)));
        Channel sr = new Channel("sr", "m [GeV]", new double[] {700, 730, 770, 800}, new double[] {49, 51, 34},
                List.of(sig, bkg));
        Channel cr = new Channel("cr", "m [GeV]", new double[] {500, 600, 700}, new double[] {83, 66}, List.of(side));
        Model m = new Model(Model.FORMAT, "equal-json", null, "mu", List.of(sr, cr),
                List.of(new ParameterSpec("mu", null, new double[] {0, 10}, null, null, false)),
                Map.of(), Map.of("mass", mass), null);
        Path p = dir.resolve(file);
        ModelWriter.write(m, p);
        return p;
    }

    /**
     * A report over three models of one spectrum (signal hypotheses at three masses) carries the
     * scan across them; it equals {@code plumb discovery A B C --json} with the report's reference level.
     */
    @Test
    void theScanAcrossModelsEqualsTheDiscoveryCommand() throws IOException {
        Path low = writeModel("low.json", 720.0, new double[] {12, 6, 1}, new double[] {11, 6.3, 1},
                new double[] {12.8, 5.7, 1});
        Path high = writeModel("high.json", 790.0, new double[] {1, 5, 12}, new double[] {1, 5.2, 12.6},
                new double[] {1, 4.8, 11.5});
        Path out = dir.resolve("report-scan");
        ReportCommand command = new ReportCommand();
        new picocli.CommandLine(command).parseArgs(model.toString(), "--out", out.toString(), "--threads", "2", "--seed", "5");
        // the main model first, as the report reads it; the scan orders the models by their mass
        ReportJob job = new ReportJob(List.of(model, high, low), command.fit, command.toys, command.impactsTop, command.label);
        plumb.cli.report.ReportInput in = job.assemble();
        assertTrue(in.summary().failures().isEmpty(), in.summary().failures().toString());
        plumb.cli.report.ReportWriter.write(in, out);
        JsonNode fromReport = CommandLineTestSupport.readJson(out.resolve("json/discovery-scan.json"));
        assertEquals(3, fromReport.get("points").size());
        assertEquals(720.0, fromReport.get("points").get(0).get("x").asDouble());
        assertEquals(790.0, fromReport.get("points").get(2).get("x").asDouble());
        CommandLineTestSupport.Run r = CommandLineTestSupport.run("discovery", model.toString(), high.toString(),
                low.toString(), "--reference", "0.5", "--threads", "2", "--seed", "5", "--json", "-");
        assertTrue(r.status() == ExitCodes.OK, r.err());
        assertEquals(masked(r.json()), masked(fromReport), "discovery-scan.json of the report differs from plumb discovery");
    }

    /**
     * The report's injection figure draws the straight line of the injection result file: the line
     * in the figure, read back from the chart's data at its two ends, has the JSON's slope and offset.
     */
    @Test
    void theLinearityFigureDrawsTheLineOfTheJson() {
        JsonNode line = CommandLineTestSupport.readJson(report.resolve("json/inject.json")).get("linearity");
        assertTrue(line.isObject(), "three injected values with toys give a line: " + line);
        org.jfree.chart.JFreeChart chart = plumb.cli.plot.LinearityFigure.of(
                plumb.cli.report.ReportWriter.linearity("mu", assembled.injection())).chart();
        org.jfree.data.xy.XYDataset drawn = chart.getXYPlot().getDataset(1);
        double x0 = drawn.getXValue(0, 0), y0 = drawn.getYValue(0, 0);
        double x1 = drawn.getXValue(0, 1), y1 = drawn.getYValue(0, 1);
        double slope = (y1 - y0) / (x1 - x0);
        assertEquals(line.get("slope").asDouble(), slope, 1e-12 * Math.abs(slope));
        assertEquals(line.get("offset").asDouble(), y0 - slope * x0, 1e-9);
    }

    /** Each report file with the command line that must give the same JSON. */
    static Stream<org.junit.jupiter.params.provider.Arguments> commands() {
        return Stream.of(
                args("check", "check"),
                args("fit", "fit"),
                args("impacts", "impacts", "--exact-top", "3"),
                args("yields", "yields"),
                args("scan", "scan"),
                args("discovery", "discovery"),
                args("limit", "limit"),
                args("gof", "gof"),
                args("inject", "inject", "--mu", "1,2,3", "--toys", "6", "--asimov"),
                args("sensitivity", "sensitivity"),
                args("project", "project", "--lumi", "1,2,5,10"),
                args("contour", "contour", "--x", "mu", "--y", "__PARTNER__", "--rays", "32"));
    }

    private static org.junit.jupiter.params.provider.Arguments args(String file, String... command) {
        return org.junit.jupiter.params.provider.Arguments.of(file, command);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("commands")
    void reportFileEqualsCommandOutput(String file, String[] command) throws IOException {
        JsonNode fromReport = CommandLineTestSupport.readJson(report.resolve("json/" + file + ".json"));
        List<String> line = new ArrayList<>(List.of(command));
        line.add(1, model.toString());
        line.replaceAll(a -> a.equals("__PARTNER__") ? fromReport.get("y").asText() : a);
        if (!file.equals("check")) line.addAll(List.of("--threads", "2", "--seed", "5"));   // check fits nothing
        line.addAll(List.of("--json", "-"));
        CommandLineTestSupport.Run r = CommandLineTestSupport.run(line.toArray(String[]::new));
        assertTrue(r.status() == ExitCodes.OK, String.join(" ", line) + ": " + r.err());
        JsonNode fromCommand = r.json();
        assertEquals(masked(fromCommand), masked(fromReport), file + ".json of the report differs from " + String.join(" ", line));
    }

    @Test
    void theReportWritesEveryFileCompared() {
        for (String f : new String[] {"check", "fit", "impacts", "yields", "scan", "discovery", "limit", "gof", "inject",
                "sensitivity", "project", "contour"}) {
            assertTrue(Files.isRegularFile(report.resolve("json/" + f + ".json")), f);
        }
    }

    /**
     * A copy with the measured run times removed: "seconds" and "…Seconds" anywhere (the fit's
     * timing, the limits', sensitivity's and projection's run times) are wall-clock times,
     * different in every run; everything else must be equal to the bit.
     */
    private static JsonNode masked(JsonNode node) {
        JsonNode copy = node.deepCopy();
        mask(copy);
        return copy;
    }

    private static void mask(JsonNode node) {
        if (node instanceof ObjectNode o) {
            List<String> times = new ArrayList<>();
            o.fieldNames().forEachRemaining(k -> {
                if (k.equals("seconds") || k.endsWith("Seconds")) times.add(k);
            });
            o.remove(times);
            for (Iterator<JsonNode> it = o.elements(); it.hasNext(); ) mask(it.next());
        } else if (node.isArray()) {
            for (JsonNode e : node) mask(e);
        }
    }
}
