package plumb.spark.campaign;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.Main;
import plumb.models.DemoModel;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The commands with --spark local[2] (embedded, in this JVM) against the same commands on
 * threads: the result files must be equal byte for byte (limit files: equal but for the wall
 * time they report). Each command opens and stops its own Spark.
 */
class SparkCampaignTest {

    @TempDir
    static Path dir;

    static Path small, demo, demoHeavy;

    @BeforeAll
    static void models() throws IOException {
        small = dir.resolve("small.json");
        SyntheticModels.generateFile(2, 8, 3, 4, 5, small);
        demo = dir.resolve("demo-640.json");
        try (InputStream in = DemoModel.openStream()) {
            Files.copy(in, demo);
        }
        // A second mass point of the demo scenario for the multi-model limit: signal yields ×0.8.
        ObjectMapper json = new ObjectMapper();
        ObjectNode root = (ObjectNode) json.readTree(demo.toFile());
        ((ObjectNode) root.get("labels")).put("mass", 720);
        for (JsonNode c : root.get("channels")) {
            for (JsonNode s : c.get("samples")) {
                if (!s.get("name").asText().contains("signal")) continue;
                var yields = (com.fasterxml.jackson.databind.node.ArrayNode) s.get("yields");
                for (int b = 0; b < yields.size(); b++) yields.set(b, yields.get(b).asDouble() * 0.8);
            }
        }
        demoHeavy = dir.resolve("demo-720.json");
        json.writeValue(demoHeavy.toFile(), root);
    }

    @AfterEach
    void noInjectedFailure() {
        SparkRunner.failFirstAttemptOf = -1;
    }

    record Run(int status, String out, String err) { }

    static Run run(String... args) {
        StringWriter out = new StringWriter(), err = new StringWriter();
        int status = Main.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(status, out.toString(), err.toString());
    }

    /** Runs the command twice, on threads and with --spark local[2]; returns both result files. */
    static byte[][] threadsAndSpark(String name, String... args) throws IOException {
        Path threads = dir.resolve(name + "-threads.json"), spark = dir.resolve(name + "-spark.json");
        Run t = run(with(args, "--threads", "2", "--json", threads.toString()));
        assertEquals(0, t.status(), t.err());
        Run s = run(with(args, "--spark", "local[2]", "--json", spark.toString()));
        assertEquals(0, s.status(), s.err());
        // The terminal output too, but for file names and wall times.
        assertEquals(t.out().replace(threads.toString(), "F").replaceAll("[0-9.]+ s\\)", "T s)"),
                s.out().replace(spark.toString(), "F").replaceAll("[0-9.]+ s\\)", "T s)"));
        return new byte[][] {Files.readAllBytes(threads), Files.readAllBytes(spark)};
    }

    static String[] with(String[] args, String... more) {
        List<String> all = new ArrayList<>(List.of(args));
        all.addAll(List.of(more));
        return all.toArray(new String[0]);
    }

    @Test
    void injectionOf400ToysEqualsTheThreadRunByteForByte() throws IOException {
        byte[][] r = threadsAndSpark("inject", "inject", small.toString(), "--mu", "1,2", "--toys", "400", "--seed", "11");
        assertArrayEquals(r[0], r[1]);
        JsonNode root = new ObjectMapper().readTree(r[1]);
        assertEquals(400, root.get("injections").get(0).get("toys").asInt());
    }

    @Test
    void aTaskThatFailsOnceIsRetriedAndTheOutputIsUnchanged() throws IOException {
        int before = SparkRunner.INJECTED.get();
        SparkRunner.failFirstAttemptOf = 3;
        byte[][] r = threadsAndSpark("retry", "inject", small.toString(), "--mu", "1", "--toys", "400", "--seed", "11");
        assertEquals(1, SparkRunner.INJECTED.get() - before, "exactly one injected failure, then a retry");
        assertArrayEquals(r[0], r[1]);
    }

    @Test
    void toyLimitsEqualTheThreadRun() throws IOException {
        byte[][] r = threadsAndSpark("toylimit", "limit", demo.toString(), "--toys", "60", "--seed", "5");
        JsonNode t = withoutTime(r[0]), s = withoutTime(r[1]);
        assertEquals(t, s);
        assertTrue(t.get("clsPoints").size() >= 3, "CLs at several μ compared");
    }

    @Test
    void limitsOfTwoModelsEqualTheThreadRun() throws IOException {
        byte[][] r = threadsAndSpark("multi", "limit", demo.toString(), demoHeavy.toString());
        JsonNode t = withoutTime(r[0]), s = withoutTime(r[1]);
        assertEquals(t, s);
        assertEquals(2, s.get("points").size());
        assertTrue(s.get("points").get(1).get("expected").get("median").asDouble() > 0);
    }

    @Test
    void discoveryAndGofToysAndImpactsEqualTheThreadRun() throws IOException {
        byte[][] d = threadsAndSpark("discovery", "discovery", demo.toString(), "--toys", "200", "--seed", "3");
        assertArrayEquals(d[0], d[1]);
        byte[][] g = threadsAndSpark("gof", "gof", small.toString(), "--toys", "200", "--seed", "3");
        assertArrayEquals(g[0], g[1]);
        byte[][] i = threadsAndSpark("impacts", "impacts", small.toString());
        assertArrayEquals(i[0], i[1]);
    }

    /** A limit result file without its wall times. */
    static JsonNode withoutTime(byte[] file) throws IOException {
        JsonNode root = new ObjectMapper().readTree(file);
        strip(root);
        return root;
    }

    private static void strip(JsonNode n) {
        if (n.isObject()) {
            ((ObjectNode) n).remove("seconds");
            for (Iterator<JsonNode> it = n.elements(); it.hasNext(); ) strip(it.next());
        } else if (n.isArray()) {
            for (JsonNode c : n) strip(c);
        }
    }
}
