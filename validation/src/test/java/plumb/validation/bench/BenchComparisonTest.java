package plumb.validation.bench;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The before/after table of bench-compare from small JMH result files written as JMH writes them. */
class BenchComparisonTest {

    @TempDir
    Path dir;

    /** One JMH JSON result entry; {@code error} is a JSON value (JMH writes "NaN" as a string). */
    private static String entry(String benchmark, String mode, String params, double score, String error, String unit) {
        return entry(benchmark, mode, params, score, error, unit, "");
    }

    /** The same with a CPU time per operation as {@link CpuTimeProfiler} reports it. */
    private static String entry(String benchmark, String mode, String params, double score, String error, String unit,
                                double cpu, double cpuError, String cpuUnit) {
        return entry(benchmark, mode, params, score, error, unit, """
                "%s" : { "score" : %s, "scoreError" : %s, "scoreConfidence" : [ 0, 0 ], "scoreUnit" : "%s", "rawData" : [ [ 1 ] ] }
                """.formatted(CpuTimeProfiler.LABEL, cpu, cpuError, cpuUnit));
    }

    private static String entry(String benchmark, String mode, String params, double score, String error, String unit,
                                String secondary) {
        return """
                {
                    "jmhVersion" : "1.37",
                    "benchmark" : "plumb.validation.bench.%s",
                    "mode" : "%s",
                    "threads" : 1,
                    "forks" : 1,
                    "params" : { %s },
                    "primaryMetric" : {
                        "score" : %s,
                        "scoreError" : %s,
                        "scoreConfidence" : [ 0, 0 ],
                        "scoreUnit" : "%s",
                        "rawData" : [ [ 1, 2, 3 ] ]
                    },
                    "secondaryMetrics" : { %s }
                }""".formatted(benchmark, mode, params, score, error, unit, secondary);
    }

    private Path file(String name, String... entries) throws IOException {
        return Files.writeString(dir.resolve(name), "[\n" + String.join(",\n", entries) + "\n]\n");
    }

    private Path plan(String... lines) throws IOException {
        return Files.writeString(dir.resolve("plan.tsv"), String.join("\n", lines) + "\n");
    }

