package plumb.engine.tooling;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Builds a model from histogram rows (CSV or JSON, docs/import-format.md) and optional settings
 * (everything that is not a histogram: POI, factors, parameters, groups, labels, options,
 * interpolations). Ragged tables are refused naming the row and column; the model is checked by
 * the model reader before it is returned.
 */
public final class HistogramImport {

    private static final ObjectMapper JSON = new ObjectMapper();
    private static final Set<String> CHANNEL_SETTINGS = Set.of("name", "observable", "samples");
    private static final Set<String> SAMPLE_SETTINGS = Set.of("name", "factors", "binFactors", "variations");
    private static final Set<String> VARIATION_SETTINGS = Set.of("parameter", "normInterpolation", "shapeInterpolation");

    private HistogramImport() {
    }

    /** One histogram (or κ pair) being collected: values by bin, the row that started it. */
    private static final class Histogram {
        final HistogramRow first;
        final double[] values;
        final double[] errors;
        HistogramRow withoutError;
        HistogramRow withError;

        Histogram(HistogramRow first, int bins) {
            this.first = first;
            values = new double[bins];
            errors = new double[bins];
            Arrays.fill(values, Double.NaN);
            Arrays.fill(errors, Double.NaN);
        }
    }

    /** The rows of one region, in order of first appearance. */
    private static final class Region {
        final String name;
        final List<HistogramRow> rows = new ArrayList<>();
        int bins;

        Region(String name) {
            this.name = name;
        }
    }

    /**
     * The model of the rows and settings.
     *
     * @param source         names the table in messages
     * @param settings       the settings document, or null
     * @param settingsSource names the settings file in messages
     * @param defaultName    the model's name when the settings give none
     */
    public static Model build(List<HistogramRow> rows, String source, JsonNode settings, String settingsSource,
                              String defaultName) {
        Map<String, Region> regions = new LinkedHashMap<>();
        for (HistogramRow r : rows) {
            checkRowShape(r, source);
            Region reg = regions.computeIfAbsent(r.region(), Region::new);
            reg.rows.add(r);
            if (!r.side().kappa()) reg.bins = Math.max(reg.bins, r.bin() + 1);
        }
        List<Channel> channels = new ArrayList<>();
        for (Region reg : regions.values()) channels.add(channel(reg, source));
        Model bare = new Model(Model.FORMAT, defaultName, null, null, channels, List.of(), Map.of(), Map.of(), null);
        ObjectNode tree;
        try {
            tree = (ObjectNode) JSON.readTree(ModelWriter.toJson(bare));
        } catch (IOException e) {
            throw new IllegalStateException(e);  // our own writer's text
        }
        String name = source;
        if (settings != null) {
            overlay(tree, settings, settingsSource);
            name = source + " with " + settingsSource;
        }
        String text = tree.toPrettyString();
        return ModelReader.parse(text, name);
    }

    private static void checkRowShape(HistogramRow r, String source) {
        boolean data = HistogramRow.DATA.equals(r.sample());
        if (r.region().isEmpty()) throw new ModelException(source, r.where().at("region"), "empty, expected a region name");
        if (r.sample().isEmpty()) throw new ModelException(source, r.where().at("sample"), "empty, expected a sample name or %s", HistogramRow.DATA);
        if (r.side() == HistogramRow.Side.NOMINAL && r.variation() != null) {
            throw new ModelException(source, r.where().at("variation"), "\"%s\" on a nominal row: leave it empty", r.variation());
        }
        if (r.side() != HistogramRow.Side.NOMINAL && r.variation() == null) {
            throw new ModelException(source, r.where().at("variation"), "empty on a %s row: name the variation's parameter", r.side().text());
        }
        if (data && r.side() != HistogramRow.Side.NOMINAL) {
            throw new ModelException(source, r.where().at("side"), "%s rows hold observed counts: side must be nominal", HistogramRow.DATA);
        }
        if ((data || r.side() != HistogramRow.Side.NOMINAL) && !Double.isNaN(r.error())) {
            throw new ModelException(source, r.where().at("error"), "an error is given on nominal rows of samples only");
        }
        if (r.side().kappa() && (!Double.isNaN(r.low()) || !Double.isNaN(r.high()))) {
            throw new ModelException(source, r.where().at(Double.isNaN(r.low()) ? "high" : "low"), "a kappa row has no edges: leave it empty");
        }
    }

