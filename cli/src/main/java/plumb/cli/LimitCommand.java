package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.table.Escape;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.WorkRunner;
import plumb.engine.inference.AsymptoticLimitWork;
import plumb.engine.inference.ExpectedBands;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.ParallelRunner;
import plumb.engine.inference.ToyLimits;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

/**
 * {@code plumb limit MODEL…}: CLs upper limits on the POI with q̃μ, asymptotic or from toys; with
 * several models (one per signal hypothesis) a table of limits against one of their labels.
 */
@Command(name = "limit", mixinStandardHelpOptions = true,
        description = {"CLs upper limit on the parameter of interest with the q~mu test statistic: asymptotic "
                + "formulae by default, toys with --toys.",
                "Several models (files or folders), one per signal hypothesis, give one table of limits against "
                        + "a label of the models (--label)."})
final class LimitCommand implements Callable<Integer> {

    @Parameters(arity = "1..*", paramLabel = "MODEL",
            description = "Model files (.json or .json.gz), or folders whose model files are all taken.")
    List<Path> models;

    @Mixin FitOptions fit;

    @Mixin ClusterOptions cluster;

    @Option(names = "--cl", converter = OptionValues.ConfidenceLevel.class, defaultValue = "0.95", paramLabel = "CL",
            description = "Confidence level, e.g. 0.95 or 0.90 (default: ${DEFAULT-VALUE}).")
    double cl;

    @Option(names = "--toys", converter = OptionValues.Positive.class, paramLabel = "N",
            description = "Toy-based CLs with N toys per hypothesis at each POI value tested.")
    Integer toys;

