package plumb.engine.inference;

import com.fasterxml.jackson.core.JsonEncoding;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.minimise.MinimumStatus;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The toys of an injection run: the run's identity (every setting its results depend on), and
 * the toys' fits per injected value, from toy {@code first} on. A batch of a larger run is kept
 * in a part file (format {@value #FORMAT}, docs/cli-contract.md) and batches are merged into the
 * run that holds all their toys; the format and the merge rules live here, once.
 *
 * <p>Toy i depends only on (seed, i), so batches merged in index order give exactly the toys of
 * one run, and their summaries are equal to the bit.
 *
 * @param run        identity of the run (see {@link #runIdentity}); batches merge only when equal
 * @param labels     the model's labels
 * @param nuisances  names of the nuisances whose pulls each toy carries
 * @param first      index of the first toy
 * @param count      toys per injected value
 * @param injections one entry per injected value, in the order of the run
 */
public record InjectionToyBatch(ObjectNode run, Map<String, Object> labels, String[] nuisances, long first, int count,
                                List<ValueFits> injections) {

    /** Value of the "format" key of part files. */
    public static final String FORMAT = "plumb-toy-batch/1";

    private static final ObjectMapper MAPPER = new ObjectMapper()
            .enable(com.fasterxml.jackson.databind.SerializationFeature.INDENT_OUTPUT);

    /** The toys of one injected value, in index order. */
    public record ValueFits(double injected, ToyFit[] toys) {
    }

    /** A part file that breaks the format or the merge rules: the JSON path (may be empty) and what is wrong. */
    public static final class BadBatch extends RuntimeException {
        private static final long serialVersionUID = 1L;
        private final String source;
        private final String path;

        BadBatch(String source, String path, String what) {
            super(source + ": " + (path.isEmpty() ? "" : path + " ") + what);
            this.source = source;
            this.path = path;
        }

        /** The part (file name) at fault. */
        public String source() {
            return source;
        }

        /** The JSON path at fault, or "" for the part as a whole. */
        public String path() {
            return path;
        }
    }

    /**
     * The identity of an injection run: every setting its toys depend on, in the order written.
     *
     * @param fix the held parameters as NAME=X, in the order given
     */
    public static ObjectNode runIdentity(String model, String modelSha256, String poi, List<Double> injected, String from,
                                         boolean auxFluctuation, long seed, List<String> fix, FitSettings settings) {
        ObjectNode run = MAPPER.createObjectNode();
        run.put("model", model);
        run.put("modelSha256", modelSha256);
        run.put("poi", poi);
        ArrayNode inj = run.putArray("injected");
        for (double x : injected) inj.add(x);
        run.put("from", from);
        run.put("auxFluctuation", auxFluctuation);
        run.put("seed", seed);
        ArrayNode f = run.putArray("fix");
        fix.forEach(f::add);
        run.put("optimizer", settings.minimiser().name().toLowerCase(Locale.ROOT));
        run.put("explicitMcStat", settings.explicitGamma());
        // as a part file gives it back (a seed 4 reads as an int node, not a long one): runs compare equal either way
        try {
            return (ObjectNode) MAPPER.readTree(MAPPER.writeValueAsString(run));
        } catch (IOException e) {
            throw new IllegalStateException(e);   // a tree of strings, numbers and booleans always writes
        }
    }

    /** Summaries of every injected value, in order. */
    public List<InjectionSummary> summaries() {
        List<InjectionSummary> out = new ArrayList<>();
        for (ValueFits j : injections) out.add(InjectionSummary.of(j.injected(), j.toys(), nuisances));
        return out;
    }

    // ---------------------------------------------------------------- writing

    /**
     * Writes this batch as a part file. Streamed: a batch may hold many toys. Doubles are written
     * in their shortest round-trip form, so reading gives back the same bits; NaN is written as null.
     */
    public void write(OutputStream stream) throws IOException {
        try (JsonGenerator g = MAPPER.getFactory().createGenerator(stream, JsonEncoding.UTF8)) {
            g.writeStartObject();
            g.writeStringField("format", FORMAT);
            g.writeFieldName("run");
            g.writeTree(run);
            g.writeFieldName("labels");
            ObjectNode l = MAPPER.createObjectNode();
            labels.forEach((k, v) -> {
                if (v instanceof Number n) l.put(k, n.doubleValue());
                else l.put(k, String.valueOf(v));
            });
            g.writeTree(l);
            g.writeArrayFieldStart("nuisances");
            for (String n : nuisances) g.writeString(n);
            g.writeEndArray();
            g.writeNumberField("first", first);
            g.writeNumberField("count", count);
            g.writeArrayFieldStart("injections");
            for (ValueFits j : injections) {
                g.writeStartObject();
                g.writeNumberField("injected", j.injected());
                g.writeArrayFieldStart("toys");
                for (ToyFit t : j.toys()) {
                    g.writeRaw('\n');
                    g.writeStartObject();
                    g.writeNumberField("index", t.index());
                    g.writeStringField("status", t.status().name());
                    number(g, "poi", t.poi());
                    number(g, "poiError", t.poiError());
                    g.writeArrayFieldStart("pulls");
                    for (double p : t.nuisancePulls()) {
                        if (Double.isFinite(p)) g.writeNumber(p);
                        else g.writeNull();
                    }
                    g.writeEndArray();
                    g.writeEndObject();
                }
                g.writeEndArray();
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
            g.writeRaw('\n');
        }
    }

    private static void number(JsonGenerator g, String key, double v) throws IOException {
        if (Double.isFinite(v)) g.writeNumberField(key, v);
        else g.writeNullField(key);
    }

    // ---------------------------------------------------------------- reading

    /**
     * Reads a part file.
     *
     * @param source the part's name in messages (its file name)
     * @throws BadBatch    when the part breaks the format, naming the JSON path
     * @throws IOException when the stream cannot be read or holds no JSON
     */
    public static InjectionToyBatch read(InputStream in, String source) throws IOException {
        JsonNode root = MAPPER.readTree(in);
        Reader r = new Reader(source);
        if (root == null || !root.isObject()) throw r.bad("", "is not a JSON object");
        if (!FORMAT.equals(root.path("format").asText(null))) {
            throw r.bad("format", "is not \"" + FORMAT + "\" (not a toy batch written by plumb inject --first/--count)");
        }
        JsonNode run = r.object(root, "run");
        JsonNode labelsNode = r.object(root, "labels");
        Map<String, Object> labels = new LinkedHashMap<>();
        for (Map.Entry<String, JsonNode> e : labelsNode.properties()) {
            labels.put(e.getKey(), e.getValue().isNumber() ? (Object) e.getValue().doubleValue() : e.getValue().asText());
        }
        JsonNode names = r.array(root, "", "nuisances");
        String[] nuisances = new String[names.size()];
        for (int k = 0; k < nuisances.length; k++) nuisances[k] = names.get(k).asText();
        long first = r.integer(root, "", "first");
        long count = r.integer(root, "", "count");
        if (first < 0 || count < 0 || count > Integer.MAX_VALUE) throw r.bad("count", "first or count out of range");
        JsonNode injected = r.array(run, "run", "injected");
        JsonNode list = r.array(root, "", "injections");
        if (list.size() != injected.size()) throw r.bad("injections", list.size() + " entries, expected " + injected.size());
        List<ValueFits> injections = new ArrayList<>();
        for (int j = 0; j < list.size(); j++) {
            String path = "injections[" + j + "]";
            JsonNode toys = r.array(list.get(j), path, "toys");
            if (toys.size() != count) throw r.bad(path + ".toys", toys.size() + " toys, expected count = " + count);
            ToyFit[] fits = new ToyFit[toys.size()];
            for (int i = 0; i < fits.length; i++) {
                String tp = path + ".toys[" + i + "]";
                JsonNode t = toys.get(i);
                long index = r.integer(t, tp, "index");
                if (index != first + i) throw r.bad(tp + ".index", index + ", expected " + (first + i));
                MinimumStatus status;
                try {
                    status = MinimumStatus.valueOf(t.path("status").asText());
                } catch (IllegalArgumentException e) {
                    throw r.bad(tp + ".status", "is not a fit status");
                }
                JsonNode pulls = r.array(t, tp, "pulls");
                if (pulls.size() != nuisances.length) throw r.bad(tp + ".pulls", pulls.size() + " values, expected " + nuisances.length);
                double[] p = new double[pulls.size()];
                for (int k = 0; k < p.length; k++) p[k] = r.number(pulls.get(k), tp + ".pulls[" + k + "]");
                fits[i] = new ToyFit(index, status, r.number(t.get("poi"), tp + ".poi"), r.number(t.get("poiError"), tp + ".poiError"), p);
            }
            injections.add(new ValueFits(list.get(j).path("injected").asDouble(), fits));
        }
        return new InjectionToyBatch((ObjectNode) run, labels, nuisances, first, (int) count, injections);
    }

    // ---------------------------------------------------------------- merging

    /**
     * Merges batches into the run that holds all their toys, as one run of them would. Refuses a
     * part whose run differs from the first's, parts that overlap, and gaps between them.
     *
     * @param parts   the batches, in any order
     * @param sources their names in messages, in the same order
     * @throws BadBatch naming the part at fault (and the part it clashes with)
     */
    public static InjectionToyBatch merge(List<InjectionToyBatch> parts, List<String> sources) {
        if (parts.isEmpty() || parts.size() != sources.size()) throw new IllegalArgumentException("one name per part, at least one part");
        for (int k = 1; k < parts.size(); k++) {
            String diff = firstDifference(parts.get(0).run(), parts.get(k).run());
            if (diff != null) {
                throw new BadBatch(sources.get(k), "", "a different run than " + sources.get(0) + " (run." + diff + " differs)");
            }
        }
        Integer[] idx = new Integer[parts.size()];
        for (int k = 0; k < idx.length; k++) idx[k] = k;
        Arrays.sort(idx, Comparator.comparingLong(k -> parts.get(k).first()));
        long next = parts.get(idx[0]).first();
        long total = 0;
        for (int k = 0; k < idx.length; k++) {
            InjectionToyBatch c = parts.get(idx[k]);
            String f = sources.get(idx[k]);
            if (c.first() < next) {
                throw new BadBatch(f, "", String.format(Locale.ROOT, "toys %d..%d overlap toys of %s", c.first(),
                        c.first() + c.count() - 1, sources.get(idx[k - 1])));
            }
            if (c.first() > next) {
                throw new BadBatch(f, "", String.format(Locale.ROOT,
                        "starts at toy %d but the parts before end at toy %d (toys %d..%d missing)", c.first(), next - 1,
                        next, c.first() - 1));
            }
            next = c.first() + c.count();
            total += c.count();
        }
        if (total > Integer.MAX_VALUE) throw new BadBatch(sources.get(0), "", "more than " + Integer.MAX_VALUE + " toys in total");
        InjectionToyBatch head = parts.get(idx[0]);
        List<ValueFits> merged = new ArrayList<>();
        for (int j = 0; j < head.injections().size(); j++) {
            ToyFit[] all = new ToyFit[(int) total];
            int at = 0;
            for (Integer k : idx) {
                ToyFit[] t = parts.get(k).injections().get(j).toys();
                System.arraycopy(t, 0, all, at, t.length);
                at += t.length;
            }
            merged.add(new ValueFits(head.injections().get(j).injected(), all));
        }
        return new InjectionToyBatch(head.run(), head.labels(), head.nuisances(), head.first(), (int) total, merged);
    }

    /** The first key of {@code a} whose value differs in {@code b} (or is missing), null when equal. */
    private static String firstDifference(JsonNode a, JsonNode b) {
        for (Iterator<String> it = a.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!a.get(k).equals(b.get(k))) return k;
        }
        for (Iterator<String> it = b.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!a.has(k)) return k;
        }
        return null;
    }

    /** Typed access to a part's tree, with errors that name the part and the JSON path. */
    private record Reader(String source) {
        BadBatch bad(String path, String what) {
            return new BadBatch(source, path, what);
        }

        JsonNode object(JsonNode parent, String key) {
            JsonNode n = parent.get(key);
            if (n == null || !n.isObject()) throw bad(key, "is missing or not an object");
            return n;
        }

        JsonNode array(JsonNode parent, String path, String key) {
            String p = path.isEmpty() ? key : path + "." + key;
            JsonNode n = parent == null ? null : parent.get(key);
            if (n == null || !n.isArray()) throw bad(p, "is missing or not an array");
            return n;
        }

        long integer(JsonNode parent, String path, String key) {
            String p = path.isEmpty() ? key : path + "." + key;
            JsonNode n = parent == null ? null : parent.get(key);
            if (n == null || !n.canConvertToLong() || !n.isIntegralNumber()) throw bad(p, "is missing or not an integer");
            return n.asLong();
        }

        /** A number, or NaN for null (how part files write what could not be computed). */
        double number(JsonNode n, String path) {
            if (n == null) throw bad(path, "is missing");
            if (n.isNull()) return Double.NaN;
            if (!n.isNumber()) throw bad(path, "is not a number");
            return n.doubleValue();
        }
    }
}