    private static Channel channel(Region reg, String source) {
        int n = reg.bins;
        if (n == 0) throw new ModelException(source, reg.rows.get(0).where().at("side"), "region %s has kappa rows only", reg.name);
        double[] lows = new double[n], highs = new double[n];
        Arrays.fill(lows, Double.NaN);
        Arrays.fill(highs, Double.NaN);
        Boolean withEdges = null;
        Map<String, Histogram> hists = new LinkedHashMap<>();
        for (HistogramRow r : reg.rows) {
            String key = r.sample() + "\u0000" + (r.variation() == null ? "" : r.variation()) + "\u0000" + r.side();
            if (!r.side().kappa()) {
                boolean has = !Double.isNaN(r.low()) || !Double.isNaN(r.high());
                if (has && (Double.isNaN(r.low()) || Double.isNaN(r.high()))) {
                    throw new ModelException(source, r.where().at(Double.isNaN(r.low()) ? "low" : "high"), "empty while the other edge is given");
                }
                if (withEdges == null) withEdges = has;
                if (withEdges != has) {
                    throw new ModelException(source, r.where().at("low"), "edges %s here but %s on the region's first row",
                            has ? "given" : "missing", has ? "missing" : "given");
                }
                if (has) {
                    int b = r.bin();
                    if (Double.isNaN(lows[b])) {
                        lows[b] = r.low();
                        highs[b] = r.high();
                    } else if (lows[b] != r.low() || highs[b] != r.high()) {
                        throw new ModelException(source, r.where().at(lows[b] != r.low() ? "low" : "high"),
                                "bin %d of region %s has edges [%s, %s] on an earlier row, here [%s, %s]",
                                b, reg.name, lows[b], highs[b], r.low(), r.high());
                    }
                }
            }
            Histogram h = hists.computeIfAbsent(key, k -> new Histogram(r, r.side().kappa() ? 1 : n));
            int b = r.side().kappa() ? 0 : r.bin();
            if (!Double.isNaN(h.values[b])) {
                throw new ModelException(source, r.where().at(r.side().kappa() ? "side" : "bin"),
                        "duplicate row: %s/%s%s %s%s given twice", reg.name, r.sample(),
                        r.variation() == null ? "" : "/" + r.variation(), r.side().text(), r.side().kappa() ? "" : " bin " + b);
            }
            h.values[b] = r.content();
            h.errors[b] = r.error();
            if (Double.isNaN(r.error())) h.withoutError = h.withoutError == null ? r : h.withoutError;
            else h.withError = h.withError == null ? r : h.withError;
        }
        double[] edges = null;
        if (Boolean.TRUE.equals(withEdges)) {
            edges = new double[n + 1];
            for (int b = 0; b < n; b++) {
                if (b > 0 && highs[b - 1] != lows[b]) {
                    throw new ModelException(source, rowOfBin(reg, b).where().at("low"),
                            "bin %d of region %s starts at %s but bin %d ends at %s: bins must be contiguous",
                            b, reg.name, lows[b], b - 1, highs[b - 1]);
                }
                edges[b] = lows[b];
            }
            edges[n] = highs[n - 1];
        }
        // every histogram complete; sides in pairs; variations of known samples
        for (Histogram h : hists.values()) {
            for (int b = 0; b < h.values.length; b++) {
                if (Double.isNaN(h.values[b])) {
                    throw new ModelException(source, h.first.where().at("bin"), "%s/%s%s %s has no row for bin %d (region %s has bins 0..%d)",
                            reg.name, h.first.sample(), h.first.variation() == null ? "" : "/" + h.first.variation(),
                            h.first.side().text(), b, reg.name, n - 1);
                }
            }
            if (h.withError != null && h.withoutError != null) {
                throw new ModelException(source, h.withoutError.where().at("error"),
                        "empty while other bins of %s/%s give an error: give all or none", reg.name, h.first.sample());
            }
            HistogramRow.Side partner = h.first.side().partner();
            if (partner != null && !hists.containsKey(h.first.sample() + "\u0000" + h.first.variation() + "\u0000" + partner)) {
                throw new ModelException(source, h.first.where().at("side"), "%s/%s/%s has %s rows but no %s rows",
                        reg.name, h.first.sample(), h.first.variation(), h.first.side().text(), partner.text());
            }
            if (h.first.side() != HistogramRow.Side.NOMINAL
                    && !hists.containsKey(h.first.sample() + "\u0000\u0000" + HistogramRow.Side.NOMINAL)) {
                throw new ModelException(source, h.first.where().at("sample"), "%s/%s has variation rows but no nominal rows",
                        reg.name, h.first.sample());
            }
        }
        double[] observed = null;
        List<Sample> samples = new ArrayList<>();
        for (Histogram h : hists.values()) {
            if (h.first.side() != HistogramRow.Side.NOMINAL) continue;
            if (HistogramRow.DATA.equals(h.first.sample())) {
                observed = h.values;
                continue;
            }
            List<Variation> vars = new ArrayList<>();
            Map<String, Boolean> seen = new LinkedHashMap<>();
            for (Histogram v : hists.values()) {
                if (!v.first.sample().equals(h.first.sample()) || v.first.variation() == null) continue;
                if (seen.putIfAbsent(v.first.variation(), true) != null) continue;
                vars.add(variation(hists, h.first.sample(), v.first.variation()));
            }
            samples.add(new Sample(h.first.sample(), h.values, h.withError != null ? h.errors : null, List.of(), vars));
        }
        if (samples.isEmpty()) {
            throw new ModelException(source, reg.rows.get(0).where().at("sample"), "region %s has no sample, only %s", reg.name, HistogramRow.DATA);
        }
        return new Channel(reg.name, null, edges, observed, samples);
    }

