package plumb.engine.model;

import com.fasterxml.jackson.core.JsonEncoding;
import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.PrettyPrinter;
import com.fasterxml.jackson.core.StreamWriteFeature;

import java.io.IOException;
import java.io.OutputStream;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.security.SecureRandom;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.zip.GZIPOutputStream;

/**
 * Writes a {@link Model} as a model file (docs/model-format.md): pretty-printed, keys in the order
 * of the format page, absent optional keys left out, so that writing is stable (same model, same
 * bytes). Doubles are written in their shortest form that parses back to the same value; integral
 * values without a fraction ({@code 12}, not {@code 12.0}).
 *
 * <p>Jackson's streaming generator does the escaping and number formatting; only the layout (short
 * arrays of numbers or names on one line, objects one key per line) is ours.
 */
public final class ModelWriter {

    /** Largest magnitude below which every integral double is exactly a long (2^53). */
    private static final double EXACT_LONG_LIMIT = 9.007199254740992E15;

    /**
     * Jackson's Schubfach double writer: the shortest decimal that reads back to the same double,
     * in Double.toString's layout, several times faster than Double.toString on this Java (a
     * generated model holds tens of millions of numbers).
     */
    private static final JsonFactory FACTORY = JsonFactory.builder().enable(StreamWriteFeature.USE_FAST_DOUBLE_WRITER).build();

    /** Suffixes of temporary file names. */
    private static final SecureRandom RANDOM = new SecureRandom();

    private ModelWriter() {
    }

    /**
     * The model as pretty JSON text, ending with a newline.
     *
     * @throws IllegalArgumentException if a number is NaN or infinite (JSON cannot hold it)
     */
    public static String toJson(Model m) {
        StringWriter out = new StringWriter();
        try {
            write(m, out);
        } catch (IOException e) {
            throw new UncheckedIOException(e); // a StringWriter does not fail
        }
        return out.toString();
    }

