package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.plot.SensitivityFigure;
import plumb.cli.table.Table;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Sensitivity;

import java.util.ArrayList;
import java.util.List;

/** The sensitivity ranking as JSON and tables, for {@code plumb sensitivity} and the report. */
final class SensitivityJson {

    private SensitivityJson() {
    }

    /** The parameter and group tables, one row per (target, change), ranked by the gain when removed. */
    static List<Table> tables(Sensitivity.Result r, int top) {
        List<Table> out = new ArrayList<>();
        out.add(table("Nuisance parameters ranked by the gain of the expected limit when removed (largest "
                + Math.min(top, r.parameters().size()) + " of " + r.parameters().size() + ")", "parameter", r,
                r.parameters().subList(0, Math.min(top, r.parameters().size()))));
        out.add(table("Groups", "group", r, r.groups()));
        return out;
    }

    private static Table table(String title, String what, Sensitivity.Result r, List<Sensitivity.Target> targets) {
        boolean exact = targets.stream().anyMatch(t -> t.removed().exact());
        List<String> header = new ArrayList<>(List.of("#", what, "change", "limit", "gain %", "Z_A", "gain %"));
        if (exact) header.addAll(List.of("limit exact", "Z_A exact"));
        Table.Builder b = Table.builder(title, header.toArray(new String[0]));
        int rank = 0;
        for (Sensitivity.Target t : targets) {
            rank++;
            for (Sensitivity.Variant v : t.variants()) {
                List<String> row = new ArrayList<>();
                row.add(v.scale() == 0 ? Integer.toString(rank) : "");
                row.add(v.scale() == 0 ? t.name() : "");
                row.add(change(v.scale()));
                row.add(Table.number(v.fastLimit(), 4));
                row.add(Numbers.fixed(SensitivityFigure.limitGain(v.fastLimit(), r.limit()), 2));
                row.add(Numbers.fixed(v.fastZ(), 3));
                row.add(Numbers.fixed(100 * (v.fastZ() / r.z() - 1), 2));
                if (exact) {
                    row.add(v.exact() ? Table.number(v.exactLimit(), 4) : Table.MISSING);
                    row.add(v.exact() ? Numbers.fixed(v.exactZ(), 3) : Table.MISSING);
                }
                b.row(row.toArray(new String[0]));
            }
        }
        return b.build();
    }

    private static String change(double k) {
        return k == 0 ? "removed" : "width x " + Numbers.plain(k);
    }

    /** The sensitivity file of docs/cli-contract.md. */
    static ObjectNode of(CompiledModel m, Sensitivity.Result r) {
        ObjectNode root = Json.result(m.labels(), "asimov");
        root.put("poi", r.poi());
        root.put("cl", r.cl());
        Json.array(root, "scales", r.scales());
        Json.put(root, "limit", r.limit());
        Json.put(root, "z", r.z());
        Json.put(root, "sigmaLimit", r.sigma0());
        Json.put(root, "sigmaDiscovery", r.sigma1());
        root.put("exactTop", r.exactTop());
        root.put("fits", r.fits());
        root.put("fastSeconds", r.fastSeconds());
        root.put("exactSeconds", r.exactSeconds());
        putTargets(root.putArray("parameters"), m, r.parameters());
        putTargets(root.putArray("groups"), m, r.groups());
        return root;
    }

    private static void putTargets(ArrayNode array, CompiledModel m, List<Sensitivity.Target> targets) {
        int rank = 0;
        for (Sensitivity.Target t : targets) {
            ObjectNode o = array.addObject();
            o.put("rank", ++rank);
            o.put("name", t.name());
            o.put("members", t.members().length);
            ArrayNode changes = o.putArray("changes");
            for (Sensitivity.Variant v : t.variants()) {
                ObjectNode c = changes.addObject();
                if (v.scale() == 0) c.put("change", "removed");
                else c.put("change", "scaled");
                Json.put(c, "scale", v.scale());
                Json.put(c, "limit", v.fastLimit());
                Json.put(c, "z", v.fastZ());
                Json.put(c, "sigmaLimit", v.fastSigma0());
                Json.put(c, "sigmaDiscovery", v.fastSigma1());
                if (v.exact()) {
                    ObjectNode e = c.putObject("exact");
                    Json.put(e, "limit", v.exactLimit());
                    Json.put(e, "z", v.exactZ());
                    Json.put(e, "sigmaDiscovery", v.exactSigma1());
                    if (v.exactError() != null) e.put("error", v.exactError());
                    else e.putNull("error");
                } else {
                    c.putNull("exact");
                }
            }
        }
    }
}
