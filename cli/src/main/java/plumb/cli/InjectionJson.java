package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsimovClosure;
import plumb.engine.inference.InjectionLinearity;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.InjectionToyBatch;
import plumb.engine.inference.InjectionToys;

import java.util.ArrayList;
import java.util.List;

/**
 * The injection result file of docs/cli-contract.md, the one mapping of injection results to
 * JSON: {@code plumb inject}, {@code plumb merge-toys} and the report's json/inject.json all
 * write through it, so equal toys give byte-identical files.
 */
final class InjectionJson {

    private InjectionJson() {
    }

    /**
     * The result file: labels, data, run settings, then with one injected value the summary keys
     * at the top level, with several an "injections" list and the "linearity" line (null when it
     * cannot be fitted).
     *
     * @param m        the model (for the closure's parameter names), or null without closures
     * @param closures per injected value the Asimov closure check, or empty (no --asimov)
     */
    static ObjectNode of(InjectionToyBatch toys, CompiledModel m, List<AsimovClosure> closures,
                         List<InjectionSummary> summaries) {
        List<ObjectNode> closureJson = null;
        if (!closures.isEmpty()) {
            closureJson = new ArrayList<>();
            for (AsimovClosure c : closures) closureJson.add(closure(m, c));
        }
        ObjectNode run = toys.run();
        ObjectNode root = Json.result(toys.labels(), toys.count() == 0 && closureJson != null ? "asimov" : "toy");
        root.put("poi", run.get("poi").asText());
        root.put("seed", run.get("seed").asLong());
        root.put("from", run.get("from").asText());
        root.put("auxFluctuation", run.get("auxFluctuation").asBoolean());
        root.put("firstToy", toys.first());
        if (summaries.size() == 1) {
            if (closureJson != null) root.set("closure", closureJson.get(0));
            summaryKeys(root, summaries.get(0));
            return root;
        }
        ArrayNode list = root.putArray("injections");
        for (int k = 0; k < summaries.size(); k++) {
            ObjectNode o = list.addObject();
            if (closureJson != null) o.set("closure", closureJson.get(k));
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

    /** The closure's JSON: overall outcome, then every parameter not held. */
    static ObjectNode closure(CompiledModel m, AsimovClosure c) {
        ObjectNode o = Json.object();
        Json.put(o, "injected", c.injected());
        o.put("converged", c.fit().converged());
        o.put("status", c.fit().status().name());
        o.put("passed", c.passed());
        o.put("tolerance", InjectionToys.CLOSURE_TOLERANCE);
        Json.put(o, "maxDeviation", c.maxDeviation());
        if (c.worstParameter() >= 0) o.put("worstParameter", m.parameterNames(c.worstParameter()));
        else o.putNull("worstParameter");
        ArrayNode list = o.putArray("parameters");
        for (int i = 0; i < m.nAll(); i++) {
            if (c.fit().held()[i]) continue;
            ObjectNode p = list.addObject();
            p.put("name", m.parameterNames(i));
            Json.put(p, "generating", c.generating()[i]);
            Json.put(p, "fitted", c.fit().values()[i]);
            Json.put(p, "deviation", c.fit().values()[i] - c.generating()[i]);
        }
        return o;
    }
}
