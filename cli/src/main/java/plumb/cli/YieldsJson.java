package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Yields;
import java.util.List;

/** The yields result file of docs/cli-contract.md: the one mapping for {@code plumb yields} and the report's json/yields.json. */
final class YieldsJson {

    private YieldsJson() {
    }

    /** The yields result file of docs/cli-contract.md, with channel sums added. */
    static ObjectNode of(CompiledModel m, FitOptions.Prepared p, List<Yields.ChannelYields> yields) {
        ObjectNode root = Json.result(m.labels(), p.kind());
        ArrayNode channels = root.putArray("channels");
        for (Yields.ChannelYields c : yields) {
            ObjectNode o = channels.addObject();
            o.put("name", c.name());
            if (c.observed() == null) o.putNull("observed");
            else Json.array(o, "observed", c.observed());
            ArrayNode samples = o.putArray("samples");
            for (Yields.SampleYields s : c.samples()) {
                ObjectNode so = samples.addObject();
                so.put("name", s.name());
                band(so, "prefit", s.prefit());
                band(so, "postfit", s.postfit());
            }
            ObjectNode total = o.putObject("total");
            band(total, "prefit", c.totalPrefit());
            band(total, "postfit", c.totalPostfit());
        }
        return root;
    }

    private static void band(ObjectNode parent, String key, Yields.Band b) {
        ObjectNode o = parent.putObject(key);
        Json.array(o, "yields", b.values());
        Json.array(o, "errors", b.errors());
        Json.put(o, "sum", b.sum());
        Json.put(o, "sumError", b.sumError());
    }
}
