package plumb.engine.model;

import org.junit.jupiter.api.Test;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * No input makes the model reader and validator do anything but return a valid model or throw
 * a {@link ModelException} with a one-line message: no other exception, no parser internals.
 * Every run replays the seed inputs kept in {@code ModelReaderJazzerTestInputs/} (shared with the
 * coverage-guided {@link ModelReaderJazzerTest}) and makes a few thousand random byte and token
 * mutations of valid models; {@code -Dplumb.fuzz.trials=N} runs N mutations instead.
 */
class ModelReaderFuzzTest {

    @Test
    void seedInputs() throws Exception {
        java.nio.file.Path dir = java.nio.file.Path.of(getClass().getResource("ModelReaderJazzerTestInputs/readerAndValidator").toURI());
        int n = 0;
        try (var files = java.nio.file.Files.list(dir)) {
            for (java.nio.file.Path f : (Iterable<java.nio.file.Path>) files::iterator) {
                check(java.nio.file.Files.readAllBytes(f));
                n++;
            }
        }
        assertTrue(n >= 5, "seed inputs found: " + n);
    }

    /** The property: a valid model (one the compiler takes) or a one-line ModelException. */
    static void check(byte[] input) {
        try {
            Model m = ModelReader.read(new ByteArrayInputStream(input), "fuzz");
            assertNotNull(m.name());
            assertNotNull(plumb.engine.compile.ModelCompiler.compile(m), "a valid model compiles");
        } catch (ModelException e) {
            String msg = e.getMessage();
            assertTrue(msg.startsWith("fuzz: "), msg);
            assertFalse(msg.contains("\n") || msg.contains("\r"), msg);
            // Parser internals (Jackson's location dump) must not leak; a message may still echo
            // the user's own key, so a marker the input itself holds is not a leak.
            String raw = new String(input, StandardCharsets.ISO_8859_1);
            for (String internal : new String[] {"[Source", "StreamReadFeature", "reference chain"}) {
                assertFalse(msg.contains(internal) && !raw.contains(internal), msg);
            }
        }
    }

    /** Tokens that make JSON and models break in interesting ways. */
    private static final String[] TOKENS = {"{", "}", "[", "]", ",", ":", "\"", "null", "true", "-1", "0", "1e999",
            "NaN", "\"\\u0000\"", "\"mu\"", "\"channels\"", "\"samples\"", "\"yields\"", "\"observed\"", "[]", "{}", "\\",
            "\"edges\"", "\"variations\"", "\"norm\"", "\"parameters\"", "1e-320", "-0", "9999999999999999999999"};

    @Test
    void mutationsOfValidModels() {
        byte[] base = ModelJsonFixtures.BASE.getBytes(StandardCharsets.UTF_8);
        Random r = new Random(20261203);
        int trials = Integer.getInteger("plumb.fuzz.trials", 3000);
        for (int trial = 0; trial < trials; trial++) {
            byte[] b = base.clone();
            int edits = 1 + r.nextInt(4);
            for (int e = 0; e < edits; e++) {
                switch (r.nextInt(4)) {
                    case 0 -> b[r.nextInt(b.length)] = (byte) r.nextInt(256);
                    case 1 -> b = splice(b, r.nextInt(b.length), r.nextInt(20), new byte[0]);
                    case 2 -> b = splice(b, r.nextInt(b.length), r.nextInt(3),
                            TOKENS[r.nextInt(TOKENS.length)].getBytes(StandardCharsets.UTF_8));
                    default -> b = java.util.Arrays.copyOf(b, r.nextInt(b.length));
                }
            }
            check(b);
        }
    }

    private static byte[] splice(byte[] b, int at, int remove, byte[] insert) {
        int cut = Math.min(remove, b.length - at);
        byte[] out = new byte[b.length - cut + insert.length];
        System.arraycopy(b, 0, out, 0, at);
        System.arraycopy(insert, 0, out, at, insert.length);
        System.arraycopy(b, at + cut, out, at + insert.length, b.length - at - cut);
        return out;
    }
}
