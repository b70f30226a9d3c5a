package plumb.cli;

import com.fasterxml.jackson.core.JsonEncoding;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.io.AtomicFiles;
import plumb.engine.inference.InjectionLinearity;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.ToyFit;
import plumb.engine.minimise.MinimumStatus;

import java.io.IOException;
import java.io.OutputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The toys of an injection run held in memory: the run's identity (every setting its results
 * depend on), the toys' results per injected value, and the two files made from them — a part
 * file (a batch of toys, to merge later) and the result file of docs/cli-contract.md.
 * Single runs and merged batches both build their result through {@link #resultJson}, so equal
 * toys give byte-identical result files.
 *
 * @param run        identity of the run: model SHA-256, POI, injected values, seed, settings;
 *                   batches merge only when theirs are equal
 * @param labels     the model's labels
 * @param nuisances  names of the nuisances whose pulls each toy carries
 * @param first      index of the first toy
 * @param count      toys per injected value
 * @param injections one entry per injected value, in the order given
 */
record InjectionToyFits(ObjectNode run, Map<String, Object> labels, String[] nuisances, long first, int count,
                   List<ValueFits> injections) {

    /** Value of the "format" key of part files. */
    static final String PART_FORMAT = "plumb-toy-batch/1";

    /** The toys of one injected value, in index order. */
    record ValueFits(double injected, ToyFit[] toys) {
    }

    /** Summaries of every injected value, in order. */
    List<InjectionSummary> summaries() {
        List<InjectionSummary> out = new ArrayList<>();
        for (ValueFits j : injections) out.add(InjectionSummary.of(j.injected(), j.toys(), nuisances));
        return out;
    }

    /**
     * The result file: labels, data, run settings, then with one injected value the summary keys
     * at the top level, with several an "injections" list and the "linearity" line (null when it
     * cannot be fitted).
     *
     * @param closures per injected value the Asimov closure's JSON, or null (no --asimov)
     */
    ObjectNode resultJson(List<ObjectNode> closures, List<InjectionSummary> summaries) {
        ObjectNode root = Json.result(labels, count == 0 && closures != null ? "asimov" : "toy");
        root.put("poi", run.get("poi").asText());
        root.put("seed", run.get("seed").asLong());
        root.put("from", run.get("from").asText());
        root.put("auxFluctuation", run.get("auxFluctuation").asBoolean());
        root.put("firstToy", first);
        if (summaries.size() == 1) {
            if (closures != null) root.set("closure", closures.get(0));
            summaryKeys(root, summaries.get(0));
            return root;
        }
        ArrayNode list = root.putArray("injections");
        for (int k = 0; k < summaries.size(); k++) {
            ObjectNode o = list.addObject();
            if (closures != null) o.set("closure", closures.get(k));
            summaryKeys(o, summaries.get(k));
        }
        InjectionLinearity line = InjectionLinearity.through(summaries);
        if (line == null) {
            root.putNull("linearity");
        } else {
            ObjectNode l = root.putObject("linearity");
            Json.put(l, "slope", line.slope());
            Json.put(l, "slopeError", line.slopeError());
            Json.put(l, "offset", line.offset());
            Json.put(l, "offsetError", line.offsetError());
        }
        return root;
    }

    private static void summaryKeys(ObjectNode o, InjectionSummary s) {
        Json.put(o, "injected", s.injected());
        o.put("toys", s.toys());
        o.put("converged", s.converged());
        ObjectNode nc = o.putObject("nonConverged");
        s.nonConverged().forEach(nc::put);
        Json.put(o, "mean", s.mean());
        Json.put(o, "meanError", s.meanError());
        Json.put(o, "bias", s.bias());
        Json.put(o, "pullMean", s.pullMean());
        Json.put(o, "pullMeanError", s.pullMeanError());
        Json.put(o, "pullWidth", s.pullWidth());
        Json.put(o, "pullWidthError", s.pullWidthError());
        Json.put(o, "coverage68", s.coverage68());
        Json.put(o, "coverage68Error", s.coverage68Error());
        o.put("flagged", s.converged() > 1 && s.flagged());
        ArrayNode list = o.putArray("nuisances");
        for (InjectionSummary.NuisancePull p : s.nuisances()) {
            ObjectNode n = list.addObject();
            n.put("parameter", p.parameter());
            n.put("toys", p.toys());
            Json.put(n, "pullMean", p.pullMean());
            Json.put(n, "pullMeanError", p.pullMeanError());
            Json.put(n, "pullWidth", p.pullWidth());
            Json.put(n, "pullWidthError", p.pullWidthError());
            n.put("flagged", p.flagged());
        }
    }

    // ---------------------------------------------------------------- part files

    /**
     * Writes this batch as a part file to {@code target} (whole or not at all), or to {@code out}
     * when target is "-". Streamed: a batch may hold many toys. Doubles are written in their
     * shortest round-trip form, so reading gives back the same bits; NaN is written as null.
     */
    void writePart(String target, PrintWriter out) {
        try {
            if ("-".equals(target)) {
                java.io.ByteArrayOutputStream buffer = new java.io.ByteArrayOutputStream();
                writePart(buffer);
                out.print(buffer.toString(StandardCharsets.UTF_8));
                out.flush();
            } else {
                AtomicFiles.write(Path.of(target), this::writePart);
            }
        } catch (IOException | RuntimeException e) {
            throw Outputs.cannotWrite(target, e);
        }
    }

    private void writePart(OutputStream stream) throws IOException {
        try (JsonGenerator g = Json.mapper().getFactory().createGenerator(stream, JsonEncoding.UTF8)) {
            g.writeStartObject();
            g.writeStringField("format", PART_FORMAT);
            g.writeFieldName("run");
            g.writeTree(run);
            g.writeFieldName("labels");
            g.writeTree(Json.result(labels, "toy").get("labels"));
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

    /** Reads a part file; anything wrong is an {@link InputException} naming the file and the JSON path. */
    static InjectionToyFits readPart(Path file) {
        JsonNode root;
        try {
            root = Json.mapper().readTree(Files.newInputStream(file));
        } catch (java.nio.file.NoSuchFileException e) {
            throw new InputException(file + ": no such file");
        } catch (IOException e) {
            throw new InputException(file + ": cannot read a toy batch: " + String.valueOf(e.getMessage()).lines().findFirst().orElse(""));
        }
        Reader r = new Reader(file);
        if (root == null || !root.isObject()) throw r.bad("", "is not a JSON object");
        if (!PART_FORMAT.equals(root.path("format").asText(null))) {
            throw r.bad("format", "is not \"" + PART_FORMAT + "\" (not a toy batch written by plumb inject --first/--count)");
        }
        JsonNode run = r.object(root, "run");
        JsonNode labelsNode = r.object(root, "labels");
        Map<String, Object> labels = new LinkedHashMap<>();
        for (Map.Entry<String, JsonNode> e : labelsNode.properties()) {
            labels.put(e.getKey(), e.getValue().isNumber() ? (Object) e.getValue().doubleValue() : e.getValue().asText());
        }
        JsonNode names = r.array(root, "nuisances");
        String[] nuisances = new String[names.size()];
        for (int k = 0; k < nuisances.length; k++) nuisances[k] = names.get(k).asText();
        long first = r.integer(root, "first");
        long count = r.integer(root, "count");
        if (first < 0 || count < 0 || count > Integer.MAX_VALUE) throw r.bad("count", "first or count out of range");
        JsonNode injected = r.array(run, "injected");
        JsonNode list = r.array(root, "injections");
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
        return new InjectionToyFits((ObjectNode) run, labels, nuisances, first, (int) count, injections);
    }

    /**
     * Merges batches into the campaign a single run of all their toys would hold. Refuses (one
     * line naming the file) a part whose run differs from the first's, parts that overlap, and
     * gaps between them.
     */
    static InjectionToyFits merge(List<Path> files) {
        List<InjectionToyFits> parts = new ArrayList<>();
        List<Path> order = new ArrayList<>();
        for (Path f : files) {
            InjectionToyFits c = readPart(f);
            if (!parts.isEmpty()) {
                InjectionToyFits ref = parts.get(0);
                String diff = firstDifference(ref.run(), c.run());
                if (diff != null) {
                    throw new InputException(f + ": a different run than " + order.get(0) + " (run." + diff + " differs)");
                }
            }
            parts.add(c);
            order.add(f);
        }
        Integer[] idx = new Integer[parts.size()];
        for (int k = 0; k < idx.length; k++) idx[k] = k;
        Arrays.sort(idx, Comparator.comparingLong(k -> parts.get(k).first()));
        long next = parts.get(idx[0]).first();
        long total = 0;
        for (int k = 0; k < idx.length; k++) {
            InjectionToyFits c = parts.get(idx[k]);
            Path f = order.get(idx[k]);
            if (c.first() < next) {
                throw new InputException(String.format(java.util.Locale.ROOT,
                        "%s: toys %d..%d overlap toys of %s", f, c.first(), c.first() + c.count() - 1, order.get(idx[k - 1])));
            }
            if (c.first() > next) {
                throw new InputException(String.format(java.util.Locale.ROOT,
                        "%s: starts at toy %d but the parts before end at toy %d (toys %d..%d missing)", f, c.first(),
                        next - 1, next, c.first() - 1));
            }
            next = c.first() + c.count();
            total += c.count();
        }
        if (total > Integer.MAX_VALUE) throw new InputException(files.get(0) + ": more than " + Integer.MAX_VALUE + " toys in total");
        InjectionToyFits head = parts.get(idx[0]);
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
        return new InjectionToyFits(head.run(), head.labels(), head.nuisances(), head.first(), (int) total, merged);
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

    /** Typed access to a part file's tree, with errors that name the file and the JSON path. */
    private record Reader(Path file) {
        InputException bad(String path, String what) {
            return new InputException(file + ": " + (path.isEmpty() ? "" : path + " ") + what);
        }

        JsonNode object(JsonNode parent, String key) {
            JsonNode n = parent.get(key);
            if (n == null || !n.isObject()) throw bad(key, "is missing or not an object");
            return n;
        }

        JsonNode array(JsonNode parent, String key) {
            return array(parent, "", key);
        }

        JsonNode array(JsonNode parent, String path, String key) {
            String p = path.isEmpty() ? key : path + "." + key;
            JsonNode n = parent == null ? null : parent.get(key);
            if (n == null || !n.isArray()) throw bad(p, "is missing or not an array");
            return n;
        }

        long integer(JsonNode parent, String key) {
            return integer(parent, "", key);
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
