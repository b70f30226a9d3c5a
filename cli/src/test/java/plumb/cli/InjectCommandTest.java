package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** plumb inject and plumb merge-toys through the command line (docs/cli-contract.md). */
class InjectCommandTest {

    @TempDir
    static Path dir;

    static Path model;

    @BeforeAll
    static void smallModel() throws IOException {
        model = dir.resolve("small.json");
        SyntheticModels.generateFile(2, 8, 3, 4, 5, model);
    }

    private record Run(int status, String out, String err) {
    }

    private static Run run(String... args) {
        StringWriter out = new StringWriter(), err = new StringWriter();
        int status = Main.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(status, out.toString(), err.toString());
    }

    private static Path inject(String name, String... extra) {
        Path json = dir.resolve(name);
        String[] base = {"inject", model.toString(), "--json", json.toString(), "--seed", "17"};
        String[] args = java.util.Arrays.copyOf(base, base.length + extra.length);
        System.arraycopy(extra, 0, args, base.length, extra.length);
        Run r = run(args);
        assertEquals(0, r.status(), r.err());
        return json;
    }

    /** Same seed ⇒ byte-identical result files with 1 and with 2 threads. */
    @Test
    void sameSeedGivesTheSameBytesWithAnyThreadCount() throws IOException {
        Path one = inject("t1.json", "--mu", "1,2.5", "--toys", "40", "--threads", "1");
        Path two = inject("t2.json", "--mu", "1,2.5", "--toys", "40", "--threads", "2");
        assertArrayEquals(Files.readAllBytes(one), Files.readAllBytes(two));
        JsonNode root = Json.mapper().readTree(one.toFile());
        assertEquals("toy", root.get("data").asText());
        assertEquals(2, root.get("injections").size());
        for (JsonNode inj : root.get("injections")) {
            for (String key : new String[] {"injected", "toys", "converged", "mean", "meanError", "pullMean",
                    "pullWidth", "coverage68", "pullMeanError", "pullWidthError", "coverage68Error", "bias",
                    "nonConverged", "nuisances"}) {
                assertTrue(inj.has(key), key);
            }
            assertEquals(40, inj.get("toys").asInt());
            assertTrue(inj.get("converged").asInt() >= 36);
        }
        for (String key : new String[] {"slope", "slopeError", "offset", "offsetError"}) {
            assertTrue(root.get("linearity").get(key).isNumber(), key);
        }
    }

    /**
     * Split batches merged equal one run, byte for byte, whatever the order the parts are given in;
     * one injected value puts the contract keys at the top level.
     */
    @Test
    void mergedBatchesEqualOneRun() throws IOException {
        for (String mu : new String[] {"1.5", "0.5,2,4"}) {
            Path whole = inject("whole.json", "--mu", mu, "--toys", "30", "--threads", "2");
            Path a = inject("a.json", "--mu", mu, "--first", "0", "--count", "11");
            Path b = inject("b.json", "--mu", mu, "--first", "11", "--count", "19", "--threads", "1");
            Path merged = dir.resolve("merged.json");
            Run r = run("merge-toys", b.toString(), a.toString(), "--json", merged.toString());
            assertEquals(0, r.status(), r.err());
            assertArrayEquals(Files.readAllBytes(whole), Files.readAllBytes(merged), mu);
        }
        JsonNode single = Json.mapper().readTree(dir.resolve("a.json").toFile());
        assertEquals(plumb.engine.inference.InjectionToyBatch.FORMAT, single.get("format").asText());
        Path one = inject("one.json", "--mu", "1.5", "--toys", "20");
        JsonNode root = Json.mapper().readTree(one.toFile());
        for (String key : new String[] {"injected", "toys", "converged", "mean", "meanError", "pullMean", "pullWidth",
                "coverage68", "labels", "data"}) {
            assertTrue(root.has(key), key);
        }
        assertEquals(1.5, root.get("injected").asDouble());
        assertFalse(root.has("injections"));
    }

    /** merge-toys refuses parts of another run, overlapping parts, gaps and other files: exit 2, one line naming the file. */
    @Test
    void mergeRefusesPartsThatDoNotFit() throws IOException {
        Path a = inject("r1.json", "--mu", "1", "--first", "0", "--count", "5");
        Path otherSeed = dir.resolve("r2.json");
        assertEquals(0, run("inject", model.toString(), "--mu", "1", "--first", "5", "--count", "5", "--seed", "99",
                "--json", otherSeed.toString()).status());
        Path overlap = inject("r3.json", "--mu", "1", "--first", "3", "--count", "5");
        Path gap = inject("r4.json", "--mu", "1", "--first", "7", "--count", "2");
        Path notPart = inject("r5.json", "--mu", "1", "--toys", "3");
        Path out = dir.resolve("never.json");
        String[][] cases = {{otherSeed.toString(), "run.seed differs"}, {overlap.toString(), "overlap"},
                {gap.toString(), "missing"}, {notPart.toString(), "format"}};
        for (String[] c : cases) {
            Run r = run("merge-toys", a.toString(), c[0], "--json", out.toString());
            assertEquals(2, r.status(), r.err());
            String line = r.err().strip();
            assertFalse(line.contains("\n"), line);
            assertTrue(line.contains(c[0]) && line.contains(c[1]), line);
            assertFalse(Files.exists(out));
        }
    }

    /** Bad options: exit 2 with one line naming the option; a --toys beyond memory says so. */
    @Test
    void badOptionsExitWithStatusTwo() {
        String m = model.toString();
        String[][] cases = {
                {"--mu 51", "--mu"}, {"--mu 1 --toys 0", "--toys"}, {"--mu 1,1", "--mu"},
                {"--mu 1 --count 5", "--json"}, {"--mu 1 --first 3", "--count"},
                {"--mu 1 --toys 2000000000", "memory"}, {"--mu 1 --fix mu=2", "--fix"},
                {"--mu 1 --asimov --count 4 --json x.json", "--asimov"}};
        for (String[] c : cases) {
            String[] opts = c[0].split(" ");
            String[] args = new String[opts.length + 2];
            args[0] = "inject";
            args[1] = m;
            System.arraycopy(opts, 0, args, 2, opts.length);
            Run r = run(args);
            assertEquals(2, r.status(), c[0] + ": " + r.err());
            assertTrue(r.err().strip().lines().count() == 1 && r.err().contains(c[1]), c[0] + ": " + r.err());
        }
    }

    /** --asimov alone: the closure only, every parameter back to its generating value within 1e-6. */
    @Test
    void asimovClosureAlone() throws IOException {
        Path json = inject("closure.json", "--mu", "2", "--asimov");
        JsonNode root = Json.mapper().readTree(json.toFile());
        assertEquals("asimov", root.get("data").asText());
        JsonNode c = root.get("closure");
        assertTrue(c.get("passed").asBoolean());
        assertTrue(c.get("maxDeviation").asDouble() <= 1e-6);
        assertEquals(0, root.get("toys").asInt());
        for (JsonNode p : c.get("parameters")) {
            assertEquals(p.get("generating").asDouble(), p.get("fitted").asDouble(), 1e-6, p.get("name").asText());
        }
    }
}
