package plumb.spark.build;

import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.Main;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;
import plumb.engine.model.Sample;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code plumb demo --events} end to end through the command line: in-process on the default
 * local master and on {@code --spark local[2]}; the model is valid, the cut flow is monotone and
 * ends at the histogram totals, the report has its cut-flow section; and the invented events are
 * the same for the same seed.
 */
class EventsDemoTest {

    @TempDir
    Path dir;

    @Test
    void theInventedEventsRepeatForASeedAndChangeWithIt() {
        for (DemoEvents.Process p : DemoEvents.PROCESSES) {
            List<Object[]> a = DemoEvents.simulated(p, 11), b = DemoEvents.simulated(p, 11), c = DemoEvents.simulated(p, 12);
            assertEquals(p.generated(), a.size());
            assertTrue(deepEqual(a, b), p.name());
            assertFalse(deepEqual(a, c), p.name());
            // the weights add up to the expected total: Σw = expected · mean(0.85 + 0.3u), mean 1, spread 0.087/√n
            double sum = 0;
            for (Object[] r : a) sum += (Double) r[DemoEvents.MC_COLUMNS.indexOf("w")];
            assertEquals(p.expected(), sum, 5 * 0.087 / Math.sqrt(p.generated()) * p.expected(), p.name());
        }
        List<Object[]> d = DemoEvents.pseudoData(11);
        assertTrue(deepEqual(d, DemoEvents.pseudoData(11)));
        assertFalse(deepEqual(d, DemoEvents.pseudoData(12)));
        double expected = DemoEvents.PROCESSES.stream().mapToDouble(DemoEvents.Process::expected).sum();
        assertEquals(expected, d.size(), 5 * Math.sqrt(expected));   // a Poisson count: within 5 σ
        // the signal peaks at the resonance mass: mean of the 85 % core (7.5 GeV) and 15 % tail (20 GeV), error ≈ 0.17 GeV
        double mean = DemoEvents.simulated(DemoEvents.PROCESSES.get(0), 11).stream().mapToDouble(r -> (Double) r[0]).average().orElseThrow();
        assertEquals(DemoEvents.MASS, mean, 1.0);
    }

    @Test
    void theWorkedExampleOfTheDocsIsTheDemoDescription() throws IOException {
        String doc = Files.readString(Path.of("..", "docs", "build-format.md"));
        String example = doc.substring(doc.indexOf("## Worked example: the events demo"));
        example = example.substring(example.indexOf("```json") + 7, example.indexOf("```", example.indexOf("```json") + 7));
        ObjectMapper json = new ObjectMapper();
        try (var in = EventsDemo.class.getResourceAsStream(EventsDemo.SPEC_RESOURCE)) {
            assertEquals(json.readTree(in), json.readTree(example));
        }
    }

    @Test
    void endToEndInProcessAndOnLocalTwo() throws IOException {
        Path local = dir.resolve("local"), two = dir.resolve("two");
        Run a = demo("demo", "--events", local.toString(), "--toys", "0");
        checkDemo(local, a);
        Run b = demo("demo", "--events", "--out", two.toString(), "--toys", "0", "--spark", "local[2]");
        checkDemo(two, b);
        // the same seed: the same tables and the same model, whichever master ran them
        for (String t : List.of("signal", "continuum", "photon_jet", "dijet", "data")) {
            assertEquals(-1L, Files.mismatch(local.resolve("events/" + t + ".parquet"), two.resolve("events/" + t + ".parquet")), t);
        }
        Model ma = ModelReader.read(local.resolve("model.json")), mb = ModelReader.read(two.resolve("model.json"));
        for (int c = 0; c < ma.channels().size(); c++) {
            Channel x = ma.channels().get(c), y = mb.channels().get(c);
            assertArrayEquals(x.observed(), y.observed(), 0);
            for (int s = 0; s < x.samples().size(); s++) {
                double[] u = x.samples().get(s).yields(), v = y.samples().get(s).yields();
                for (int k = 0; k < u.length; k++) assertEquals(u[k], v[k], 1e-12 * Math.abs(u[k]), x.name());
            }
        }
    }

