package plumb.engine.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Reading model files: the parsed values of a valid model, gzip, and the refusals of
 * docs/model-format.md that concern the text rather than a rule between values (duplicate keys,
 * NaN and Infinity literals, text that is not JSON) plus the input limits.
 */
class ModelReaderTest {

    @TempDir
    Path dir;

    @Test
    void validModelKeepsEveryValue() {
        Model m = ModelReader.parse(ModelJsonFixtures.BASE, "base.json");
        assertEquals(Model.FORMAT, m.format());
        assertEquals("diphoton-1500", m.name());
        assertEquals("narrow resonance over a falling two-photon background", m.description());
        assertEquals("mu", m.poi());
        assertEquals(2, m.channels().size());

        Channel sr = m.channels().get(0);
        assertEquals("sr", sr.name());
        assertEquals("m(γγ) [GeV]", sr.observable());
        assertArrayEquals(new double[] {1400, 1450, 1500, 1550}, sr.edges());
        assertArrayEquals(new double[] {104, 131, 66}, sr.observed());
        assertEquals(3, sr.bins());
        Sample signal = sr.samples().get(0);
        assertEquals("signal", signal.name());
        assertArrayEquals(new double[] {5, 20, 4}, signal.yields());
        assertArrayEquals(new double[] {0.5, 1, 0.4}, signal.mcError());
        assertEquals(List.of("mu"), signal.factors());
        Variation lumi = signal.variations().get(0);
        assertEquals("lumi", lumi.parameter());
        assertEquals(new Variation.NormEffect(0.98, 1.02), lumi.norm());
        assertNull(lumi.shape());
        assertNull(lumi.normInterpolation());                 // absent: the default applies
        assertEquals(Interpolation.SMOOTH, lumi.normMode());
        Sample background = sr.samples().get(1);
        assertEquals(Interpolation.EXPONENTIAL, background.variations().get(0).normInterpolation());
        Variation scale = background.variations().get(1);
        assertNull(scale.norm());
        assertArrayEquals(new double[] {102, 79, 58}, scale.shape().down());
        assertArrayEquals(new double[] {98, 81, 62}, scale.shape().up());
        assertEquals(Interpolation.LINEAR, scale.shapeMode());

        Channel cr = m.channels().get(1);
        assertNull(cr.edges());
        assertEquals(2, cr.bins());
        assertFalse(cr.blinded());
        assertNull(cr.samples().get(0).mcError());
        assertTrue(cr.samples().get(0).variations().isEmpty());

        List<ParameterSpec> p = m.parameters();
        assertEquals(5, p.size());
        assertEquals(1.0, p.get(0).value());
        assertArrayEquals(new double[] {-2, 20}, p.get(0).range());
        assertNull(p.get(0).fixed());
        assertFalse(p.get(0).constraintGiven());
        assertEquals(new ParameterSpec.Poisson(0.1), p.get(1).constraint());
        assertEquals(new ParameterSpec.Gaussian(0.0, 1.0), p.get(2).constraint());
        assertEquals("mcstat:sr:0", p.get(3).name());
        assertEquals(Boolean.TRUE, p.get(3).fixed());
        assertNull(p.get(3).value());
        assertNull(p.get(4).constraint());                      // "constraint": null, a free parameter
        assertTrue(p.get(4).constraintGiven());

        assertEquals(List.of("theory", "luminosity", "mcStatistics"), List.copyOf(m.groups().keySet()));
        assertEquals(List.of("mcstat:sr:0", "mcstat:sr:1"), m.groups().get("mcStatistics"));
        assertEquals(Map.of("mass", 1500.0, "detector", "fictional"), m.labels());
        assertEquals(new ModelOptions(0.01, ModelOptions.McStatConstraint.POISSON, 0.001), m.options());
    }

    @Test
    void minimalModelTakesDefaults() {
        Model m = ModelReader.parse("""
                {"format": "plumb-model/1", "name": "m",
                 "channels": [{"name": "c", "samples": [{"name": "s", "yields": [1, 2]}]}]}
                """, null);
        assertNull(m.poi());
        assertTrue(m.channels().get(0).blinded());
        assertEquals(2, m.channels().get(0).bins());
        assertTrue(m.parameters().isEmpty());
        assertTrue(m.groups().isEmpty());
        assertTrue(m.labels().isEmpty());
        assertEquals(ModelOptions.DEFAULTS, m.options());
    }

    @Test
    void readsPlainFile() throws IOException {
        Path file = dir.resolve("model.json");
        Files.writeString(file, ModelJsonFixtures.BASE, StandardCharsets.UTF_8);
        assertEquals("m(γγ) [GeV]", ModelReader.read(file).channels().get(0).observable());
    }

