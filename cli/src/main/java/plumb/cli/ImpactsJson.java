package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Impacts;
import java.util.List;

/** The impacts result file of docs/cli-contract.md: the one mapping for {@code plumb impacts} and the report's json/impacts.json. */
final class ImpactsJson {

    private ImpactsJson() {
    }

    /** The impacts result file of docs/cli-contract.md, with the linearised shifts and the breakdown added. */
    static ObjectNode of(CompiledModel m, FitOptions.Prepared p, FitResult best, List<Impacts.Entry> entries,
                             Impacts.Breakdown breakdown) {
        ObjectNode root = Json.result(m.labels(), p.kind());
        if (p.asimovPoi() != null) root.put("asimovPoi", p.asimovPoi());
        root.put("poi", m.parameterNames(m.poi()));
        Json.put(root, "poiValue", best.values()[m.poi()]);
        Json.put(root, "poiError", best.errors()[m.poi()]);
        ArrayNode list = root.putArray("impacts");
        for (Impacts.Entry e : entries) {
            ObjectNode o = list.addObject();
            o.put("parameter", e.name());
            Json.put(o, "pull", e.pull());
            Json.put(o, "constraint", e.constraint());
            putShift(o, "prefit", e.prefit());
            putShift(o, "postfit", e.postfit());
            ObjectNode lin = o.putObject("linearised");
            putShift(lin, "prefit", e.linearPrefit());
            putShift(lin, "postfit", e.linearPostfit());
            o.put("refitted", e.refitted());
        }
        ObjectNode b = root.putObject("breakdown");
        Json.put(b, "total", breakdown.total());
        Json.put(b, "statOnly", breakdown.statOnly());
        ArrayNode groups = b.putArray("groups");
        for (Impacts.Contribution c : breakdown.groups()) {
            ObjectNode g = groups.addObject();
            g.put("name", c.group());
            g.put("parameters", c.members());
            Json.put(g, "error", c.contribution());
            Json.put(g, "fixedError", c.fixedError());
        }
        return root;
    }

    private static void putShift(ObjectNode parent, String key, Impacts.Shift s) {
        if (s == null) {
            parent.putNull(key);
            return;
        }
        ObjectNode o = parent.putObject(key);
        Json.put(o, "up", s.up());
        Json.put(o, "down", s.down());
        if (s.upStatus() != null) {
            o.put("upStatus", s.upStatus().name());
            o.put("downStatus", s.downStatus().name());
        }
    }
}