    private static void checkDemo(Path out, Run r) throws IOException {
        r.out().lines().filter(l -> l.startsWith("wrote") || l.startsWith("Report written")).forEach(System.out::println);
        assertEquals(0, r.code(), r.err());
        Model m = ModelReader.read(out.resolve("model.json"));   // the reader's every rule
        assertEquals(List.of("isolated", "not_isolated"), m.channels().stream().map(Channel::name).toList());
        assertEquals("mu", m.poi());
        for (String f : List.of("build.json", "model.cutflow.txt", "model.cutflow.csv", "model.cutflow.tex", "report/index.html",
                "events/signal.parquet", "events/data.parquet", "report/tables/cutflow_isolated.csv")) {
            assertTrue(Files.isRegularFile(out.resolve(f)), f);
        }
        try (var s = Files.list(out.resolve("events"))) {
            assertEquals(5, s.count(), "only the five tables, no leftover parts");
        }

        // cut flow from its CSV: region, sample, step, weighted (full precision), events
        Map<String, List<String[]>> flows = new LinkedHashMap<>();
        List<String> lines = Files.readAllLines(out.resolve("model.cutflow.csv"));
        assertEquals("region,sample,step,weighted,events", lines.get(0));
        for (String line : lines.subList(1, lines.size())) {
            String[] f = line.split(",");
            flows.computeIfAbsent(f[0] + "/" + f[1], k -> new ArrayList<>()).add(f);
        }
        assertEquals(2 * 5, flows.size(), flows.keySet().toString());   // two regions × (four samples and data)
        for (Map.Entry<String, List<String[]>> e : flows.entrySet()) {
            List<String[]> steps = e.getValue();
            assertEquals(5, steps.size(), e.getKey());   // four named steps and "in the bins"
            for (int k = 1; k < steps.size(); k++) {
                // "in the bins" sums the histogram's bins, the steps sum the events: equal sets may differ by rounding
                double before = Double.parseDouble(steps.get(k - 1)[3]);
                assertTrue(Double.parseDouble(steps.get(k)[3]) <= before * (1 + 1e-12), e.getKey() + " weighted, step " + k);
                assertTrue(Long.parseLong(steps.get(k)[4]) <= Long.parseLong(steps.get(k - 1)[4]), e.getKey() + " events, step " + k);
            }
            String[] last = steps.get(steps.size() - 1);
            assertEquals("in the bins", last[2]);
            String[] key = e.getKey().split("/");
            Channel ch = m.channels().stream().filter(c -> c.name().equals(key[0])).findFirst().orElseThrow();
            double total;
            if (key[1].equals("data")) {
                total = sum(ch.observed());
                assertEquals(Long.parseLong(last[4]), total, 0, e.getKey());
            } else {
                Sample s = ch.samples().stream().filter(x -> x.name().equals(key[1])).findFirst().orElseThrow();
                total = sum(s.yields());
            }
            assertEquals(Double.parseDouble(last[3]), total, 1e-12 * total, e.getKey() + ": the last row is the histogram total");
            // events outside 500–800 GeV are dropped: the histogram holds fewer than the last step for the falling samples
            if (key[1].equals("continuum")) assertTrue(total < Double.parseDouble(steps.get(3)[3]), e.getKey());
        }

        String page = Files.readString(out.resolve("report/index.html"));
        assertTrue(page.contains("<section id=\"cutflow\">"), "cut-flow section");
        assertTrue(page.contains("href=\"#cutflow\""), "cut flow in the navigation");
        assertTrue(page.contains("Region isolated: events left after each step") && page.contains("both isolated")
                && page.contains("in the bins"), "the isolated region's table");
        assertTrue(page.contains("Region not_isolated"), "the control region's table");
        assertTrue(r.out().contains(out.resolve("report/index.html").toString()) && r.out().contains(out.resolve("build.json").toString())
                && r.out().contains(out.resolve("model.cutflow").toString()), r.out());
    }

    private static double sum(double[] v) {
        double s = 0;
        for (double x : v) s += x;
        return s;
    }

    private static boolean deepEqual(List<Object[]> a, List<Object[]> b) {
        if (a.size() != b.size()) return false;
        for (int i = 0; i < a.size(); i++) if (!java.util.Arrays.equals(a.get(i), b.get(i))) return false;
        return true;
    }

    record Run(int code, String out, String err) { }

    private static Run demo(String... args) {
        StringWriter out = new StringWriter(), err = new StringWriter();
        int code = Main.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(code, out.toString(), err.toString());
    }
}