    private static HistogramRow rowOfBin(Region reg, int b) {
        for (HistogramRow r : reg.rows) if (!r.side().kappa() && r.bin() == b) return r;
        return reg.rows.get(0);
    }

    private static Variation variation(Map<String, Histogram> hists, String sample, String parameter) {
        String prefix = sample + "\u0000" + parameter + "\u0000";
        Histogram ku = hists.get(prefix + HistogramRow.Side.KAPPA_UP), kd = hists.get(prefix + HistogramRow.Side.KAPPA_DOWN);
        Histogram up = hists.get(prefix + HistogramRow.Side.UP), down = hists.get(prefix + HistogramRow.Side.DOWN);
        Variation.NormEffect norm = ku == null ? null : new Variation.NormEffect(kd.values[0], ku.values[0]);
        Variation.ShapeEffect shape = up == null ? null : new Variation.ShapeEffect(down.values, up.values);
        return new Variation(parameter, norm, shape, null, null);
    }

    // ---- settings ----

    private static void overlay(ObjectNode model, JsonNode settings, String source) {
        if (!settings.isObject()) throw new ModelException(source, "", "expected a JSON object of model settings");
        for (Map.Entry<String, JsonNode> e : settings.properties()) {
            if (e.getKey().equals("channels")) continue;
            if (e.getKey().equals("format")) continue;
            model.set(e.getKey(), e.getValue());   // the model reader checks these keys and values
        }
        JsonNode channels = settings.get("channels");
        if (channels == null) return;
        if (!channels.isArray()) throw new ModelException(source, "channels", "expected an array of channel settings");
        for (int c = 0; c < channels.size(); c++) {
            String at = "channels[" + c + "]";
            JsonNode cs = channels.get(c);
            ObjectNode ch = named(model.withArray("channels"), "name", cs, source, at, CHANNEL_SETTINGS, "channel");
            if (cs.has("observable")) ch.set("observable", cs.get("observable"));
            JsonNode samples = cs.get("samples");
            if (samples == null) continue;
            if (!samples.isArray()) throw new ModelException(source, at + ".samples", "expected an array of sample settings");
            for (int s = 0; s < samples.size(); s++) {
                String sat = at + ".samples[" + s + "]";
                JsonNode ss = samples.get(s);
                ObjectNode sample = named(ch.withArray("samples"), "name", ss, source, sat, SAMPLE_SETTINGS, "sample");
                if (ss.has("factors")) sample.set("factors", ss.get("factors"));
                if (ss.has("binFactors")) sample.set("binFactors", ss.get("binFactors"));
                JsonNode vars = ss.get("variations");
                if (vars == null) continue;
                if (!vars.isArray()) throw new ModelException(source, sat + ".variations", "expected an array of variation settings");
                for (int v = 0; v < vars.size(); v++) {
                    String vat = sat + ".variations[" + v + "]";
                    JsonNode vs = vars.get(v);
                    ObjectNode var = named(sample.withArray("variations"), "parameter", vs, source, vat, VARIATION_SETTINGS, "variation");
                    if (vs.has("normInterpolation")) var.set("normInterpolation", vs.get("normInterpolation"));
                    if (vs.has("shapeInterpolation")) var.set("shapeInterpolation", vs.get("shapeInterpolation"));
                }
            }
        }
    }

    /** The element of {@code array} whose {@code key} equals the settings entry's. */
    private static ObjectNode named(ArrayNode array, String key, JsonNode entry, String source, String at,
                                    Set<String> allowed, String what) {
        if (!entry.isObject()) throw new ModelException(source, at, "expected a %s settings object", what);
        for (Iterator<String> it = entry.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!allowed.contains(k)) {
                throw new ModelException(source, at + "." + k, "not a %s setting (allowed: %s); numbers belong in the histogram table",
                        what, String.join(", ", allowed.stream().sorted().toList()));
            }
        }
        JsonNode name = entry.get(key);
        if (name == null || !name.isTextual()) throw new ModelException(source, at + "." + key, "expected the %s's %s", what, key);
        for (JsonNode n : array) if (name.asText().equals(n.path(key).asText(null))) return (ObjectNode) n;
        throw new ModelException(source, at + "." + key, "\"%s\": no such %s in the histogram table", name.asText(), what);
    }
}
