package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.table.Table;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.DiscoveryAcrossModels;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.LookElsewhere;
import plumb.engine.inference.Problem;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * {@code plumb discovery A.json B.json … --label mass}: the discovery test at every signal
 * hypothesis of a search, the local p-value curve and the global significance of the largest
 * excess (look-elsewhere effect, Gross–Vitells up-crossings; optionally background-only toys).
 */
final class DiscoveryScan {

    private DiscoveryScan() {
    }

    /** One mass point. */
    record Point(Path file, double x, Discovery.Significance observed) { }

    /** The scan, its Gross–Vitells estimate and the toys (null without). */
    record Result(String key, List<Point> points, LookElsewhere.Scan scan, LookElsewhere.Toys toys, String dataKind) { }

    /**
     * @throws InputException for models without the label or a POI, blinded models, bad options
     * @throws ComputationException when a fit fails
     */
    static Result compute(List<Path> files, FitOptions fit, String label, double reference, Integer toys) {
        if (!(reference > 0)) throw new InputException("--reference must be positive, got " + reference);
        if (toys != null && toys < 1) throw new InputException("--toys must be at least 1, got " + toys);
        List<Path> all = ModelLabels.modelFiles(files);
        List<ModelInput.Loaded> loaded = new ArrayList<>();
        for (Path f : all) loaded.add(ModelInput.load(f));
        if (toys != null) for (ModelInput.Loaded l : loaded) FitOptions.requireCount("--toys", toys, l.compiled());
        String key = label != null ? label : commonNumericLabel(loaded);
        List<Problem> problems = new ArrayList<>();
        List<double[]> xs = new ArrayList<>();
        String kind = null;
        for (ModelInput.Loaded l : loaded) {
            CompiledModel m = l.compiled();
            Object v = m.labels().get(key);
            if (!(v instanceof Number n)) {
                throw new InputException(String.format(Locale.ROOT, "--label %s: %s has no numeric label '%s' (labels.%s)",
                        key, l.file(), key, key));
            }
            PoiData d = PoiData.resolve(l.file(), m, fit, 1.0, 1.0);
            if (d.blinded()) throw new InputException(l.file() + ": the model is blinded; a scan of the local p-value needs data");
            kind = d.kind();
            Map<String, Double> held = new LinkedHashMap<>();
            for (int k = 0; k < d.held().length; k++) held.put(m.parameterNames(d.held()[k]), d.heldValues()[k]);
            problems.add(Problem.of(m, d.data(), d.settings(), held));
            xs.add(new double[] {n.doubleValue()});
        }
        double[] x = xs.stream().mapToDouble(v -> v[0]).toArray();
        try (Progress bar = toys == null ? Progress.start("", 0)
                : Progress.start("toys across " + problems.size() + " models", toys)) {
            DiscoveryAcrossModels.Result r = DiscoveryAcrossModels.compute(problems, x, reference, toys, fit.seed,
                    fit.threadCount(), bar.callback());
            List<Point> points = new ArrayList<>();
            for (int i = 0; i < r.order().length; i++) {
                points.add(new Point(loaded.get(r.order()[i]).file(), r.x()[i], r.observed().get(i)));
            }
            return new Result(key, points, r.scan(), r.toys(), kind);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
    }

    private static String commonNumericLabel(List<ModelInput.Loaded> loaded) {
        for (String k : loaded.get(0).compiled().labels().keySet()) {
            boolean all = true;
            for (ModelInput.Loaded l : loaded) all &= l.compiled().labels().get(k) instanceof Number;
            if (all) return k;
        }
        throw new InputException("--label: the models share no numeric label to order the scan by; name one with --label");
    }

    /** The local results, one row per model. */
    static Table table(Result r) {
        Table.Builder b = Table.builder("Local discovery tests across " + r.key(), r.key(), "best fit", "q0", "local Z",
                "local p", "model");
        for (Point p : r.points()) {
            b.row(Numbers.plain(p.x()), Table.number(p.observed().muHat(), 4), Table.number(p.observed().q0(), 4),
                    Numbers.fixed(p.observed().z(), 3), Table.number(p.observed().p(), 3), p.file().getFileName().toString());
        }
        return b.build();
    }

    /** The lines under the table: the global result. */
    static String summary(Result r) {
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
    static ObjectNode toJson(Result r) {
        ObjectNode root = Json.result(Map.of(), r.dataKind());
        root.put("label", r.key());
        root.put("statistic", "q0");
        ArrayNode points = root.putArray("points");
        for (Point p : r.points()) {
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
