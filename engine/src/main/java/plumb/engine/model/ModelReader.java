package plumb.engine.model;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParseException;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonStreamContext;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.fasterxml.jackson.core.StreamReadFeature;
import com.fasterxml.jackson.core.exc.StreamConstraintsException;
import java.io.BufferedInputStream;
import java.io.EOFException;
import java.io.FileInputStream;
import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.AccessDeniedException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.zip.GZIPInputStream;
import java.util.zip.ZipException;

/**
 * Reads and validates a model file (docs/model-format.md). Every failure, I/O included, is a
 * {@link ModelException} whose one-line message names the file and either the JSON path of the
 * first offending value or, for text that is not JSON, the line and column.
 *
 * <p>Strict by design: duplicate keys, NaN and Infinity literals, comments, trailing commas and
 * unknown keys are refused, and the input is capped (size, nesting, string and number length) so
 * that a hostile file cannot exhaust memory.
 */
public final class ModelReader {

    /** Largest accepted model text in bytes, after decompression: 512 MiB. */
    public static final long MAX_BYTES = 512L << 20;
    /** Deepest accepted nesting of arrays and objects; the format itself needs 9. */
    static final int MAX_DEPTH = 64;
    /** Longest accepted string value (a description, say): 1 Mi characters. */
    static final int MAX_STRING = 1 << 20;
    /** Longest accepted key. */
    static final int MAX_KEY = 1024;
    /** Longest accepted number literal; a double needs about 25 characters. */
    static final int MAX_NUMBER = 256;

    /**
     * Jackson's own checks rather than hand-written ones: duplicate keys (STRICT_DUPLICATE_DETECTION)
     * and the stream limits. Non-numeric literals, comments, single quotes and trailing commas stay
     * at Jackson's strict defaults.
     */
    static final JsonFactory JSON = JsonFactory.builder()
            .enable(StreamReadFeature.STRICT_DUPLICATE_DETECTION)
            // Jackson's bundled FastDoubleParser: the same doubles as Double.parseDouble (a test
            // checks awkward literals bit for bit), faster on models of millions of numbers
            .enable(StreamReadFeature.USE_FAST_DOUBLE_PARSER)
            .streamReadConstraints(StreamReadConstraints.builder()
                    .maxNestingDepth(MAX_DEPTH)
                    .maxStringLength(MAX_STRING)
                    .maxNameLength(MAX_KEY)
                    .maxNumberLength(MAX_NUMBER)
                    .build())
            .build();

    /** Jackson's wording for a repeated key (JsonReadContext); a test guards it. */
    private static final String DUPLICATE_PREFIX = "Duplicate field '";
    /** Starts of Jackson's hints about its lenient features, cut from messages (no use to a modeller). */
    private static final String[] ADVICE = {": enable `", " (not recognized as one since Feature"};

    private ModelReader() {
    }

    /**
     * Reads, validates and returns the model in {@code file}, plain or gzip-compressed (recognised
     * by its first bytes, whatever the file name).
     *
     * @throws ModelException if the file cannot be read, is not JSON, is larger than
     *                        {@link #MAX_BYTES} uncompressed, or breaks a rule of the format
     */
    public static Model read(Path file) {
        return read(file, MAX_BYTES);
    }

    /** {@link #read(Path)} with another size cap (tests use a small one). */
    static Model read(Path file, long maxBytes) {
        String source = file.toString();
        try {
            if (Files.isRegularFile(file) && Files.size(file) > maxBytes) throw tooLarge(source, maxBytes);
            try (InputStream in = open(file, maxBytes); JsonParser p = JSON.createParser(in)) {
                return readAndValidate(p, source);
            }
        } catch (TooLarge e) {
            throw tooLarge(source, maxBytes);
        } catch (IOException e) {
            throw new ModelException(source, "", "cannot read: %s", describe(e));
        }
    }

    /**
     * Reads and validates a model from a stream (standard input, say), plain or gzip-compressed,
     * capped at {@link #MAX_BYTES}.
     *
     * @param source names the stream in error messages
     */
    public static Model read(InputStream in, String source) {
        try {
            InputStream body = unzipped(new BufferedInputStream(in, 1 << 16), MAX_BYTES);
            try (JsonParser p = JSON.createParser(body)) {
                return readAndValidate(p, source);
            }
        } catch (TooLarge e) {
            throw tooLarge(source, MAX_BYTES);
        } catch (IOException e) {
            throw new ModelException(source, "", "cannot read: %s", describe(e));
        }
    }

    /**
     * Parses and validates a model given as JSON text.
     *
     * @param sourceName names the text in error messages (a file name, say); may be null
     * @throws ModelException if the text is not JSON, is too large, or breaks a rule of the format
     */
    public static Model parse(String json, String sourceName) {
        // UTF-16 chars: at most 3 UTF-8 bytes each; the exact cap applies to files
        if (json.length() > MAX_BYTES) throw tooLarge(sourceName, MAX_BYTES);
        try (JsonParser p = JSON.createParser(json)) {
            return readAndValidate(p, sourceName);
        } catch (IOException e) {
            throw new ModelException(sourceName, "", "cannot read: %s", describe(e));
        }
    }

    private static Model readAndValidate(JsonParser p, String source) throws IOException {
        Model model;
        try {
            model = ModelParser.read(p, source);
        } catch (StreamConstraintsException e) {
            JsonLocation at = p.currentLocation();
            throw new ModelException(source, "", "line %d, column %d: input limit exceeded: %s",
                    at.getLineNr(), at.getColumnNr(), plain(e.getOriginalMessage()));
        } catch (JsonParseException e) {
            throw notJson(p, e, source);
        }
        ModelValidator.validate(model, source);
        return model;
    }