    @Test
    void scoresSideBySideWithTheRatioInTheNewerUnit() throws IOException {
        Path old = file("fit.old.json",
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"medium\"", 1.86, "0.2", "ms/op"),
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"large\"", 129000, "12000", "us/op"));
        Path recent = file("fit.new.json",
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"medium\"", 1.02, "0.5", "ms/op"),
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"large\"", 43.0, "\"NaN\"", "ms/op"));
        List<BenchComparison.Row> rows = BenchComparison.rows(plan(
                "plumb.validation.bench.FitBenchmark.newtonFit\t" + old + "\t" + recent));
        assertEquals(2, rows.size());
        BenchComparison.Row medium = rows.get(0), large = rows.get(1);
        assertEquals("FitBenchmark.newtonFit", medium.benchmark());
        assertEquals("size=medium", medium.params());
        assertEquals("1.86 ± 0.200 ms/op", medium.old());
        assertEquals("1.02 ± 0.500 ms/op", medium.recent());
        assertEquals("0.55", medium.ratio());   // 1.02 / 1.86 = 0.548
        // the older run's µs converted to the newer run's ms; no error where JMH had none
        assertEquals("129 ± 12.0 ms/op", large.old());
        assertEquals("43.0 ms/op", large.recent());
        assertEquals("0.33", large.ratio());    // 43 / 129 = 0.333
    }

    @Test
    void aBenchmarkTheOlderJarLacksOrThatFailedIsSaidSo() throws IOException {
        Path recent = file("limit.new.json",
                entry("LimitBenchmark.toyFit", "avgt", "\"size\" : \"medium\"", 1.5, "0.1", "ms/op"));
        Path failed = file("limit.old.json");
        Path scale = file("scale.new.json",
                entry("ScaleBenchmark.fitWithErrors", "ss", "", 20.0, "\"NaN\"", "s/op"));
        List<BenchComparison.Row> rows = BenchComparison.rows(plan(
                "plumb.validation.bench.LimitBenchmark.toyFit\t" + failed + "\t" + recent,
                "plumb.validation.bench.ScaleBenchmark.fitWithErrors\t-\t" + scale,
                "plumb.validation.bench.Gone.run\t" + failed + "\t-"));
        assertEquals(3, rows.size());
        assertEquals("failed (no result)", rows.get(0).old());
        assertEquals("", rows.get(0).ratio());
        assertEquals("not in old jar", rows.get(1).old());
        assertEquals("20.0 s/op", rows.get(1).recent());
        assertEquals("failed (no result)", rows.get(2).old());
        assertEquals("not in new jar", rows.get(2).recent());
    }

    @Test
    void aParameterOnlyTheNewerJarHasIsNamedAndTheRestMatched() throws IOException {
        Path old = file("inj.old.json",
                entry("InjectionBenchmark.thousandToys", "ss", "\"threads\" : \"2\"", 1.3, "0.4", "s/op"),
                entry("InjectionBenchmark.thousandToys", "ss", "\"threads\" : \"1\"", 2.3, "0.4", "s/op"));
        Path recent = file("inj.new.json",
                entry("InjectionBenchmark.thousandToys", "ss", "\"threads\" : \"1\", \"toys\" : \"1000\"", 1.15, "0.2", "s/op"),
                entry("InjectionBenchmark.thousandToys", "ss", "\"threads\" : \"4\", \"toys\" : \"1000\"", 0.9, "0.2", "s/op"));
        List<BenchComparison.Row> rows = BenchComparison.rows(plan(
                "plumb.validation.bench.InjectionBenchmark.thousandToys\t" + old + "\t" + recent));
        assertEquals(3, rows.size());
        assertEquals("threads=1 toys=1000", rows.get(0).params());
        assertEquals("2.30 ± 0.400 s/op", rows.get(0).old());
        assertEquals("0.50", rows.get(0).ratio());
        assertEquals("old jar has no parameter toys", rows.get(0).note());
        assertEquals("no such parameters in old jar", rows.get(1).old());
        // the older threads=2 score met no newer one: it keeps its own row
        assertEquals("threads=2", rows.get(2).params());
        assertEquals("no such parameters in new jar", rows.get(2).recent());
    }

    @Test
    void printedColumnsLineUp() throws IOException {
        Path old = file("a.old.json",
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"medium\"", 1.86, "0.2", "ms/op"));
        Path recent = file("a.new.json",
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"medium\"", 1.02, "0.5", "ms/op"));
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        BenchComparison.print(BenchComparison.rows(plan(
                "plumb.validation.bench.FitBenchmark.newtonFit\t" + old + "\t" + recent)), "5804a24", "a03e2c2",
                new PrintStream(bytes, true, StandardCharsets.UTF_8));
        String[] lines = bytes.toString(StandardCharsets.UTF_8).split("\n");
        assertEquals(3, lines.length);
        assertTrue(lines[0].startsWith("benchmark "), lines[0]);
        assertTrue(lines[0].contains("old 5804a24") && lines[0].contains("new a03e2c2"), lines[0]);
        // the ratio column is right-aligned: the header's and the row's end at the same place
        assertEquals(lines[0].indexOf("new/old") + "new/old".length(), lines[1].indexOf("0.55") + "0.55".length());
        assertTrue(lines[1].startsWith("FitBenchmark.newtonFit  size=medium  avgt"), lines[1]);
    }

    @Test
    void cpuTimeBesideTheWallTimeWhereBothRunsMeasuredIt() throws IOException {
        Path old = file("c.old.json",
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"medium\"", 1.86, "0.2", "ms/op", 1800, 100, "us/op"),
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"large\"", 129, "12", "ms/op"));
        Path recent = file("c.new.json",
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"medium\"", 1.02, "0.5", "ms/op", 0.9, 0.05, "ms/op"),
                entry("FitBenchmark.newtonFit", "avgt", "\"size\" : \"large\"", 43, "5", "ms/op", 40, 2, "ms/op"));
        List<BenchComparison.Row> rows = BenchComparison.rows(plan(
                "plumb.validation.bench.FitBenchmark.newtonFit\t" + old + "\t" + recent));
        BenchComparison.Row medium = rows.get(0), large = rows.get(1);
        assertEquals("1.80 ± 0.100 ms/op", medium.oldCpu());
        assertEquals("0.900 ± 0.0500 ms/op", medium.recentCpu());
        assertEquals("0.50", medium.cpuRatio());
        // the old run of large has no CPU time: no CPU cells at all
        assertEquals("", large.oldCpu());
        assertEquals("", large.recentCpu());
        assertEquals("", large.cpuRatio());
        assertEquals("0.33", large.ratio());

        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        BenchComparison.print(rows, "a", "b", new PrintStream(bytes, true, StandardCharsets.UTF_8));
        String[] lines = bytes.toString(StandardCharsets.UTF_8).split("\n");
        assertTrue(lines[0].contains("CPU old") && lines[0].contains("CPU new"), lines[0]);
        assertTrue(lines[1].endsWith("0.50"), lines[1]);
    }

    @Test
    void threeSignificantDigits() {
        assertEquals("1.86", BenchComparison.significant(1.8612));
        assertEquals("42.7", BenchComparison.significant(42.71));
        assertEquals("407", BenchComparison.significant(406.9));
        assertEquals("0.0123", BenchComparison.significant(0.012345));
        assertEquals("1.23e+05", BenchComparison.significant(123456));
        assertEquals(0.407, BenchComparison.inUnit(407, "us/op", "ms/op"), 1e-15);
        assertTrue(Double.isNaN(BenchComparison.inUnit(1, "ops/s", "ms/op")));
    }

    @Test
    void largeTimesStepUpTheirUnit() throws IOException {
        Path old = file("r.old.json",
                entry("ImpactsBenchmark.exactRanking", "ss", "\"size\" : \"large\"", 113000, "22800", "ms/op"));
        Path recent = file("r.new.json",
                entry("ImpactsBenchmark.exactRanking", "ss", "\"size\" : \"large\"", 65100, "\"NaN\"", "ms/op"));
        BenchComparison.Row r = BenchComparison.rows(plan(
                "plumb.validation.bench.ImpactsBenchmark.exactRanking\t" + old + "\t" + recent)).get(0);
        assertEquals("113 ± 22.8 s/op", r.old());
        assertEquals("65.1 s/op", r.recent());
        assertEquals("0.58", r.ratio());   // 65.1 / 113 = 0.576
        // two steps where needed, none below 10,000 or for other units
        assertEquals("s/op", BenchComparison.readable(new BenchComparison.Value(2.5e7, 1, "us/op")).unit());
        assertEquals("ms/op", BenchComparison.readable(new BenchComparison.Value(9999, 1, "ms/op")).unit());
        assertEquals("ops/s", BenchComparison.readable(new BenchComparison.Value(1e6, 1, "ops/s")).unit());
    }
}
