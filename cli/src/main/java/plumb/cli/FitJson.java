package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitChecks;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Pulls;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/** The fit result file of docs/cli-contract.md: the one mapping for {@code plumb fit} and the report's json/fit.json. */
final class FitJson {

    private FitJson() {
    }

    /** Parameters listed per other minimum: those that differ most from the best fit. */
    static final int MOST_DIFFERENT = 3;

    /** The fit result file of docs/cli-contract.md. */
    static ObjectNode of(CompiledModel m, FitOptions.Prepared p, FitResult r) {
        ObjectNode root = Json.result(m.labels(), p.kind());
        if (p.asimovPoi() != null) root.put("asimovPoi", p.asimovPoi());
        root.put("converged", r.converged());
        root.put("status", r.status().name());
        Json.put(root, "nll", r.nll());
        ArrayNode params = root.putArray("parameters");
        for (int i = 0; i < m.nAll(); i++) {
            ObjectNode o = params.addObject();
            o.put("name", m.parameterNames(i));
            o.put("kind", m.kind(i).name().toLowerCase(Locale.ROOT));
            Json.put(o, "value", r.values()[i]);
            // at a bound the minimum is no stationary point: the curvature there is no error (null);
            // --intervals gives the one-sided profile interval
            Json.put(o, "error", r.checks().bound()[i] != 0 ? Double.NaN : r.errors()[i]);
            Json.put(o, "prefitValue", m.nominal(i));
            Json.put(o, "prefitWidth", m.prefitWidth(i));
            Json.put(o, "pull", Pulls.pull(m, r, i));
            Json.put(o, "constraint", Pulls.constraint(m, r, i));
            o.put("fixed", r.held()[i]);
            o.put("atKink", r.atKink()[i]);
            byte bound = r.checks().bound()[i];
            if (bound == 0) o.putNull("atBound");
            else o.put("atBound", bound < 0 ? "lower" : "upper");
        }
        FitChecks checks = r.checks();
        root.put("nearSingular", checks.nearSingular());
        Json.put(root, "smallestCorrelationEigenvalue", checks.smallestEigenvalue());
        ArrayNode degenerate = root.putArray("degenerate");
        for (int i : checks.degenerate()) degenerate.add(m.parameterNames(i));
        root.put("severalMinima", r.severalMinima());
        ArrayNode others = root.putArray("otherMinima");
        for (FitResult.OtherMinimum o : r.otherMinima()) {
            ObjectNode e = others.addObject();
            Json.put(e, "nllAboveBest", o.nllAboveBest());
            ArrayNode differ = e.putArray("differences");
            for (int i : o.mostDifferent(m, r, MOST_DIFFERENT)) {
                ObjectNode d = differ.addObject();
                d.put("name", m.parameterNames(i));
                Json.put(d, "value", o.values()[i]);
                Json.put(d, "bestValue", r.values()[i]);
            }
        }
        ObjectNode corr = root.putObject("correlation");
        List<Integer> free = new ArrayList<>();
        for (int i = 0; i < m.nParams(); i++) if (!r.held()[i]) free.add(i);
        ArrayNode names = corr.putArray("names");
        free.forEach(i -> names.add(m.parameterNames(i)));
        ArrayNode matrix = corr.putArray("matrix");
        for (int i : free) {
            ArrayNode row = matrix.addArray();
            for (int j : free) Json.add(row, r.correlation(i, j, m.nParams()));
        }
        ObjectNode timing = root.putObject("timing");
        timing.put("seconds", r.seconds());
        timing.put("evaluations", r.evaluations());
        return root;
    }
}
