package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.ToyPValue;

/** The discovery result file of docs/cli-contract.md: the one mapping for {@code plumb discovery} and the report's json/discovery.json. */
final class DiscoveryJson {

    private DiscoveryJson() {
    }

    /** The discovery result file of docs/cli-contract.md; {@code seed} is reported with toys. */
    static ObjectNode of(CompiledModel m, PoiData d, Discovery.Significance observed, Discovery.Significance expected,
                         ToyPValue toy, long seed) {
        ObjectNode root = Json.result(m.labels(), d.kind());
        root.put("poi", m.parameterNames(m.poi()));
        root.put("statistic", "q0");
        if (observed == null) root.putNull("observed");
        else put(root.putObject("observed"), observed);
        ObjectNode e = root.putObject("expected");
        put(e, expected);
        e.put("asimovPoi", d.expectedPoi());
        if (toy != null) {
            ObjectNode t = root.putObject("toys");
            t.put("toys", toy.toys());
            t.put("failed", toy.failed());
            t.put("exceeding", toy.exceeding());
            Json.put(t, "p", toy.p());
            Json.put(t, "pError", toy.error());
            Json.put(t, "z", toy.z());
            t.put("seed", seed);
        }
        return root;
    }

    private static void put(ObjectNode node, Discovery.Significance s) {
        Json.put(node, "q0", s.q0());
        Json.put(node, "z", s.z());
        Json.put(node, "p", s.p());
        Json.put(node, "muHat", s.muHat());
    }
}