    private static ModelException notJson(JsonParser p, JsonProcessingException e, String source) {
        String what = e.getOriginalMessage();
        JsonStreamContext ctx = p.getParsingContext();
        if (what != null && what.startsWith(DUPLICATE_PREFIX) && ctx != null && ctx.inObject()) {
            // the context already holds the repeated name, so its path names the duplicate key
            return new ModelException(source, contextPath(ctx), "duplicate key, a key may appear once per object");
        }
        // where Jackson stopped reading: just past an offending literal such as NaN
        JsonLocation at = e.getLocation() != null ? e.getLocation() : p.currentLocation();
        return new ModelException(source, "", "line %d, column %d: not JSON: %s",
                at.getLineNr(), at.getColumnNr(), plain(what));
    }

    /** Path of the current entry of {@code ctx}: the parent's current entry is ctx's own place. */
    private static String contextPath(JsonStreamContext ctx) {
        if (ctx == null || ctx.inRoot()) return "";
        String parent = contextPath(ctx.getParent());
        if (ctx.inArray()) return JsonPaths.index(parent, Math.max(ctx.getCurrentIndex(), 0));
        return JsonPaths.key(parent, String.valueOf(ctx.getCurrentName()));
    }

    /**
     * Jackson's message without its advice to enable a lenient parser feature: for a model file
     * the literal is simply not allowed.
     */
    private static String plain(String message) {
        if (message == null) return "unreadable";
        String line = oneLine(message);
        for (String advice : ADVICE) {
            int at = line.indexOf(advice);
            if (at > 0) line = line.substring(0, at);
        }
        line = line.replaceAll(", from `[^`]*`", "");
        // no parser internals: the start of an unclosed object as a line and column, no source
        line = line.replaceAll("\\(start marker at \\[Source: [^;\\]]*; line: (\\d+), column: (\\d+)\\]\\)",
                "(opened at line $1, column $2)");
        line = line.replaceAll(" ?\\[Source: [^\\]]*\\]", "");
        return line.replace("Unexpected end-of-input", "unexpected end of file");
    }

    /** An I/O failure in a modeller's words; the file itself is already named by the message. */
    private static String describe(IOException e) {
        if (e instanceof NoSuchFileException) return "no such file";
        if (e instanceof AccessDeniedException) return "permission denied";
        if (e instanceof ZipException || e instanceof EOFException) {
            return "broken gzip data (" + oneLine(String.valueOf(e.getMessage())) + ")";
        }
        String what = e.getMessage() == null ? e.getClass().getSimpleName() : oneLine(e.getMessage());
        return what.isEmpty() ? e.getClass().getSimpleName() : what;
    }

    private static String oneLine(String s) {
        if (s == null) return "";
        int nl = s.indexOf('\n');
        return (nl < 0 ? s : s.substring(0, nl)).trim();
    }

    private static ModelException tooLarge(String source, long maxBytes) {
        return new ModelException(source, "", "larger than %d bytes (uncompressed), refused", maxBytes);
    }

    /** The file's bytes, gunzipped when it starts with the gzip magic 1f 8b, capped at maxBytes. */
    private static InputStream open(Path file, long maxBytes) throws IOException {
        // a pipe (/dev/stdin, a FIFO) through FileInputStream: the channel stream of
        // Files.newInputStream asks pipes for their position and fails with "Illegal seek"
        boolean pipe = Files.exists(file) && !Files.isRegularFile(file) && !Files.isDirectory(file);
        InputStream raw = pipe ? new FileInputStream(file.toFile()) : Files.newInputStream(file);
        return unzipped(new BufferedInputStream(raw, 1 << 16), maxBytes);
    }

    /** {@code in} gunzipped when it starts with the gzip magic 1f 8b, capped at maxBytes; closed on failure. */
    private static InputStream unzipped(BufferedInputStream bin, long maxBytes) throws IOException {
        InputStream in = bin;
        try {
            in.mark(2);
            int b0 = in.read(), b1 = in.read();
            in.reset();
            if (b0 == 0x1f && b1 == 0x8b) in = new GZIPInputStream(in, 1 << 16);
            return new CappedInputStream(in, maxBytes);
        } catch (IOException | RuntimeException e) {
            in.close();
            throw e;
        }
    }

    /** Thrown by {@link CappedInputStream}; a gzip stream can expand far beyond the file size. */
    private static final class TooLarge extends IOException {
        private static final long serialVersionUID = 1L;

        TooLarge() {
            super("input too large");
        }
    }

    /** Fails once more than {@code max} bytes have been read. */
    private static final class CappedInputStream extends FilterInputStream {
        private long left;

        CappedInputStream(InputStream in, long max) {
            super(in);
            this.left = max;
        }

        @Override
        public int read() throws IOException {
            int b = super.read();
            if (b >= 0 && --left < 0) throw new TooLarge();
            return b;
        }

        @Override
        public int read(byte[] buf, int off, int len) throws IOException {
            int n = super.read(buf, off, len);
            if (n > 0 && (left -= n) < 0) throw new TooLarge();
            return n;
        }

        @Override
        public long skip(long n) throws IOException {
            long skipped = super.skip(n);
            if ((left -= skipped) < 0) throw new TooLarge();
            return skipped;
        }
    }
}
