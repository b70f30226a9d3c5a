package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.ExpectedBands;
import plumb.engine.inference.LimitResult;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The limit result file of docs/cli-contract.md, the one mapping of limits to JSON: written by
 * {@code plumb limit} and as the report's json/limit.json.
 */
final class LimitJson {

    private LimitJson() {
    }

    /**
     * The limits of every model, ordered by x.
     *
     * @param key   the label x comes from, or null
     * @param toys  toys per hypothesis, or null for asymptotic limits
     * @param seed  the seed of the toys (written with toys only)
     */
    static ObjectNode of(List<ModelLimit> outcomes, String key, double cl, Integer toys, long seed) {
        ModelLimit first = outcomes.get(0);
        ObjectNode root = Json.result(outcomes.size() == 1 ? first.model().compiled().labels() : commonLabels(outcomes),
                first.data().kind());
        if (outcomes.size() == 1) {
            if (first.data().asimovPoi() != null) root.put("asimovPoi", first.data().asimovPoi());
            putLimit(root, first, cl, toys, seed);
        }
        if (key != null) root.put("label", key);
        else root.putNull("label");
        ArrayNode points = root.putArray("points");
        for (ModelLimit o : outcomes) {
            ObjectNode p = points.addObject();
            p.put("model", o.model().file().toString());
            Json.put(p, "x", o.x());
            putLimit(p, o, cl, toys, seed);
            p.put("data", o.data().kind());
            p.set("labels", Json.result(o.model().compiled().labels(), o.data().kind()).get("labels"));
        }
        List<String> errors = ModelLimit.errors(outcomes);
        if (!errors.isEmpty()) {
            root.put("converged", false);
            root.put("failure", String.join("; ", errors));
        }
        return root;
    }

    private static void putLimit(ObjectNode node, ModelLimit o, double cl, Integer toys, long seed) {
        CompiledModel m = o.model().compiled();
        node.put("poi", m.parameterNames(m.poi()));
        node.put("cl", cl);
        node.put("method", toys == null ? "asymptotic" : "toys");
        node.put("statistic", "qtilde_mu");
        LimitResult r = o.result();
        if (r == null) {
            node.putNull("observed");
            ObjectNode e = node.putObject("expected");
            for (String k : BAND_KEYS) e.putNull(k);
            node.put("error", o.error());
            return;
        }
        Json.put(node, "observed", r.observed());
        bands(node.putObject("expected"), r.expected());
        Json.put(node, "muHat", r.muHat());
        if (toys != null) {
            Json.put(node, "observedError", r.observedError());
            bands(node.putObject("expectedError"), r.expectedError());
            node.put("toysPerPoint", toys);
            node.put("toys", r.toys());
            node.put("failedToys", r.failedToys());
            node.put("seed", seed);
            ArrayNode pts = node.putArray("clsPoints");
            for (LimitResult.ClsPoint c : r.points()) {
                ObjectNode p = pts.addObject();
                p.put("mu", c.mu());
                Json.put(p, "q", c.qObserved());
                Json.put(p, "clsb", c.clsb());
                Json.put(p, "clb", c.clb());
                Json.put(p, "cls", c.cls());
                Json.put(p, "clsError", c.clsError());
                Json.array(p, "expectedCls", c.expectedCls());
            }
        }
        node.put("fits", r.fits());
        node.put("seconds", r.seconds());
    }

    private static final String[] BAND_KEYS = {"minus2", "minus1", "median", "plus1", "plus2"};

    private static void bands(ObjectNode node, ExpectedBands b) {
        double[] v = b.toArray();
        for (int k = 0; k < v.length; k++) Json.put(node, BAND_KEYS[k], v[k]);
    }

    private static Map<String, Object> commonLabels(List<ModelLimit> outcomes) {
        Map<String, Object> common = new LinkedHashMap<>(outcomes.get(0).model().compiled().labels());
        for (ModelLimit o : outcomes) common.entrySet().removeIf(e -> !e.getValue().equals(o.model().compiled().labels().get(e.getKey())));
        return common;
    }

}
