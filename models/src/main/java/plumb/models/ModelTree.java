package plumb.models;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import plumb.engine.model.Channel;
import plumb.engine.model.Interpolation;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Turns a model file that this module wrote itself (the stored demo model) back into records.
 * It trusts its input and checks nothing: user files go through the engine's validating reader.
 * (Kept here so that the demo loads without depending on that reader; once it is merged,
 * {@link DemoModel#load()} can use it and this class can go.)
 */
final class ModelTree {

    private static final ObjectMapper JSON = new ObjectMapper();

    private ModelTree() {
    }

    static Model read(InputStream in) throws IOException {
        JsonNode root = JSON.readTree(in);
        List<Channel> channels = new ArrayList<>();
        for (JsonNode c : root.get("channels")) channels.add(channel(c));
        List<ParameterSpec> parameters = new ArrayList<>();
        if (root.has("parameters")) for (JsonNode p : root.get("parameters")) parameters.add(parameter(p));
        Map<String, List<String>> groups = new LinkedHashMap<>();
        if (root.has("groups")) {
            for (Iterator<Map.Entry<String, JsonNode>> it = root.get("groups").fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                groups.put(e.getKey(), names(e.getValue()));
            }
        }
        Map<String, Object> labels = new LinkedHashMap<>();
        if (root.has("labels")) {
            for (Iterator<Map.Entry<String, JsonNode>> it = root.get("labels").fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                labels.put(e.getKey(), e.getValue().isNumber() ? (Object) e.getValue().doubleValue() : e.getValue().asText());
            }
        }
        return new Model(text(root, "format"), text(root, "name"), text(root, "description"), text(root, "poi"),
                channels, parameters, groups, labels, options(root.get("options")));
    }

    private static Channel channel(JsonNode c) {
        List<Sample> samples = new ArrayList<>();
        for (JsonNode s : c.get("samples")) samples.add(sample(s));
        return new Channel(text(c, "name"), text(c, "observable"), numbers(c.get("edges")),
                numbers(c.get("observed")), samples);
    }

    private static Sample sample(JsonNode s) {
        List<Variation> variations = new ArrayList<>();
        if (s.has("variations")) for (JsonNode v : s.get("variations")) variations.add(variation(v));
        return new Sample(text(s, "name"), numbers(s.get("yields")), numbers(s.get("mcError")),
                s.has("factors") ? names(s.get("factors")) : null, variations);
    }

    private static Variation variation(JsonNode v) {
        JsonNode n = v.get("norm");
        JsonNode sh = v.get("shape");
        return new Variation(text(v, "parameter"),
                n == null ? null : new Variation.NormEffect(n.get("down").doubleValue(), n.get("up").doubleValue()),
                sh == null ? null : new Variation.ShapeEffect(numbers(sh.get("down")), numbers(sh.get("up"))),
                Interpolation.fromJson(text(v, "normInterpolation")),
                Interpolation.fromJson(text(v, "shapeInterpolation")));
    }

    private static ParameterSpec parameter(JsonNode p) {
        JsonNode c = p.get("constraint");
        ParameterSpec.Constraint constraint = null;
        if (c != null && !c.isNull()) {
            constraint = "poisson".equals(text(c, "type"))
                    ? new ParameterSpec.Poisson(c.get("relative").doubleValue())
                    : new ParameterSpec.Gaussian(number(c.get("center")), number(c.get("width")));
        }
        return new ParameterSpec(text(p, "name"), number(p.get("value")), numbers(p.get("range")),
                p.has("fixed") ? p.get("fixed").booleanValue() : null, constraint, c != null);
    }

    private static ModelOptions options(JsonNode o) {
        if (o == null) return null;
        ModelOptions d = ModelOptions.DEFAULTS;
        return new ModelOptions(
                o.has("mcStatThreshold") ? o.get("mcStatThreshold").doubleValue() : d.mcStatThreshold(),
                o.has("mcStatConstraint") ? ModelOptions.McStatConstraint.fromJson(text(o, "mcStatConstraint"))
                        : d.mcStatConstraint(),
                o.has("pruneBelow") ? o.get("pruneBelow").doubleValue() : d.pruneBelow());
    }

    private static String text(JsonNode parent, String key) {
        JsonNode n = parent.get(key);
        return n == null || n.isNull() ? null : n.asText();
    }

    private static Double number(JsonNode n) {
        return n == null || n.isNull() ? null : n.doubleValue();
    }

    private static double[] numbers(JsonNode array) {
        if (array == null) return null;
        double[] out = new double[array.size()];
        for (int i = 0; i < out.length; i++) out[i] = array.get(i).doubleValue();
        return out;
    }

    private static List<String> names(JsonNode array) {
        List<String> out = new ArrayList<>(array.size());
        for (JsonNode n : array) out.add(n.asText());
        return out;
    }
}
