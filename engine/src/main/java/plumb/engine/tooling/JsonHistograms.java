package plumb.engine.tooling;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import plumb.engine.model.ModelException;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Set;

/**
 * The JSON histogram file of docs/import-format.md, for programs that write JSON more easily than
 * CSV: regions with optional edges and data, samples with content and optional errors, variations
 * with up/down arrays and/or κ values. It is turned into the same rows as the CSV table, so the
 * same checks apply; errors name the JSON path.
 */
public final class JsonHistograms {

    public static final String FORMAT = "plumb-histograms/1";
    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(DeserializationFeature.FAIL_ON_READING_DUP_TREE_KEY);

    private JsonHistograms() {
    }

    public static List<HistogramRow> read(Path file) {
        String source = file.toString();
        JsonNode root;
        try {
            root = JSON.readTree(file.toFile());
        } catch (JsonProcessingException e) {
            var loc = e.getLocation();
            throw new ModelException(source, loc == null ? "" : "line " + loc.getLineNr() + ", column " + loc.getColumnNr(),
                    "not valid JSON: %s", e.getOriginalMessage());
        } catch (IOException e) {
            throw new ModelException(source, "", "cannot read: %s", e.getMessage());
        }
        return rows(root, source);
    }

    static List<HistogramRow> rows(JsonNode root, String source) {
        if (root == null || !root.isObject()) throw new ModelException(source, "", "expected a JSON object");
        keys(root, "", Set.of("format", "regions"), source);
        if (!FORMAT.equals(root.path("format").asText(null))) {
            throw new ModelException(source, "format", "expected \"%s\"", FORMAT);
        }
        JsonNode regions = array(root, "regions", "", source, true);
        List<HistogramRow> rows = new ArrayList<>();
        for (int r = 0; r < regions.size(); r++) {
            String at = "regions[" + r + "]";
            JsonNode reg = regions.get(r);
            if (!reg.isObject()) throw new ModelException(source, at, "expected a region object");
            keys(reg, at, Set.of("name", "edges", "data", "samples"), source);
            String region = text(reg, "name", at, source);
            double[] edges = numbers(reg, "edges", at, source, false);
            double[] data = numbers(reg, "data", at, source, false);
            if (data != null) histogram(rows, region, HistogramRow.DATA, null, HistogramRow.Side.NOMINAL, data, null, edges, at + ".data", at, source);
            JsonNode samples = array(reg, "samples", at, source, true);
            for (int s = 0; s < samples.size(); s++) {
                String sat = at + ".samples[" + s + "]";
                JsonNode smp = samples.get(s);
                if (!smp.isObject()) throw new ModelException(source, sat, "expected a sample object");
                keys(smp, sat, Set.of("name", "content", "error", "variations"), source);
                String sample = text(smp, "name", sat, source);
                double[] content = numbers(smp, "content", sat, source, true);
                double[] error = numbers(smp, "error", sat, source, false);
                if (error != null && error.length != content.length) {
                    throw new ModelException(source, sat + ".error", "%d values, content has %d", error.length, content.length);
                }
                histogram(rows, region, sample, null, HistogramRow.Side.NOMINAL, content, error, edges, sat + ".content", at, source);
                JsonNode vars = array(smp, "variations", sat, source, false);
                if (vars == null) continue;
                for (int v = 0; v < vars.size(); v++) {
                    String vat = sat + ".variations[" + v + "]";
                    JsonNode var = vars.get(v);
                    if (!var.isObject()) throw new ModelException(source, vat, "expected a variation object");
                    keys(var, vat, Set.of("parameter", "up", "down", "kappaUp", "kappaDown"), source);
                    String parameter = text(var, "parameter", vat, source);
                    double[] up = numbers(var, "up", vat, source, false), down = numbers(var, "down", vat, source, false);
                    if (up != null) histogram(rows, region, sample, parameter, HistogramRow.Side.UP, up, null, edges, vat + ".up", at, source);
                    if (down != null) histogram(rows, region, sample, parameter, HistogramRow.Side.DOWN, down, null, edges, vat + ".down", at, source);
                    kappa(rows, var, "kappaUp", HistogramRow.Side.KAPPA_UP, region, sample, parameter, vat, source);
                    kappa(rows, var, "kappaDown", HistogramRow.Side.KAPPA_DOWN, region, sample, parameter, vat, source);
                    if (up == null && down == null && !var.has("kappaUp") && !var.has("kappaDown")) {
                        throw new ModelException(source, vat, "a variation needs up/down or kappaUp/kappaDown");
                    }
                }
            }
        }
        return rows;
    }

    private static void histogram(List<HistogramRow> rows, String region, String sample, String variation,
                                  HistogramRow.Side side, double[] values, double[] errors, double[] edges,
                                  String path, String regionPath, String source) {
        if (edges != null && edges.length != values.length + 1) {
            String at = path;
            throw new ModelException(source, at, "%d values, the region's edges make %d bins", values.length, edges.length - 1);
        }
        for (int b = 0; b < values.length; b++) {
            int bin = b;
            HistogramRow.Where where = column -> switch (column) {
                case "content" -> path + "[" + bin + "]";
                case "error" -> path.replace(".content", ".error") + "[" + bin + "]";
                case "low", "high" -> regionPath + ".edges";
                default -> path;
            };
            rows.add(new HistogramRow(region, sample, variation, side, b,
                    edges == null ? Double.NaN : edges[b], edges == null ? Double.NaN : edges[b + 1], values[b],
                    errors == null ? Double.NaN : errors[b], where));
        }
    }

    private static void kappa(List<HistogramRow> rows, JsonNode var, String key, HistogramRow.Side side, String region,
                              String sample, String parameter, String at, String source) {
        JsonNode k = var.get(key);
        if (k == null) return;
        if (!k.isNumber()) throw new ModelException(source, at + "." + key, "expected a number");
        String path = at + "." + key;
        rows.add(new HistogramRow(region, sample, parameter, side, -1, Double.NaN, Double.NaN, k.asDouble(), Double.NaN,
                column -> path));
    }

    private static void keys(JsonNode node, String at, Set<String> allowed, String source) {
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!allowed.contains(k)) {
                throw new ModelException(source, at.isEmpty() ? k : at + "." + k, "unknown key, expected one of %s",
                        String.join(", ", allowed.stream().sorted().toList()));
            }
        }
    }

    private static String text(JsonNode node, String key, String at, String source) {
        JsonNode v = node.get(key);
        if (v == null || !v.isTextual()) throw new ModelException(source, at + "." + key, "expected a string");
        return v.asText();
    }

    private static JsonNode array(JsonNode node, String key, String at, String source, boolean required) {
        JsonNode v = node.get(key);
        String path = at.isEmpty() ? key : at + "." + key;
        if (v == null) {
            if (required) throw new ModelException(source, path, "required key is missing");
            return null;
        }
        if (!v.isArray()) throw new ModelException(source, path, "expected an array");
        return v;
    }

    private static double[] numbers(JsonNode node, String key, String at, String source, boolean required) {
        JsonNode v = array(node, key, at, source, required);
        if (v == null) return null;
        double[] out = new double[v.size()];
        for (int i = 0; i < out.length; i++) {
            if (!v.get(i).isNumber()) throw new ModelException(source, at + "." + key + "[" + i + "]", "expected a number");
            out[i] = v.get(i).asDouble();
        }
        return out;
    }
}
