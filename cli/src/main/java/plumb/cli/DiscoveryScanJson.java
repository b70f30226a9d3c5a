package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.table.Table;
import plumb.engine.inference.LookElsewhere;

import java.util.Locale;
import java.util.Map;

/** The discovery test across several models as JSON, a table and summary lines, for {@code plumb discovery A B …} and the report. */
final class DiscoveryScanJson {

    private DiscoveryScanJson() {
    }

    /** The local results, one row per model. */
    static Table table(DiscoveryScan.Result r) {
        Table.Builder b = Table.builder("Local discovery tests across " + r.key(), r.key(), "best fit", "q0", "local Z",
                "local p", "model");
        for (DiscoveryScan.Point p : r.points()) {
            b.row(Numbers.plain(p.x()), Table.number(p.observed().muHat(), 4), Table.number(p.observed().q0(), 4),
                    Numbers.fixed(p.observed().z(), 3), Table.number(p.observed().p(), 3), p.file().getFileName().toString());
        }
        return b.build();
    }

    /** The lines under the table: the global result. */
    static String summary(DiscoveryScan.Result r) {
        LookElsewhere.Scan s = r.scan();
        StringBuilder b = new StringBuilder();
        b.append(String.format(Locale.ROOT, "largest excess at %s = %s: q0 = %s, local Z = %s sigma, local p = %s%n",
                r.key(), Numbers.plain(s.x()[s.best()]), Table.number(s.qMax(), 4), Numbers.fixed(s.zLocal(), 3),
                Table.number(s.pLocalMax(), 3)));
        b.append(String.format(Locale.ROOT, "global (Gross-Vitells up-crossings): reference level q0 = %s crossed upwards "
                        + "%d times; global p = %s, global Z = %s sigma, trials factor %s%n",
                Numbers.plain(s.reference()), s.upcrossings(), Table.number(s.pGlobal(), 3), Numbers.fixed(s.zGlobal(), 3),
                Table.number(s.trials(), 3)));
        LookElsewhere.Toys t = r.toys();
        if (t != null) {
            b.append(String.format(Locale.ROOT, "global from %d background-only toys (seed %d): p = %s ± %s, Z = %s sigma "
                            + "(%d toys with a larger largest q0; %d failed); mean up-crossings of the reference level %s ± %s%n",
                    t.global().toys(), t.seed(), Table.number(t.global().p(), 3), Table.number(t.global().error(), 2),
                    Numbers.fixed(t.zGlobal(), 3), t.global().exceeding(), t.global().failed(),
                    Table.number(t.meanCrossings()[0], 3), Table.number(t.crossingErrors()[0], 2)));
        }
        return b.toString();
    }

    /** The scan file of docs/cli-contract.md. */
    static ObjectNode of(DiscoveryScan.Result r) {
        ObjectNode root = Json.result(Map.of(), r.dataKind());
        root.put("label", r.key());
        root.put("statistic", "q0");
        ArrayNode points = root.putArray("points");
        for (DiscoveryScan.Point p : r.points()) {
            ObjectNode o = points.addObject();
            o.put("model", p.file().toString());
            Json.put(o, "x", p.x());
            Json.put(o, "q0", p.observed().q0());
            Json.put(o, "z", p.observed().z());
            Json.put(o, "p", p.observed().p());
            Json.put(o, "muHat", p.observed().muHat());
        }
        LookElsewhere.Scan s = r.scan();
        ObjectNode g = root.putObject("global");
        Json.put(g, "x", s.x()[s.best()]);
        Json.put(g, "q0", s.qMax());
        Json.put(g, "localZ", s.zLocal());
        Json.put(g, "localP", s.pLocalMax());
        g.put("reference", s.reference());
        g.put("upcrossings", s.upcrossings());
        Json.put(g, "p", s.pGlobal());
        Json.put(g, "z", s.zGlobal());
        Json.put(g, "trials", s.trials());
        LookElsewhere.Toys t = r.toys();
        if (t == null) {
            root.putNull("toys");
        } else {
            ObjectNode o = root.putObject("toys");
            o.put("toys", t.global().toys());
            o.put("failed", t.global().failed());
            o.put("exceeding", t.global().exceeding());
            Json.put(o, "p", t.global().p());
            Json.put(o, "pError", t.global().error());
            Json.put(o, "z", t.zGlobal());
            o.put("seed", t.seed());
            Json.array(o, "levels", t.levels());
            Json.array(o, "meanUpcrossings", t.meanCrossings());
            Json.array(o, "upcrossingErrors", t.crossingErrors());
        }
        return root;
    }
}