    /**
     * Writes the model to {@code file}, gzip-compressed when the name ends in {@code .json.gz}. The
     * text goes to a temporary file in the same folder, which is then renamed over {@code file}, so
     * a reader never sees a partial file and a failure leaves no file behind.
     *
     * @throws IOException              if the folder cannot be written, or {@code file} is a folder
     * @throws IllegalArgumentException if a number is NaN or infinite
     */
    public static void write(Model m, Path file) throws IOException {
        Path target = file.toAbsolutePath();
        Path dir = target.getParent();
        String name = target.getFileName().toString();
        // REPLACE_EXISTING would silently replace an empty folder.
        if (Files.isDirectory(target)) throw new IOException(file + ": is a directory");
        Path tmp = null;
        try {
            OutputStream raw = null;
            // Not Files.createTempFile: its files are private (0600); a model file gets the usual
            // permissions of a new file. CREATE_NEW with a random suffix never reuses a name.
            while (raw == null) {
                tmp = dir.resolve("." + name + "." + Long.toHexString(RANDOM.nextLong()) + ".tmp");
                try {
                    raw = Files.newOutputStream(tmp, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE);
                } catch (FileAlreadyExistsException e) {
                    tmp = null;
                }
            }
            // Formatted straight into the temporary file, which a failure deletes below.
            try (OutputStream stream = raw;
                 OutputStream out = name.endsWith(".json.gz") ? new GZIPOutputStream(stream, 1 << 16) : stream) {
                write(m, out);
            }
            try {
                Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            if (tmp != null) Files.deleteIfExists(tmp); // no-op after a successful move
        }
    }

    private static void write(Model m, Writer out) throws IOException {
        try (JsonGenerator g = FACTORY.createGenerator(out)) {
            write(m, g);
        }
    }

    /**
     * Writes the model's text, UTF-8, to {@code out} as it is formatted (no copy of the whole text
     * in memory: a generated model of tens of millions of numbers is hundreds of megabytes), and
     * leaves the stream open. The caller owns the file: a number that cannot be written (NaN)
     * fails part-way, so write to a temporary file and rename it, as {@link #write(Model, Path)}
     * does.
     *
     * @throws IllegalArgumentException if a number is NaN or infinite
     */
    public static void write(Model m, OutputStream out) throws IOException {
        try (JsonGenerator g = FACTORY.createGenerator(out, JsonEncoding.UTF8)) {
            g.disable(JsonGenerator.Feature.AUTO_CLOSE_TARGET);
            write(m, g);
        }
    }

    private static void write(Model m, JsonGenerator g) throws IOException {
        Layout layout = new Layout();
        {
            g.setPrettyPrinter(layout);
            g.writeStartObject();
            g.writeStringField("format", m.format());
            g.writeStringField("name", m.name());
            if (m.description() != null) g.writeStringField("description", m.description());
            if (m.poi() != null) g.writeStringField("poi", m.poi());
            g.writeFieldName("channels");
            layout.flip();
            g.writeStartArray();
            for (int c = 0; c < m.channels().size(); c++) {
                writeChannel(g, layout, m.channels().get(c), "channels[" + c + "]");
            }
            g.writeEndArray();
            if (!m.parameters().isEmpty()) {
                g.writeFieldName("parameters");
                layout.flip();
                g.writeStartArray();
                for (int p = 0; p < m.parameters().size(); p++) {
                    writeParameter(g, layout, m.parameters().get(p), "parameters[" + p + "]");
                }
                g.writeEndArray();
            }
            if (!m.groups().isEmpty()) {
                g.writeFieldName("groups");
                g.writeStartObject();
                for (Map.Entry<String, List<String>> e : m.groups().entrySet()) {
                    g.writeFieldName(e.getKey());
                    writeNames(g, e.getValue());
                }
                g.writeEndObject();
            }
            if (!m.labels().isEmpty()) {
                g.writeFieldName("labels");
                g.writeStartObject();
                for (Map.Entry<String, Object> e : m.labels().entrySet()) {
                    g.writeFieldName(e.getKey());
                    Object v = e.getValue();
                    if (v instanceof Number n) number(g, n.doubleValue(), "labels." + e.getKey());
                    else g.writeString(String.valueOf(v));
                }
                g.writeEndObject();
            }
            writeOptions(g, m.options());
            g.writeEndObject();
            g.writeRaw('\n');
        }
    }

    private static void writeChannel(JsonGenerator g, Layout layout, Channel ch, String path) throws IOException {
        g.writeStartObject();
        g.writeStringField("name", ch.name());
        if (ch.observable() != null) g.writeStringField("observable", ch.observable());
        if (ch.edges() != null) numbers(g, "edges", ch.edges(), path);
        if (ch.observed() != null) numbers(g, "observed", ch.observed(), path);
        g.writeFieldName("samples");
        layout.flip();
        g.writeStartArray();
        for (int s = 0; s < ch.samples().size(); s++) {
            writeSample(g, layout, ch.samples().get(s), path + ".samples[" + s + "]");
        }
        g.writeEndArray();
        g.writeEndObject();
    }

    private static void writeSample(JsonGenerator g, Layout layout, Sample s, String path) throws IOException {
        g.writeStartObject();
        g.writeStringField("name", s.name());
        numbers(g, "yields", s.yields(), path);
        if (s.mcError() != null) numbers(g, "mcError", s.mcError(), path);
        if (!s.factors().isEmpty()) {
            g.writeFieldName("factors");
            writeNames(g, s.factors());
        }
        if (s.binFactors() != null) g.writeStringField("binFactors", s.binFactors());
        if (!s.variations().isEmpty()) {
            g.writeFieldName("variations");
            layout.flip();
            g.writeStartArray();
            for (int v = 0; v < s.variations().size(); v++) {
                writeVariation(g, layout, s.variations().get(v), path + ".variations[" + v + "]");
            }
            g.writeEndArray();
        }
        g.writeEndObject();
    }

    private static void writeVariation(JsonGenerator g, Layout layout, Variation v, String path) throws IOException {
        g.writeStartObject();
        g.writeStringField("parameter", v.parameter());
        if (v.norm() != null) {
            g.writeFieldName("norm");
            layout.flip();
            g.writeStartObject();
            g.writeFieldName("down");
            number(g, v.norm().down(), path + ".norm.down");
            g.writeFieldName("up");
            number(g, v.norm().up(), path + ".norm.up");
            g.writeEndObject();
        }
        if (v.shape() != null) {
            g.writeFieldName("shape");
            g.writeStartObject();
            numbers(g, "down", v.shape().down(), path + ".shape");
            numbers(g, "up", v.shape().up(), path + ".shape");
            g.writeEndObject();
        }
        if (v.normInterpolation() != null) g.writeStringField("normInterpolation", v.normInterpolation().jsonName());
        if (v.shapeInterpolation() != null) g.writeStringField("shapeInterpolation", v.shapeInterpolation().jsonName());
        g.writeEndObject();
    }

    private static void writeParameter(JsonGenerator g, Layout layout, ParameterSpec p, String path) throws IOException {
        g.writeStartObject();
        g.writeStringField("name", p.name());
        if (p.value() != null) {
            g.writeFieldName("value");
            number(g, p.value(), path + ".value");
        }
        if (p.range() != null) numbers(g, "range", p.range(), path);
        if (p.fixed() != null) g.writeBooleanField("fixed", p.fixed());
        if (p.constraint() != null) {
            g.writeFieldName("constraint");
            layout.flip();
            g.writeStartObject();
            if (p.constraint() instanceof ParameterSpec.Gaussian gauss) {
                g.writeStringField("type", "gaussian");
                if (gauss.center() != null) {
                    g.writeFieldName("center");
                    number(g, gauss.center(), path + ".constraint.center");
                }
                if (gauss.width() != null) {
                    g.writeFieldName("width");
                    number(g, gauss.width(), path + ".constraint.width");
                }
            } else if (p.constraint() instanceof ParameterSpec.Poisson poisson) {
                g.writeStringField("type", "poisson");
                g.writeFieldName("relative");
                number(g, poisson.relative(), path + ".constraint.relative");
            }
            g.writeEndObject();
        } else if (p.constraintGiven()) {
            g.writeNullField("constraint"); // an explicit null: the parameter is free
        }
        g.writeEndObject();
    }

    /** Only the options that differ from the format's defaults; none at all when all are defaults. */
    private static void writeOptions(JsonGenerator g, ModelOptions o) throws IOException {
        ModelOptions d = ModelOptions.DEFAULTS;
        boolean threshold = Double.compare(o.mcStatThreshold(), d.mcStatThreshold()) != 0;
        boolean constraint = o.mcStatConstraint() != null && o.mcStatConstraint() != d.mcStatConstraint();
        boolean prune = Double.compare(o.pruneBelow(), d.pruneBelow()) != 0;
        if (!threshold && !constraint && !prune) return;
        g.writeFieldName("options");
        g.writeStartObject();
        if (threshold) {
            g.writeFieldName("mcStatThreshold");
            number(g, o.mcStatThreshold(), "options.mcStatThreshold");
        }
        if (constraint) g.writeStringField("mcStatConstraint", o.mcStatConstraint().jsonName());
        if (prune) {
            g.writeFieldName("pruneBelow");
            number(g, o.pruneBelow(), "options.pruneBelow");
        }
        g.writeEndObject();
    }

    private static void writeNames(JsonGenerator g, List<String> names) throws IOException {
        g.writeStartArray();
        for (int i = 0; i < names.size(); i++) g.writeString(names.get(i));
        g.writeEndArray();
    }

    private static void numbers(JsonGenerator g, String key, double[] values, String path) throws IOException {
        g.writeFieldName(key);
        g.writeStartArray();
        for (int i = 0; i < values.length; i++) {
            // The path is built only for the error: big models hold millions of numbers.
            if (!Double.isFinite(values[i])) number(g, values[i], path + "." + key + "[" + i + "]");
            number(g, values[i], null);
        }
        g.writeEndArray();
    }

    /**
     * Integral values as integers; others through Jackson, which writes the shortest decimal that
     * parses back to the same double. -0.0 stays a double so that its sign survives.
     */
    private static void number(JsonGenerator g, double x, String path) throws IOException {
        if (!Double.isFinite(x)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "%s is %s, a model file holds only finite numbers", path, x));
        }
        if (x == Math.rint(x) && Math.abs(x) < EXACT_LONG_LIMIT
                && !(x == 0.0 && Double.doubleToRawLongBits(x) != 0L)) {
            g.writeNumber((long) x);
        } else {
            g.writeNumber(x);
        }
    }

    /**
     * Objects one key per line, indented by two spaces, and arrays on one line, unless the writer
     * asks otherwise for the next container: arrays of objects one element per line, small objects
     * ({@code norm}) on one line. Per-bin number arrays thus stay one line each.
     */
    private static final class Layout implements PrettyPrinter {
        private final Deque<Boolean> isBlock = new ArrayDeque<>();
        private boolean flipNext;
        private int depth;

        /** The next container is laid out the other way: an array as a block, an object inline. */
        void flip() {
            flipNext = true;
        }

        private void open(JsonGenerator g, char bracket, boolean blockByDefault) throws IOException {
            boolean block = blockByDefault != flipNext;
            flipNext = false;
            isBlock.push(block);
            if (block) depth++;
            g.writeRaw(bracket);
        }

        private void first(JsonGenerator g) throws IOException {
            if (isBlock.peek()) newline(g);
        }

        private void separate(JsonGenerator g) throws IOException {
            g.writeRaw(',');
            if (isBlock.peek()) newline(g);
            else g.writeRaw(' ');
        }

        private void close(JsonGenerator g, char bracket, int entries) throws IOException {
            if (isBlock.pop()) {
                depth--;
                if (entries > 0) newline(g);
            }
            g.writeRaw(bracket);
        }

        private void newline(JsonGenerator g) throws IOException {
            g.writeRaw('\n');
            for (int i = 0; i < depth; i++) g.writeRaw("  ");
        }

        @Override
        public void writeRootValueSeparator(JsonGenerator g) throws IOException {
            g.writeRaw('\n');
        }

        @Override
        public void writeStartObject(JsonGenerator g) throws IOException {
            open(g, '{', true);
        }

        @Override
        public void beforeObjectEntries(JsonGenerator g) throws IOException {
            first(g);
        }

        @Override
        public void writeObjectFieldValueSeparator(JsonGenerator g) throws IOException {
            g.writeRaw(": ");
        }

        @Override
        public void writeObjectEntrySeparator(JsonGenerator g) throws IOException {
            separate(g);
        }

        @Override
        public void writeEndObject(JsonGenerator g, int entries) throws IOException {
            close(g, '}', entries);
        }

        @Override
        public void writeStartArray(JsonGenerator g) throws IOException {
            open(g, '[', false);
        }

        @Override
        public void beforeArrayValues(JsonGenerator g) throws IOException {
            first(g);
        }

        @Override
        public void writeArrayValueSeparator(JsonGenerator g) throws IOException {
            separate(g);
        }

        @Override
        public void writeEndArray(JsonGenerator g, int values) throws IOException {
            close(g, ']', values);
        }
    }
}
