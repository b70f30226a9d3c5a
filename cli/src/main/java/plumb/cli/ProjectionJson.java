package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.table.Table;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Projection;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/** The luminosity projection as JSON and a table, for {@code plumb project} and the report. */
final class ProjectionJson {

    private ProjectionJson() {
    }

    /** The projection file of docs/cli-contract.md; {@code converged: false} and {@code failure} when a point failed. */
    static ObjectNode of(CompiledModel m, Projection.Result r) {
        ObjectNode root = ofResult(m, r);
        String failure = failure(r);
        if (failure != null) Json.failed(root, failure);
        return root;
    }

    /** The points that failed, one clause each, or null when none did. */
    static String failure(Projection.Result r) {
        List<String> errors = new ArrayList<>();
        for (Projection.Point p : r.points()) {
            if (p.error() != null) errors.add("L = " + Numbers.plain(p.lumi()) + ", " + p.scenario().label() + ": " + p.error());
        }
        return errors.isEmpty() ? null : String.join("; ", errors);
    }

    /** One row per luminosity factor: limit and Z_A of each scenario. */
    static Table table(Projection.Result r) {
        List<String> header = new ArrayList<>(List.of("L"));
        for (Projection.Scenario s : Projection.Scenario.values()) {
            String tag = switch (s) {
                case SYSTEMATICS -> "systematics";
                case MC_SCALED -> "MC 1/sqrt(L)";
                case STAT_ONLY -> "stat only";
            };
            header.add("limit, " + tag);
            header.add("Z_A, " + tag);
        }
        Table.Builder b = Table.builder(String.format(Locale.ROOT,
                "Expected %s%% CL limit on %s and expected significance Z_A [sigma] against the luminosity factor L (systematics as they are; MC-statistics errors scaled 1/sqrt(L); statistics only)",
                Numbers.plain(100 * r.cl()), r.poi()), header.toArray(new String[0]));
        for (double lumi : r.lumis()) {
            List<String> row = new ArrayList<>(List.of(Numbers.plain(lumi)));
            for (Projection.Scenario s : Projection.Scenario.values()) {
                Projection.Point p = r.at(lumi, s);
                row.add(Table.number(p.limit(), 4));
                row.add(Double.isFinite(p.z()) ? Numbers.fixed(p.z(), 3) : Table.MISSING);
            }
            b.row(row);
        }
        return b.build();
    }

    /** The projection file of docs/cli-contract.md, without its failure keys. */
    private static ObjectNode ofResult(CompiledModel m, Projection.Result r) {
        ObjectNode root = Json.result(m.labels(), "asimov");
        root.put("poi", r.poi());
        root.put("cl", r.cl());
        Json.array(root, "lumi", r.lumis());
        root.put("fits", r.fits());
        root.put("seconds", r.seconds());
        ObjectNode scenarios = root.putObject("scenarios");
        for (Projection.Scenario s : Projection.Scenario.values()) {
            ObjectNode o = scenarios.putObject(s.key());
            o.put("description", s.label());
            ArrayNode points = o.putArray("points");
            for (double lumi : r.lumis()) {
                Projection.Point p = r.at(lumi, s);
                ObjectNode q = points.addObject();
                q.put("lumi", lumi);
                Json.put(q, "limit", p.limit());
                Json.array(q, "bands", p.bands().toArray());
                Json.put(q, "z", p.z());
                if (p.error() != null) q.put("error", p.error());
                else q.putNull("error");
            }
        }
        return root;
    }
}
