package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.ProfileScan;
import java.util.List;

/** The scan result file of docs/cli-contract.md: the one mapping for {@code plumb scan} and the report's json/scan.json. */
final class ScanJson {

    private ScanJson() {
    }

    /** The scan result file of docs/cli-contract.md; the points re-based (nllAboveMin from the lowest −ln L found). */
    static ObjectNode of(CompiledModel m, FitOptions.Prepared p, int k, FitResult best,
                             List<ProfileScan.Point> pts, List<ProfileScan.Interval> intervals) {
        ObjectNode root = Json.result(m.labels(), p.kind());
        root.put("parameter", m.parameterNames(k));
        ArrayNode a = root.putArray("points");
        for (ProfileScan.Point x : pts) {
            ObjectNode o = a.addObject();
            Json.put(o, "value", x.value());
            Json.put(o, "nllAboveMin", x.nllAboveMin());
            o.put("status", x.status().name());
        }
        Json.put(root, "best", best.values()[k]);
        Json.put(root, "error", best.errors()[k]);
        interval(root, "interval68", intervals.get(0));
        interval(root, "interval95", intervals.get(1));
        return root;
    }

    private static void interval(ObjectNode root, String key, ProfileScan.Interval iv) {
        ArrayNode a = root.putArray(key);
        Json.add(a, iv.low());
        Json.add(a, iv.high());
    }
}