    @Option(names = "--label", paramLabel = "KEY",
            description = "Label of the models that gives each limit its x value (default: the first numeric label all models have).")
    String label;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Option(names = "--csv", paramLabel = "FILE", description = "Write the table of limits as CSV.")
    String csv;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (!(cl > 0 && cl < 1)) throw new InputException("--cl must lie between 0 and 1, got " + cl);
        if (toys != null && toys < 1) throw new InputException("--toys must be at least 1, got " + toys);
        LimitTable c = compute();
        List<ModelLimit> outcomes = c.outcomes();
        String key = c.key();
        PrintWriter out = spec.commandLine().getOut();
        List<String> errors = c.errors();
        if (json != null) Outputs.write(json, Json.write(LimitJson.of(outcomes, key, cl, toys, fit.seed)), out);
        if (csv != null) Outputs.write(csv, TableFormat.CSV.render(table(outcomes, key)), out);
        if (!"-".equals(json)) {
            if (outcomes.size() == 1) printSingle(out, outcomes.get(0));
            else out.print(TableFormat.TEXT.render(table(outcomes, key)));
            out.flush();
        }
        if (!errors.isEmpty()) {
            // the result file is written already, with its failure (not the bare one of Main)
            spec.commandLine().getErr().println("plumb limit: " + Escape.controls(String.join("; ", errors)));
            spec.commandLine().getErr().flush();
            return ExitCodes.FAILED;
        }
        return ExitCodes.OK;
    }

    /** Every model's outcome, ordered by x, and the label key x comes from (null: none). */
    record LimitTable(List<ModelLimit> outcomes, String key) {
        /** The outcomes that have no limit, with why. */
        List<String> errors() {
            return ModelLimit.errors(outcomes);
        }
    }

    /**
     * The limits of every model named: a limit that cannot be computed is an outcome with its
     * error, not an exception.
     *
     * @throws InputException for options that do not fit the models
     */
    LimitTable compute() {
        List<Path> files = ModelLabels.modelFiles(models);
        List<ModelInput.Loaded> loaded = new ArrayList<>();
        for (Path f : files) loaded.add(ModelInput.load(f));
        if (toys != null) for (ModelInput.Loaded l : loaded) FitOptions.requireCount("--toys", toys, l.compiled());
        String key = ModelLabels.key(loaded, label);
        double[] xs = new double[loaded.size()];
        for (int i = 0; i < xs.length; i++) xs[i] = ModelLabels.x(loaded.get(i), key);
        int threads = fit.threadCount();
        // Resolve every model's data first: bad options fail before any long computation.
        List<PoiData> data = new ArrayList<>();
        for (ModelInput.Loaded l : loaded) data.add(PoiData.resolve(l.file(), l.compiled(), fit, 0.0, 0.0));
        List<ModelLimit> outcomes = new ArrayList<>();
        try (WorkRunner runner = ClusterOptions.runner(cluster, threads)) {
            if (toys == null) {
                // Asymptotic limits: one model per thread or task, each computed sequentially (deterministic).
                outcomes.addAll(ModelLimit.asymptotic(loaded, xs, data, cl, runner));
            } else {
                for (int i = 0; i < loaded.size(); i++) {
                    try (Progress bar = Progress.start("toys " + loaded.get(i).file().getFileName(),
                            ToyLimits.firstTasks(toys))) {
                        outcomes.add(compute(loaded.get(i), xs[i], data.get(i), runner, bar));
                    }
                }
            }
        }
        outcomes = new ArrayList<>(outcomes);
        outcomes.sort(Comparator.comparingDouble(ModelLimit::x));
        return new LimitTable(outcomes, key);
    }

    /** The toy limit of one model, its toys run by {@code runner}. */
    private ModelLimit compute(ModelInput.Loaded l, double x, PoiData d, WorkRunner runner, Progress bar) {
        CompiledModel m = l.compiled();
        try {
            LimitResult r = ToyLimits.compute(new ToyLimits.Request(m, d.data(), d.generation(), d.expected(), d.settings(),
                    d.held(), d.heldValues(), cl, toys, fit.seed, 1), runner, bar.callback());
            return new ModelLimit(l, x, d, r, null);
        } catch (InferenceException e) {
            return new ModelLimit(l, x, d, null, e.getMessage());
        }
    }

    /** The table of limits, one row per model, ordered by x. */
    Table table(List<ModelLimit> outcomes, String key) {
        CompiledModel m0 = outcomes.get(0).model().compiled();
        String title = String.format(Locale.ROOT, "CLs upper limits on %s at %s%% CL (%s, q~mu statistic, %s data)",
                m0.parameterNames(m0.poi()), Numbers.plain(100 * cl), toys == null ? "asymptotic" : toys + " toys",
                outcomes.get(0).data().kind());
        Table.Builder t = Table.builder(title, key == null ? "x" : key, "model", "observed", "expected -2σ",
                "expected -1σ", "expected median", "expected +1σ", "expected +2σ");
        for (ModelLimit o : outcomes) {
            List<String> row = new ArrayList<>();
            row.add(Double.isNaN(o.x()) ? Table.MISSING : Table.number(o.x(), 6).replaceAll("\\.?0+$", ""));
            row.add(o.model().file().getFileName().toString());
            if (o.result() == null) {
                row.add("failed: " + o.error());
                for (int k = 0; k < 5; k++) row.add(Table.MISSING);
            } else {
                LimitResult r = o.result();
                row.add(cell(r.observed(), r.observedError()));
                double[] b = r.expected().toArray(), e = r.expectedError().toArray();
                for (int k = 0; k < 5; k++) row.add(cell(b[k], e[k]));
            }
            t.row(row);
        }
        return t.build();
    }

    private String cell(double value, double error) {
        if (toys != null && Double.isFinite(value)) return Table.measurement(value, error);
        return Table.number(value, 4);
    }

    private void printSingle(PrintWriter out, ModelLimit o) {
        CompiledModel m = o.model().compiled();
        String poi = m.parameterNames(m.poi());
        out.printf(Locale.ROOT, "CLs upper limit on %s at %s%% CL for model '%s' (%s)%n", poi, Numbers.plain(100 * cl),
                m.name(), o.model().file());
        if (toys == null) {
            out.printf(Locale.ROOT, "  method: asymptotic formulae for the q~mu test statistic (Cowan, Cranmer, Gross, "
                    + "Vitells 2011), sigma from the Asimov data set at %s = 0%n", poi);
        } else {
            out.printf(Locale.ROOT, "  method: toys, q~mu test statistic, %d toys per hypothesis at each of %d %s values, "
                    + "seed %d%n", toys, o.result() == null ? 0 : o.result().points().size(), poi, fit.seed);
        }
        PoiData d = o.data();
        out.printf(Locale.ROOT, "  data: %s%n", d.blinded() ? "model blinded: no observed limit; expected limits from "
                + "the Asimov data set at " + poi + " = 0"
                : d.kind().equals("asimov") ? "Asimov data set at " + poi + " = " + Numbers.plain(d.asimovPoi())
                : "observed data");
        LimitResult r = o.result();
        if (r == null) {
            out.println("  no limit: " + o.error());
            return;
        }
        if (!d.blinded()) out.printf(Locale.ROOT, "  best fit %s = %s%n", poi, Numbers.plain(r.muHat()));
        out.print(TableFormat.TEXT.render(limitTable(poi, r, d.blinded())).replaceAll("(?m)^", "  "));
        if (toys != null) {
            out.println("  errors are toy statistics");
            out.printf(Locale.ROOT, "  %d toys in all, %d with a fit that did not converge (left out)%n", r.toys(), r.failedToys());
            Table.Builder t = Table.builder(null, poi, "q~mu observed", "CLs+b", "CLb", "CLs");
            for (LimitResult.ClsPoint c : r.points()) {
                t.row(Table.number(c.mu(), 4), Table.number(c.qObserved(), 4), Table.number(c.clsb(), 4),
                        Table.number(c.clb(), 4), Table.measurement(c.cls(), c.clsError()));
            }
            out.print(TableFormat.TEXT.render(t.build()).replaceAll("(?m)^", "  "));
        }
        out.printf(Locale.ROOT, "  (%d fits, %.2f s)%n", r.fits(), r.seconds());
    }

    /**
     * The limits as one column of numbers, one row per outcome, the CL in the heading: observed
     * first (left out when blinded), then the expected median and its ±1σ and ±2σ quantiles.
     */
    Table limitTable(String poi, LimitResult r, boolean blinded) {
        Table.Builder t = Table.builder(null, "upper limit, " + Numbers.plain(100 * cl) + "% CL", poi + " <");
        if (!blinded) t.row("observed", value(r.observed(), r.observedError()));
        ExpectedBands b = r.expected(), e = r.expectedError();
        t.row("expected median", value(b.median(), e.median()));
        t.row("expected −1σ", value(b.minus1(), e.minus1()));
        t.row("expected +1σ", value(b.plus1(), e.plus1()));
        t.row("expected −2σ", value(b.minus2(), e.minus2()));
        t.row("expected +2σ", value(b.plus2(), e.plus2()));
        return t.build();
    }

    private String value(double v, double err) {
        return toys == null ? Numbers.plain(v) : Table.measurement(v, err);
    }
}
