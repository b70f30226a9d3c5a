package plumb.engine.model;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import java.util.zip.GZIPInputStream;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class ModelWriterTest {

    private static final ObjectMapper JSON = new ObjectMapper();

    private static Model minimal(double[] yields) {
        Sample s = new Sample("sig", yields, null, null, null);
        Channel c = new Channel("sr", null, null, null, List.of(s));
        return new Model(Model.FORMAT, "tiny", null, null, List.of(c), null, null, null, null);
    }

    private static Model full() {
        Variation v1 = new Variation("lumi", new Variation.NormEffect(0.98, 1.02), null, Interpolation.EXPONENTIAL, null);
        Variation v2 = new Variation("scale", new Variation.NormEffect(0.9, 1.1),
                new Variation.ShapeEffect(new double[] {1, 2}, new double[] {3, 4}), null, Interpolation.LINEAR);
        Sample s = new Sample("signal", new double[] {2, 3}, new double[] {0.1, 0.2}, List.of("mu"), List.of(v1, v2));
        Channel c = new Channel("sr", "m(γγ) [GeV]", new double[] {0, 1, 2}, new double[] {4, 5}, List.of(s));
        List<ParameterSpec> params = List.of(
                new ParameterSpec("mu", 1.0, new double[] {-2, 8}, false, null, true),
                new ParameterSpec("lumi", null, null, null, new ParameterSpec.Gaussian(0.5, 2.0), true),
                new ParameterSpec("scale", 0.0, null, true, null, false));
        Map<String, List<String>> groups = new LinkedHashMap<>();
        groups.put("theory", List.of("scale"));
        groups.put("luminosity", List.of("lumi"));
        Map<String, Object> labels = new LinkedHashMap<>();
        labels.put("mass", 640.0);
        labels.put("detector", "Tamarind");
        ModelOptions options = new ModelOptions(0.01, ModelOptions.McStatConstraint.POISSON, 0.0);
        return new Model(Model.FORMAT, "full", "a test", "mu", List.of(c), params, groups, labels, options);
    }

    private static List<String> keys(JsonNode node) {
        List<String> out = new ArrayList<>();
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) out.add(it.next());
        return out;
    }

    @Test
    void absentOptionalKeysAreLeftOut() throws IOException {
        JsonNode root = JSON.readTree(ModelWriter.toJson(minimal(new double[] {1})));
        assertEquals(List.of("format", "name", "channels"), keys(root));
        assertEquals(List.of("name", "samples"), keys(root.get("channels").get(0)));
        assertEquals(List.of("name", "yields"), keys(root.get("channels").get(0).get("samples").get(0)));
    }

    @Test
    void keysFollowTheOrderOfTheFormatPage() throws IOException {
        JsonNode root = JSON.readTree(ModelWriter.toJson(full()));
        // Order of the tables in docs/model-format.md.
        assertEquals(List.of("format", "name", "description", "poi", "channels", "parameters", "groups", "labels", "options"),
                keys(root));
        JsonNode ch = root.get("channels").get(0);
        assertEquals(List.of("name", "observable", "edges", "observed", "samples"), keys(ch));
        JsonNode s = ch.get("samples").get(0);
        assertEquals(List.of("name", "yields", "mcError", "factors", "variations"), keys(s));
        assertEquals(List.of("parameter", "norm", "shape", "shapeInterpolation"), keys(s.get("variations").get(1)));
        assertEquals("exponential", s.get("variations").get(0).get("normInterpolation").asText());
        assertEquals(List.of("theory", "luminosity"), keys(root.get("groups")));
        assertEquals(List.of("mass", "detector"), keys(root.get("labels")));
        // Defaults are not written: pruneBelow is 0.
        assertEquals(List.of("mcStatThreshold", "mcStatConstraint"), keys(root.get("options")));
        assertEquals("poisson", root.get("options").get("mcStatConstraint").asText());
    }

    @Test
    void parameterEntriesKeepExplicitNullConstraintAndDropAbsentOnes() throws IOException {
        JsonNode params = JSON.readTree(ModelWriter.toJson(full())).get("parameters");
        assertEquals(List.of("name", "value", "range", "fixed", "constraint"), keys(params.get(0)));
        assertTrue(params.get(0).get("constraint").isNull());
        assertEquals(List.of("name", "constraint"), keys(params.get(1)));
        assertEquals("gaussian", params.get(1).get("constraint").get("type").asText());
        assertEquals(2.0, params.get(1).get("constraint").get("width").asDouble());
        assertEquals(List.of("name", "value", "fixed"), keys(params.get(2)));
    }

    @Test
    void doublesRoundTripExactlyAndIntegersHaveNoFraction() throws IOException {
        double[] values = {0, 1, 12, 1e15, 1e20, 0.1, 1.0 / 3.0, Math.PI * 1e-7, 1e-300, Double.MIN_VALUE,
                Double.MAX_VALUE, Math.nextUp(1.0), 123456.789};
        String text = ModelWriter.toJson(minimal(values));
        assertTrue(text.contains("\"yields\": [0, 1, 12, 1000000000000000, "), text);
        JsonNode yields = JSON.readTree(text).get("channels").get(0).get("samples").get(0).get("yields");
        double[] back = new double[yields.size()];
        // Exact: the text of each number is parsed by the JDK, not through Jackson's own conversions.
        for (int i = 0; i < back.length; i++) back[i] = Double.parseDouble(yields.get(i).asText());
        assertArrayEquals(values, back, 0.0);
    }

    @Test
    void negativeZeroKeepsItsSign() throws IOException {
        String text = ModelWriter.toJson(minimal(new double[] {-0.0}));
        JsonNode y = JSON.readTree(text).get("channels").get(0).get("samples").get(0).get("yields").get(0);
        assertEquals(Double.doubleToRawLongBits(-0.0), Double.doubleToRawLongBits(Double.parseDouble(y.asText())));
    }

    @Test
    void nonFiniteNumbersAreRefusedWithTheirPath() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ModelWriter.toJson(minimal(new double[] {1, Double.NaN})));
        assertEquals("channels[0].samples[0].yields[1] is NaN, a model file holds only finite numbers", e.getMessage());
    }

    @Test
    void sameModelSameText() {
        assertEquals(ModelWriter.toJson(full()), ModelWriter.toJson(full()));
    }

    @Test
    void writesPlainAndGzipAndLeavesNoTemporaryFile(@TempDir Path dir) throws IOException {
        Model m = full();
        Path plain = dir.resolve("m.json");
        Files.writeString(plain, "old contents");
        ModelWriter.write(m, plain);
        assertEquals(ModelWriter.toJson(m), Files.readString(plain, StandardCharsets.UTF_8));

        Path gz = dir.resolve("m.json.gz");
        ModelWriter.write(m, gz);
        try (InputStream in = new GZIPInputStream(Files.newInputStream(gz))) {
            assertEquals(ModelWriter.toJson(m), new String(in.readAllBytes(), StandardCharsets.UTF_8));
        }
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of("m.json", "m.json.gz"), files.map(p -> p.getFileName().toString()).sorted().toList());
        }
    }

    @Test
    void writtenFileHasTheUsualPermissionsOfANewFile(@TempDir Path dir) throws IOException {
        // A temporary file made by Files.createTempFile is private (0600); the model file must not be.
        Assumptions.assumeTrue(dir.getFileSystem().supportedFileAttributeViews().contains("posix"));
        Path reference = dir.resolve("reference.txt");
        Files.writeString(reference, "x");
        Path out = dir.resolve("m.json");
        ModelWriter.write(full(), out);
        assertEquals(Files.getPosixFilePermissions(reference), Files.getPosixFilePermissions(out));
    }

    @Test
    void aFolderIsNotReplaced(@TempDir Path dir) throws IOException {
        Path folder = Files.createDirectory(dir.resolve("out.json"));
        IOException e = assertThrows(IOException.class, () -> ModelWriter.write(full(), folder));
        assertEquals(folder + ": is a directory", e.getMessage());
        assertTrue(Files.isDirectory(folder));
    }

    @Test
    void unwritableModelLeavesNoFile(@TempDir Path dir) throws IOException {
        Path out = dir.resolve("bad.json");
        assertThrows(IllegalArgumentException.class, () -> ModelWriter.write(minimal(new double[] {Double.POSITIVE_INFINITY}), out));
        try (Stream<Path> files = Files.list(dir)) {
            assertFalse(files.findAny().isPresent());
        }
    }
}
