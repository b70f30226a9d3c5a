package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Contour;

/** The two-parameter regions as JSON, for {@code plumb contour} and the report. */
final class ContourJson {

    private ContourJson() {
    }

    /**
     * The contour file of docs/cli-contract.md; {@code converged: false} and {@code failure} when
     * some points could not be found.
     *
     * @param data the kind of the data set fitted ("observed", "asimov")
     */
    static ObjectNode of(CompiledModel m, String data, Contour.Result r) {
        ObjectNode root = ofResult(m, data, r);
        String failure = failure(r);
        if (failure != null) Json.failed(root, failure);
        return root;
    }

    /** Why the regions are incomplete, or null. */
    static String failure(Contour.Result r) {
        int failed = r.regions().stream().mapToInt(Contour.Region::failed).sum();
        return failed == 0 ? null : failed + " contour points could not be found: their refits did not converge";
    }

    /** The contour file of docs/cli-contract.md, without its failure keys. */
    private static ObjectNode ofResult(CompiledModel m, String data, Contour.Result r) {
        ObjectNode root = Json.result(m.labels(), data);
        root.put("x", r.xName());
        root.put("y", r.yName());
        ObjectNode best = root.putObject("best");
        Json.put(best, "x", r.xBest());
        Json.put(best, "y", r.yBest());
        Json.put(best, "xError", r.xError());
        Json.put(best, "yError", r.yError());
        Json.put(best, "correlation", r.correlation());
        Json.put(best, "nll", r.nllMin());
        root.put("rays", r.rays());
        root.put("fits", r.fits());
        root.put("seconds", r.seconds());
        ArrayNode regions = root.putArray("regions");
        for (Contour.Region g : r.regions()) {
            ObjectNode o = regions.addObject();
            o.put("cl", g.cl());
            o.put("level", g.level());
            Json.array(o, "x", g.x());
            Json.array(o, "y", g.y());
            ArrayNode open = o.putArray("open");
            for (boolean b : g.open()) open.add(b);
            o.put("failed", g.failed());
        }
        return root;
    }
}