    @ParameterizedTest
    @CsvSource({"model.json.gz", "model.json", "model"})
    void readsGzipByMagicBytesWhateverTheName(String name) throws IOException {
        Path file = dir.resolve(name);
        gzip(file, ModelJsonFixtures.BASE.getBytes(StandardCharsets.UTF_8));
        Model m = ModelReader.read(file);
        assertEquals("diphoton-1500", m.name());
        assertArrayEquals(new double[] {1000, 900}, m.channels().get(1).samples().get(0).yields());
    }

    @Test
    void plainTextNamedGzIsReadAsPlainText() throws IOException {
        Path file = dir.resolve("model.json.gz");
        Files.writeString(file, ModelJsonFixtures.BASE, StandardCharsets.UTF_8);
        assertEquals("diphoton-1500", ModelReader.read(file).name());
    }

    @Test
    void errorsFromAFileNameTheFile() throws IOException {
        Path file = dir.resolve("bad.json");
        Files.writeString(file, ModelJsonFixtures.edited("/channels/0/samples/0/yields/2", "-3"));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.read(file));
        assertEquals(file + ": channels[0].samples[0].yields[2]: -3.0, must be >= 0", e.getMessage());
        assertEquals(file.toString(), e.file());
    }

    @Test
    void missingFileIsAModelError() {
        Path file = dir.resolve("absent.json");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.read(file));
        assertEquals(file + ": cannot read: no such file", e.getMessage());
    }

    @Test
    void truncatedGzipIsAModelError() throws IOException {
        Path whole = dir.resolve("whole.gz");
        gzip(whole, ModelJsonFixtures.BASE.getBytes(StandardCharsets.UTF_8));
        byte[] bytes = Files.readAllBytes(whole);
        Path cut = dir.resolve("cut.json.gz");
        Files.write(cut, java.util.Arrays.copyOf(bytes, bytes.length / 2));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.read(cut));
        assertTrue(e.getMessage().startsWith(cut + ": cannot read: broken gzip data ("), e.getMessage());
    }

    @Test
    void directoryIsAModelError() {
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.read(dir));
        assertTrue(e.getMessage().startsWith(dir + ": cannot read: "), e.getMessage());
        assertFalse(e.getMessage().contains("\n"), e.getMessage());
    }

    @Test
    void plainFileAboveTheSizeCapIsRefusedUnread() throws IOException {
        Path file = dir.resolve("model.json");
        Files.writeString(file, ModelJsonFixtures.BASE);
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.read(file, 1000));
        assertEquals(file + ": larger than 1000 bytes (uncompressed), refused", e.getMessage());
    }

    @Test
    void gzipThatExpandsBeyondTheCapIsRefused() throws IOException {
        // a small compressed file of 1 MB of spaces: the cap counts the gunzipped bytes
        Path file = dir.resolve("bomb.json.gz");
        byte[] text = (" ".repeat(1 << 20) + ModelJsonFixtures.BASE).getBytes(StandardCharsets.UTF_8);
        gzip(file, text);
        assertTrue(Files.size(file) < 100_000);
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.read(file, 100_000));
        assertEquals(file + ": larger than 100000 bytes (uncompressed), refused", e.getMessage());
        assertEquals("diphoton-1500", ModelReader.read(file, 2 << 20).name());   // under a larger cap it reads
    }

    @Test
    void duplicateKeyNamesItsPath() {
        String json = ModelJsonFixtures.BASE.replace("\"name\": \"diphoton-1500\",",
                "\"name\": \"diphoton-1500\", \"name\": \"again\",");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertEquals("name", e.path());
        assertEquals("m.json: name: duplicate key, a key may appear once per object", e.getMessage());
    }

    @Test
    void nestedDuplicateKeyNamesItsPath() {
        String json = ModelJsonFixtures.BASE.replace("{\"down\": 0.98, \"up\": 1.02}}\n",
                "{\"down\": 0.98, \"up\": 1.02, \"up\": 1.03}}\n");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertEquals("channels[0].samples[0].variations[0].norm.up", e.path());
    }

    @Test
    void duplicateLabelKeyIsRefused() {
        String json = ModelJsonFixtures.BASE.replace("\"mass\": 1500,", "\"mass\": 1500, \"mass\": 1600,");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertEquals("labels.mass", e.path());
    }

    @Test
    void nanLiteralIsNotJsonAndNamesLineAndColumn() {
        String json = "{\n  \"format\": \"plumb-model/1\",\n  \"name\": NaN\n}";
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        // line 3 holds `  "name": NaN`; Jackson reports where it stopped reading, just past the literal
        assertEquals("m.json: line 3, column 14: not JSON: Non-standard token 'NaN'", e.getMessage());
        assertEquals("", e.path());
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {"NaN", "Infinity", "-Infinity"})
    void nonNumericLiteralsInDataAreNotJson(String literal) {
        String json = ModelJsonFixtures.BASE.replace("\"observed\": [104, 131, 66]", "\"observed\": [104, " + literal + ", 66]");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        // line 11 is `      "observed": [104, NaN, 66],`: the literal starts in column 25, reported just past it
        assertEquals("m.json: line 11, column " + (25 + literal.length()) + ": not JSON: Non-standard token '"
                + literal + "'", e.getMessage());
    }

    @ParameterizedTest
    @CsvSource({"0.1", "1e-7", "2.2250738585072011e-308", "4.9e-324", "1.7976931348623157e308",
            "9007199254740993", "0.30000000000000004", "123456789012345678901234567890", "1.00000000000000011102230246251565404"})
    void numbersParseToTheSameDoubleAsTheJdk(String literal) {
        // reference: Double.parseDouble, correctly rounded (JLS / Double.valueOf javadoc); the
        // reader uses Jackson's fast parser, which must agree bit for bit
        String json = ModelJsonFixtures.BASE.replace("\"mass\": 1500", "\"mass\": " + literal);
        Object mass = ModelReader.parse(json, "m.json").labels().get("mass");
        assertEquals(Double.doubleToRawLongBits(Double.parseDouble(literal)), Double.doubleToRawLongBits((Double) mass));
    }

    @Test
    void numberBeyondDoubleRangeIsRefusedAtItsPath() {
        String json = ModelJsonFixtures.BASE.replace("\"edges\": [1400,", "\"edges\": [1e400,");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertEquals("m.json: channels[0].edges[0]: 1e400, expected a finite number (beyond the range of a double)",
                e.getMessage());
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
            // trailing comma, comment, single quotes, unquoted key, cut short, content after the end
            "\"edges\": [1400, 1450, 1500, 1550]|\"edges\": [1400, 1450, 1500, 1550,]|10",
            "\"edges\": [1400, 1450, 1500, 1550]|\"edges\": /* GeV */ [1400, 1450, 1500, 1550]|10",
            "\"observable\": \"m(γγ) [GeV]\"|\"observable\": 'm(γγ) [GeV]'|9",
            "\"observable\": \"m(γγ) [GeV]\"|observable: \"m(γγ) [GeV]\"|9"})
    void textThatIsNotJsonNamesTheLine(String from, String to, int line) {
        String json = ModelJsonFixtures.BASE.replace(from, to);
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertTrue(e.getMessage().startsWith("m.json: line " + line + ", column "), e.getMessage());
        assertTrue(e.getMessage().contains(": not JSON: "), e.getMessage());
        assertFalse(e.getMessage().contains("Feature"), e.getMessage());  // no advice to relax the parser
    }

    @Test
    void truncatedTextIsNotJson() {
        String json = ModelJsonFixtures.BASE.substring(0, ModelJsonFixtures.BASE.indexOf("\"parameters\""));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertTrue(e.getMessage().contains(": not JSON: "), e.getMessage());
    }

    @Test
    void truncatedTextAtAnyPointGivesLineAndColumnButNoParserInternals() {
        String json = ModelJsonFixtures.BASE;
        for (int cut = 1; cut < json.length(); cut += 7) {
            String head = json.substring(0, cut);
            ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(head, "m.json"));
            String msg = e.getMessage();
            if (!msg.contains("not JSON")) continue;   // a cut after a complete value may break a rule instead
            assertTrue(msg.matches("m\\.json: line \\d+, column \\d+: not JSON: .*"), msg);
            for (String internal : new String[] {"Source", "REDACTED", "StreamReadFeature", "`", "\n"}) {
                assertFalse(msg.contains(internal), msg);
            }
        }
        ModelException open = assertThrows(ModelException.class, () -> ModelReader.parse("{\n", "m.json"));
        assertEquals("m.json: line 2, column 1: not JSON: unexpected end of file: expected close marker for Object "
                + "(opened at line 1, column 1)", open.getMessage());
    }

    @Test
    void readsANamedPipe() throws Exception {
        // a pipe cannot seek: before, the channel stream of Files.newInputStream failed with "Illegal seek"
        Path fifo = dir.resolve("model.fifo");
        assumeTrue(new ProcessBuilder("mkfifo", fifo.toString()).start().waitFor() == 0, "mkfifo available");
        Thread writer = new Thread(() -> {
            try (OutputStream out = Files.newOutputStream(fifo)) {
                out.write(ModelJsonFixtures.BASE.getBytes(StandardCharsets.UTF_8));
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        });
        writer.start();
        Model m = ModelReader.read(fifo);
        writer.join(10_000);
        assertEquals("diphoton-1500", m.name());
    }

    @Test
    void readsAStreamPlainOrGzipped() throws IOException {
        byte[] text = ModelJsonFixtures.BASE.getBytes(StandardCharsets.UTF_8);
        assertEquals("diphoton-1500", ModelReader.read(new java.io.ByteArrayInputStream(text), "standard input").name());
        java.io.ByteArrayOutputStream zipped = new java.io.ByteArrayOutputStream();
        try (GZIPOutputStream z = new GZIPOutputStream(zipped)) {
            z.write(text);
        }
        assertEquals("diphoton-1500",
                ModelReader.read(new java.io.ByteArrayInputStream(zipped.toByteArray()), "standard input").name());
        ModelException e = assertThrows(ModelException.class,
                () -> ModelReader.read(new java.io.ByteArrayInputStream(new byte[] {'{'}), "standard input"));
        assertTrue(e.getMessage().startsWith("standard input: line 1, column 2: not JSON"), e.getMessage());
    }

    @Test
    void contentAfterTheModelIsRefused() {
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(ModelJsonFixtures.BASE + "{}", "m.json"));
        assertTrue(e.getMessage().startsWith("m.json: line "), e.getMessage());
        assertTrue(e.getMessage().endsWith("not JSON: more content after the end of the model"), e.getMessage());
    }

    @Test
    void emptyTextIsRefused() {
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse("  \n", "m.json"));
        assertEquals("m.json: empty file, expected a JSON object", e.getMessage());
    }

    @Test
    void deepNestingIsRefusedWithoutExhaustingTheStack() {
        // 100000 nested arrays where a label value belongs; refused at the first level, never built
        String json = ModelJsonFixtures.BASE.replace("\"mass\": 1500", "\"mass\": " + "[".repeat(100_000) + "]".repeat(100_000));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertEquals("m.json: labels.mass: expected a number or a string, found an array", e.getMessage());
    }

    @Test
    void parserRefusesNestingBeyondTheCap() throws IOException {
        // the grammar refuses a misplaced array at its first token, so no model text reaches the
        // nesting cap; this checks the backstop itself on the reader's parser configuration
        assertEquals(ModelReader.MAX_DEPTH, countTokens("[".repeat(ModelReader.MAX_DEPTH) + "]".repeat(ModelReader.MAX_DEPTH)) / 2);
        com.fasterxml.jackson.core.exc.StreamConstraintsException e = assertThrows(
                com.fasterxml.jackson.core.exc.StreamConstraintsException.class,
                () -> countTokens("[".repeat(ModelReader.MAX_DEPTH + 1) + "]".repeat(ModelReader.MAX_DEPTH + 1)));
        assertTrue(e.getOriginalMessage().contains("nesting depth"), e.getOriginalMessage());
    }

    private static int countTokens(String json) throws IOException {
        int n = 0;
        try (com.fasterxml.jackson.core.JsonParser p = ModelReader.JSON.createParser(json)) {
            while (p.nextToken() != null) n++;
        }
        return n;
    }

    @Test
    void hugeStringIsRefusedByTheLimit() {
        String json = ModelJsonFixtures.BASE.replace("\"narrow resonance", "\"" + "x".repeat(ModelReader.MAX_STRING + 1));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertTrue(e.getMessage().contains("input limit exceeded: String value length"), e.getMessage());
        assertTrue(e.getMessage().startsWith("m.json: line 4, column "), e.getMessage());
        assertFalse(e.getMessage().contains("StreamReadConstraints"), e.getMessage());
    }

    @Test
    void hugeKeyIsRefusedByTheLimit() {
        String json = ModelJsonFixtures.BASE.replace("\"mass\"", "\"" + "k".repeat(ModelReader.MAX_KEY + 1) + "\"");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertTrue(e.getMessage().contains("input limit exceeded: Name length"), e.getMessage());
    }

    @Test
    void longNumberIsRefusedByTheLimit() {
        String json = ModelJsonFixtures.BASE.replace("\"mass\": 1500", "\"mass\": 1" + "0".repeat(ModelReader.MAX_NUMBER));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, "m.json"));
        assertTrue(e.getMessage().contains("input limit exceeded: Number value length"), e.getMessage());
    }

    private static void gzip(Path file, byte[] content) throws IOException {
        try (OutputStream out = new GZIPOutputStream(Files.newOutputStream(file))) {
            out.write(content);
        }
    }
}
