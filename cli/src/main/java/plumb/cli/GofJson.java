package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.GoodnessOfFit;
import plumb.engine.inference.ToyPValue;

/** The goodness-of-fit result file of docs/cli-contract.md: the one mapping for {@code plumb gof} and the report's json/gof.json. */
final class GofJson {

    private GofJson() {
    }

    /** The goodness-of-fit result file of docs/cli-contract.md; {@code seed} is reported with toys. */
    static ObjectNode of(CompiledModel m, FitOptions.Prepared p, GoodnessOfFit.Result r, ToyPValue toy, long seed) {
        ObjectNode root = Json.result(m.labels(), p.kind());
        if (p.asimovPoi() != null) root.put("asimovPoi", p.asimovPoi());
        root.put("method", "saturated");
        Json.put(root, "statistic", r.statistic());
        root.put("ndof", r.ndof());
        Json.put(root, "p", r.p());
        Json.put(root, "constraintStatistic", r.constraintStatistic());
        ArrayNode channels = root.putArray("channels");
        for (int c = 0; c < m.nChannels(); c++) {
            ObjectNode o = channels.addObject();
            o.put("name", m.channelNames(c));
            o.put("bins", r.channelBins()[c]);
            Json.put(o, "statistic", r.channelStatistic()[c]);
        }
        if (toy != null) {
            ObjectNode t = root.putObject("toys");
            t.put("toys", toy.toys());
            t.put("failed", toy.failed());
            t.put("exceeding", toy.exceeding());
            Json.put(t, "p", toy.p());
            Json.put(t, "pError", toy.error());
            t.put("seed", seed);
        }
        return root;
    }
}
