package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.InputException;
import plumb.cli.build.BuildOutcome;
import plumb.cli.build.CutFlowRow;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;
import plumb.spark.campaign.SparkRunner;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.function.ToDoubleFunction;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Builds from small CSV tables on Spark local[2] and checks the model against a plain-Java
 * computation over the same files, the cut flow, pruning, and the refusals of bad input.
 */
class EventBuildTest {

    static SparkRunner runner;
    static SparkSession spark;

    @TempDir
    Path dir;

    /** The fixture's folder, model and outcome: built once for the checks that only read them. */
    @TempDir
    static Path shared;
    static BuildOutcome outcome;
    static Model model;

    @BeforeAll
    static void start() throws IOException {
        runner = SparkRunner.open("local[2]", 600);   // generous: the machine running the tests may be busy
        spark = SparkSession.builder().getOrCreate();
        Path spec = fixture(shared);
        outcome = EventBuild.build(BuildSpecReader.read(spec), spark, shared.resolve("model.json"),
                new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter()));
        model = ModelReader.read(shared.resolve("model.json"));   // what was written, read back by the model reader
    }

    @AfterAll
    static void stop() {
        runner.close();
    }

    static final double[] SR = {100, 110, 120, 130, 140};
    static final double[] CR = {100, 120, 140};

    /** Tables and a description with two regions (folded / dropped outside), two samples, four kinds of variation. */
    static Path fixture(Path dir) throws IOException {
        SmallEvents.write(dir.resolve("sig.csv"), 1, 900, 1.0, 0.02);
        SmallEvents.write(dir.resolve("bkg_a.csv"), 2, 700, 2.0, 1.5);
        SmallEvents.write(dir.resolve("bkg_b.csv"), 3, 600, 2.0, 1.5);
        SmallEvents.write(dir.resolve("alt_bkg_up.csv"), 4, 650, 1.8, 1.5);
        SmallEvents.write(dir.resolve("data.csv"), 5, 1200, 1.9, 1.0);
        return spec(dir, """
                "poi": "mu", "labels": {"mass": 118},
                "data": {"events": ["data.csv"]},
                "regions": [
                  {"name": "sr", "observable": "m", "title": "m [GeV]", "edges": [100, 110, 120, 130, 140], "outside": "fold",
                   "steps": [{"name": "two photons", "keep": "n_ph >= 2"}, {"name": "isolated", "keep": "iso < 0.2"}]},
                  {"name": "cr", "observable": "m", "edges": [100, 120, 140],
                   "steps": [{"name": "two photons", "keep": "n_ph >= 2"}, {"name": "not isolated", "keep": "iso >= 0.2"}]}],
                "samples": [
                  {"name": "sig", "events": ["sig.csv"], "weight": "w", "factors": ["mu"],
                   "variations": [
                     {"parameter": "same", "weights": {"up": "w", "down": "w"}},
                     {"parameter": "alt", "weights": {"up": "w_alt", "down": "2 * w - w_alt"}},
                     {"parameter": "scale", "observable": {"up": "m * 1.01", "down": "m * 0.99"}},
                     {"parameter": "lumi", "norm": {"up": 1.02, "down": 0.98}}]},
                  {"name": "bkg", "events": ["bkg_*.csv"], "weight": "w", "factors": ["k_bkg"],
                   "variations": [{"parameter": "calib", "events": {"up": ["alt_bkg_up.csv"]}, "tidy": {"symmetrise": "larger"}}]}]
                """);
    }

    Path spec(String body) throws IOException {
        return spec(dir, body);
    }

    static Path spec(Path dir, String body) throws IOException {
        return Files.writeString(dir.resolve("build.json"),
                "{\"format\": \"plumb-build/1\", \"name\": \"small\",\n" + body + "}\n");
    }

    BuildOutcome build(Path spec, Path out, StringWriter err) {
        return EventBuild.build(BuildSpecReader.read(spec), spark, out, new PrintWriter(new StringWriter()), new PrintWriter(err));
    }

    /** Plain-Java sums over one region of the given files: [0] Σ f, [1] Σ w² (w the nominal weight). */
    static double[][] plain(List<Path> files, double[] edges, boolean fold, boolean isolated,
                            ToDoubleFunction<SmallEvents.Event> weight, ToDoubleFunction<SmallEvents.Event> observable) throws IOException {
        double[][] out = new double[2][edges.length - 1];
        for (Path f : files) {
            for (SmallEvents.Event e : SmallEvents.read(f)) {
                if (e.nph() < 2 || (isolated != (e.iso() < 0.2))) continue;
                int b = SmallEvents.bin(observable.applyAsDouble(e), edges, fold);
                if (b < 0) continue;
                double w = weight.applyAsDouble(e);
                out[0][b] += w;
                out[1][b] += e.w() * e.w();
            }
        }
        return out;
    }

    static void assertRelative(double[] expected, double[] actual, String what) {
        assertEquals(expected.length, actual.length, what);
        for (int b = 0; b < expected.length; b++) {
            // Summation order differs between Spark and the loop: a few ulps of the sum; 1e-12 relative leaves room.
            assertEquals(expected[b], actual[b], 1e-12 * Math.abs(expected[b]), what + " bin " + b);
        }
    }

    static Sample sample(Model m, String channel, String name) {
        Channel c = m.channels().stream().filter(x -> x.name().equals(channel)).findFirst().orElseThrow();
        return c.samples().stream().filter(s -> s.name().equals(name)).findFirst().orElseThrow();
    }

    static Variation variation(Sample s, String parameter) {
        return s.variations().stream().filter(v -> v.parameter().equals(parameter)).findFirst().orElse(null);
    }

    @Test
    void contentsAndErrorsEqualAPlainJavaComputation() throws IOException {
        Path dir = shared;
        BuildOutcome o = outcome;
        Model m = model;
        List<Path> sig = List.of(dir.resolve("sig.csv"));
        List<Path> bkg = List.of(dir.resolve("bkg_a.csv"), dir.resolve("bkg_b.csv"));
        for (boolean sr : new boolean[] {true, false}) {
            String ch = sr ? "sr" : "cr";
            double[] edges = sr ? SR : CR;
            double[][] s = plain(sig, edges, sr, sr, SmallEvents.Event::w, SmallEvents.Event::m);
            assertRelative(s[0], sample(m, ch, "sig").yields(), ch + " sig yields");
            assertRelative(sqrt(s[1]), sample(m, ch, "sig").mcError(), ch + " sig mcError");
            double[][] b = plain(bkg, edges, sr, sr, SmallEvents.Event::w, SmallEvents.Event::m);
            assertRelative(b[0], sample(m, ch, "bkg").yields(), ch + " bkg yields");
            assertRelative(sqrt(b[1]), sample(m, ch, "bkg").mcError(), ch + " bkg mcError");

            Variation alt = variation(sample(m, ch, "sig"), "alt");
            assertRelative(plain(sig, edges, sr, sr, SmallEvents.Event::alt, SmallEvents.Event::m)[0], alt.shape().up(), ch + " alt up");
            assertRelative(plain(sig, edges, sr, sr, e -> 2 * e.w() - e.alt(), SmallEvents.Event::m)[0], alt.shape().down(), ch + " alt down");
            Variation scale = variation(sample(m, ch, "sig"), "scale");
            assertRelative(plain(sig, edges, sr, sr, SmallEvents.Event::w, e -> e.m() * 1.01)[0], scale.shape().up(), ch + " scale up");
            assertRelative(plain(sig, edges, sr, sr, SmallEvents.Event::w, e -> e.m() * 0.99)[0], scale.shape().down(), ch + " scale down");
            assertEquals(1.02, variation(sample(m, ch, "sig"), "lumi").norm().up());

            // table-based, one-sided, symmetrised ("larger"): up from the other tables, down mirrored about nominal
            Variation calib = variation(sample(m, ch, "bkg"), "calib");
            double[] up = plain(List.of(dir.resolve("alt_bkg_up.csv")), edges, sr, sr, SmallEvents.Event::w, SmallEvents.Event::m)[0];
            assertRelative(up, calib.shape().up(), ch + " calib up");
            double[] mirrored = new double[up.length];
            for (int i = 0; i < up.length; i++) mirrored[i] = Math.max(0, 2 * b[0][i] - up[i]);
            assertRelative(mirrored, calib.shape().down(), ch + " calib down");

            double[] data = new double[edges.length - 1];
            for (SmallEvents.Event e : SmallEvents.read(dir.resolve("data.csv"))) {
                int k = e.nph() >= 2 && (sr == (e.iso() < 0.2)) ? SmallEvents.bin(e.m(), edges, sr) : -1;
                if (k >= 0) data[k]++;
            }
            Channel c = m.channels().stream().filter(x -> x.name().equals(ch)).findFirst().orElseThrow();
            assertRelative(data, c.observed(), ch + " data");
        }
        assertEquals("mu", m.poi());
        assertEquals(118.0, m.labels().get("mass"));
        assertTrue(Files.exists(dir.resolve("model.cutflow.txt")) && Files.exists(dir.resolve("model.cutflow.csv"))
                && Files.exists(dir.resolve("model.cutflow.tex")));
        assertEquals(o.cutFlow().size(), Files.readAllLines(dir.resolve("model.cutflow.csv")).size() - 1);
    }

    @Test
    void variationEqualToNominalHasNoEffectAndIsLeftOut() {
        BuildOutcome o = outcome;
        Model m = model;
        for (String ch : new String[] {"sr", "cr"}) {
            assertNull(variation(sample(m, ch, "sig"), "same"), ch);
            assertNotNull(variation(sample(m, ch, "sig"), "alt"), ch);
            assertTrue(o.changes().contains(ch + "/sig/same: no effect on any yield; left out"), o.changes().toString());
        }
    }

    @Test
    void cutFlowIsMonotoneAndEndsAtTheHistogramTotal() {
        BuildOutcome o = outcome;
        Model m = model;
        for (String ch : new String[] {"sr", "cr"}) {
            for (String s : new String[] {"sig", "bkg", "data"}) {
                List<CutFlowRow> rows = o.cutFlow().stream().filter(r -> r.region().equals(ch) && r.sample().equals(s)).toList();
                assertEquals(3, rows.size(), ch + " " + s);   // two steps and the row of the bins
                assertTrue(rows.get(0).raw() >= rows.get(1).raw() && rows.get(1).raw() >= rows.get(2).raw(), rows.toString());
                // weights are positive; the bins' sum is the last step's in another order: equal within rounding
                double slack = 1e-12 * rows.get(0).weighted();
                assertTrue(rows.get(0).weighted() >= rows.get(1).weighted() - slack
                        && rows.get(1).weighted() >= rows.get(2).weighted() - slack, rows.toString());
                assertTrue(rows.get(1).raw() > 0);
                double total = s.equals("data")
                        ? Stream.of(m.channels().get(ch.equals("sr") ? 0 : 1).observed()).flatMapToDouble(java.util.Arrays::stream).sum()
                        : java.util.Arrays.stream(sample(m, ch, s).yields()).sum();
                assertEquals(total, rows.get(2).weighted(), 1e-12 * total);
                if (ch.equals("sr")) {
                    // folded: every selected event is in the bins
                    assertEquals(rows.get(1).weighted(), rows.get(2).weighted(), 1e-12 * total, s);
                    assertEquals(rows.get(1).raw(), rows.get(2).raw(), s);
                } else {
                    // dropped: the events below 100 (m starts at 95) are not
                    assertTrue(rows.get(2).raw() < rows.get(1).raw(), rows.toString());
                }
            }
        }
    }

    static double[] sqrt(double[] a) {
        double[] out = new double[a.length];
        for (int i = 0; i < a.length; i++) out[i] = Math.sqrt(a[i]);
        return out;
    }

    // ---- bad input: exit-2 errors naming the key, and nothing written

    void assertRefused(Path spec, String... parts) {
        Path out = dir.resolve("bad.json");
        InputException e = assertThrows(InputException.class, () -> build(spec, out, new StringWriter()));
        for (String p : parts) assertTrue(e.getMessage().contains(p), e.getMessage());
        assertEquals(1, e.getMessage().lines().count(), e.getMessage());
        assertFalse(Files.exists(out));
        assertFalse(Files.exists(dir.resolve("bad.cutflow.txt")));
    }

    String body(String keep, String observable, String weight, String events) {
        return """
                "regions": [{"name": "sr", "observable": "%s", "edges": [100, 120, 140],
                             "steps": [{"name": "two", "keep": "n_ph >= 2"}, {"name": "iso", "keep": "%s"}]}],
                "samples": [{"name": "sig", "events": [%s], "weight": "%s"}]
                """.formatted(observable, keep, events, weight);
    }

    @Test
    void missingColumnNamesTheKeyAndSparksMessage() throws IOException {
        SmallEvents.write(dir.resolve("sig.csv"), 1, 50, 1, 1);
        assertRefused(spec(body("isolation < 0.2", "m", "w", "\"sig.csv\"")), "build.json: regions[0].steps[1].keep:",
                "Spark:", "isolation");
    }

    @Test
    void unknownFunctionNamesTheKeyAndSparksMessage() throws IOException {
        SmallEvents.write(dir.resolve("sig.csv"), 1, 50, 1, 1);
        assertRefused(spec(body("iso < 0.2", "invented_fn(m)", "w", "\"sig.csv\"")), "regions[0].observable:", "Spark:",
                "invented_fn");
    }

    @Test
    void wrongTypesAreRefused() throws IOException {
        SmallEvents.write(dir.resolve("sig.csv"), 1, 50, 1, 1);
        assertRefused(spec(body("iso", "m", "w", "\"sig.csv\"")), "regions[0].steps[1].keep:", "expected a boolean");
    }

    @Test
    void missingFileNamesTheKey() throws IOException {
        assertRefused(spec(body("iso < 0.2", "m", "w", "\"nowhere_*.parquet\"")), "samples[0].events: no file matches");
    }

    @Test
    void tablesWithDifferentColumnTypesAreRefused() throws IOException {
        spark.sql("SELECT CAST(id AS DOUBLE) AS m, 2 AS n_ph, 0.1D AS iso, 1.0D AS w FROM range(10)")
                .coalesce(1).write().parquet(dir.resolve("a").toString());
        spark.sql("SELECT CAST(id AS DOUBLE) AS m, 2 AS n_ph, 0.1D AS iso, CAST(1 AS INT) AS w FROM range(10)")
                .coalesce(1).write().parquet(dir.resolve("b").toString());
        assertRefused(spec(body("iso < 0.2", "m", "w", "\"a/*.parquet\", \"b/*.parquet\"")), "samples[0].events:",
                "does not match", "column w is int, not double");
    }

    @Test
    void nanAndInfiniteWeightsAreCountedAndRefused() throws IOException {
        SmallEvents.write(dir.resolve("sig.csv"), 1, 400, 1, 1);
        String weight = "CASE WHEN n_ph = 3 AND iso < 0.05 THEN double('NaN') WHEN n_ph = 2 AND iso < 0.02 THEN double('Infinity') ELSE w END";
        long expected = SmallEvents.read(dir.resolve("sig.csv")).stream()
                .filter(e -> (e.nph() == 3 && e.iso() < 0.05) || (e.nph() == 2 && e.iso() < 0.02)).count();
        assertTrue(expected > 0);
        assertRefused(spec(body("iso < 0.2", "m", weight, "\"sig.csv\"")), "sample sig", "NaN, infinite or null in "
                + expected + " selected event");
    }

    @Test
    void emptySelectionWarns() throws IOException {
        SmallEvents.write(dir.resolve("sig.csv"), 1, 50, 1, 1);
        StringWriter err = new StringWriter();
        BuildOutcome o = build(spec(body("iso > 7", "m", "w", "\"sig.csv\"")), dir.resolve("empty.json"), err);
        assertTrue(o.warnings().contains("region sr keeps no event of sample sig"), o.warnings().toString());
        assertTrue(err.toString().contains("warning: region sr keeps no event of sample sig"), err.toString());
    }
}
