package plumb.spark.build;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.build.BuildOutcome;
import plumb.cli.build.CutFlowRow;
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

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The benchmark compares like with like: on small generated tables, the plain-Java bound's sums
 * over sample 0's events equal the histograms and the cut flow that {@code plumb build} writes
 * for that sample.
 */
class BuildSpeedTest {

    @TempDir
    Path dir;

    static final String[] REGIONS = {"sr", "cr_iso", "cr_one"};

    @Test
    void boundSumsWhatTheBuildWrites() throws IOException {
        BenchTables tables = new BenchTables(800, 2, BuildSpeed.VARIATIONS, 11, 250);   // 2 files a sample
        assertTrue(tables.ensure(dir, 2));
        Path spec = Files.writeString(dir.resolve("build.json"), BuildSpeed.spec(2));
        BuildOutcome outcome;
        try (SparkRunner runner = SparkRunner.open("local[2]", 600)) {   // generous: the machine running the tests may be busy
            org.apache.spark.sql.SparkSession spark = BuildSession.of(runner);
            assertEquals("2", spark.conf().get("spark.sql.shuffle.partitions"), "one shuffle partition per core of local[2]");
            assertEquals("false", spark.conf().get("spark.sql.adaptive.enabled"));
            assertEquals(String.valueOf(BuildSession.LISTED_ON_DRIVER), spark.conf().get("spark.sql.sources.parallelPartitionDiscovery.threshold"));
            outcome = EventBuild.build(BuildSpecReader.read(spec), spark, dir.resolve("model.json"),
                    new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter()));
        }
        Model model = ModelReader.read(dir.resolve("model.json"));

        BuildSpeed.Columns c = BuildSpeed.Columns.of(tables, tables.sampleEvents(0));
        assertEquals(400, c.m().length);
        int weights = 2 * BuildSpeed.VARIATIONS + 1, bins = BuildSpeed.BINS;
        double[] sums = new double[REGIONS.length * bins * weights], squares = new double[sums.length], flow = new double[6];
        double total = BuildSpeed.loop(c, sums, squares, flow);
        assertTrue(total > 400 * 0.5, "every event counts in the first step of some region");

        for (int r = 0; r < REGIONS.length; r++) {
            Sample s = EventBuildTest.sample(model, REGIONS[r], "s0");
            double[] yields = new double[bins], errors = new double[bins], up = new double[bins], down = new double[bins];
            for (int b = 0; b < bins; b++) {
                int base = (r * bins + b) * weights;
                yields[b] = sums[base];
                errors[b] = Math.sqrt(squares[base]);
                up[b] = sums[base + 1];
                down[b] = sums[base + 2];
            }
            EventBuildTest.assertRelative(yields, s.yields(), REGIONS[r] + " yields");
            EventBuildTest.assertRelative(errors, s.mcError(), REGIONS[r] + " MC errors");
            Variation v0 = EventBuildTest.variation(s, "v0");
            EventBuildTest.assertRelative(up, v0.shape().up(), REGIONS[r] + " v0 up");
            EventBuildTest.assertRelative(down, v0.shape().down(), REGIONS[r] + " v0 down");

            String region = REGIONS[r];
            List<CutFlowRow> rows = outcome.cutFlow().stream().filter(x -> x.region().equals(region) && x.sample().equals("s0"))
                    .toList();
            assertEquals(flow[2 * r], rows.get(0).weighted(), 1e-12 * flow[2 * r], REGIONS[r] + " first step");
            assertEquals(flow[2 * r + 1], rows.get(1).weighted(), 1e-12 * flow[2 * r + 1], REGIONS[r] + " second step");
        }
    }
}
