package plumb.cli;

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

    /** The models of a scan: their files, problems on observed data and positions, in the order given. */
    record Hypotheses(String key, List<Path> files, List<Problem> problems, double[] x, String dataKind) { }

    /**
     * The scan as {@code plumb discovery A B …} runs it, with a progress bar for the toys.
     *
     * @throws InputException for models without the label or a POI, blinded models, bad options
     * @throws ComputationException when a fit fails
     */
    static Result compute(List<Path> files, FitOptions fit, String label, double reference, Integer toys) {
        if (!(reference > 0)) throw new InputException("--reference must be positive, got " + reference);
        if (toys != null && toys < 1) throw new InputException("--toys must be at least 1, got " + toys);
        Hypotheses h = load(files, fit, label, toys);
        try (Progress bar = toys == null ? Progress.start("", 0)
                : Progress.start("toys across " + h.problems().size() + " models", toys)) {
            return of(h, DiscoveryAcrossModels.compute(h.problems(), h.x(), reference, toys, fit.seed, fit.threadCount(),
                    bar.callback()));
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
    }

    /**
     * Loads the models and builds their problems: each on its observed data, at the value of its label.
     *
     * @param toys the toy count, checked against the heap; null without toys
     * @throws InputException for models without the label or a POI, blinded models
     */
    static Hypotheses load(List<Path> files, FitOptions fit, String label, Integer toys) {
        List<Path> all = ModelLabels.modelFiles(files);
        List<ModelInput.Loaded> loaded = new ArrayList<>();
        for (Path f : all) loaded.add(ModelInput.load(f));
        if (toys != null) for (ModelInput.Loaded l : loaded) FitOptions.requireCount("--toys", toys, l.compiled());
        String key = label != null ? label : commonNumericLabel(loaded);
        List<Problem> problems = new ArrayList<>();
        List<Path> paths = new ArrayList<>();
        double[] x = new double[loaded.size()];
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
            x[problems.size()] = n.doubleValue();
            problems.add(Problem.of(m, d.data(), d.settings(), held));
            paths.add(l.file());
        }
        return new Hypotheses(key, List.copyOf(paths), List.copyOf(problems), x, kind);
    }

    /** The engine's scan with each point's model file. */
    static Result of(Hypotheses h, DiscoveryAcrossModels.Result r) {
        List<Point> points = new ArrayList<>();
        for (int i = 0; i < r.order().length; i++) {
            points.add(new Point(h.files().get(r.order()[i]), r.x()[i], r.observed().get(i)));
        }
        return new Result(h.key(), points, r.scan(), r.toys(), h.dataKind());
    }

    private static String commonNumericLabel(List<ModelInput.Loaded> loaded) {
        for (String k : loaded.get(0).compiled().labels().keySet()) {
            boolean all = true;
            for (ModelInput.Loaded l : loaded) all &= l.compiled().labels().get(k) instanceof Number;
            if (all) return k;
        }
        throw new InputException("--label: the models share no numeric label to order the scan by; name one with --label");
    }

}
