package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.plot.SensitivityFigure;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.Problem;
import plumb.engine.inference.Sensitivity;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/**
 * {@code plumb sensitivity MODEL}: how much the expected limit and the expected significance gain
 * when each nuisance parameter or group is removed or its pre-fit width scaled.
 */
@Command(name = "sensitivity", mixinStandardHelpOptions = true,
        description = {"Which uncertainty limits the search: the expected CLs limit and the expected discovery "
                + "significance (Asimov) as they are, and with each nuisance parameter and each group removed (held at "
                + "its Asimov value) or its pre-fit width scaled (--scale).",
                "Fast path from the Asimov Fisher information for every entry; exact asymptotic recomputation for the "
                        + "top entries with --exact-top."})
final class SensitivityCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Option(names = "--scale", paramLabel = "K[,K…]", split = ",", defaultValue = "0.5",
            description = "Width factors to try besides removal (default: ${DEFAULT-VALUE}; several allowed).")
    List<String> scale;

    @Option(names = "--exact-top", converter = OptionValues.NonNegative.class, paramLabel = "N", defaultValue = "0",
            description = "Recompute the top N parameters and the top N groups exactly (default: ${DEFAULT-VALUE}).")
    int exactTop;

    @Option(names = "--top", converter = OptionValues.Positive.class, paramLabel = "N", defaultValue = "20",
            description = "Parameters shown in the table and the figure (default: ${DEFAULT-VALUE}).")
    int top;

    @Option(names = "--cl", converter = OptionValues.ConfidenceLevel.class, defaultValue = "0.95", paramLabel = "CL", description = "Confidence level of the limits (default: ${DEFAULT-VALUE}).")
    double cl;

    @Option(names = "--format", paramLabel = "text|markdown|csv|latex", defaultValue = "text",
            description = "Table format (default: ${DEFAULT-VALUE}).")
    String format;

    @Option(names = "--out", paramLabel = "FILE", description = "Write the tables to FILE instead of the terminal.")
    String outFile;

    @Option(names = "--figure", paramLabel = "DIR", description = "Draw the ranking into DIR/sensitivity.png and .svg.")
    String figure;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        TableFormat tf = WhatIf.format(format);
        if (top < 1) throw new InputException("--top must be at least 1, got " + top);
        Path figureDir = WhatIf.figureDir(figure);
        ModelInput.Loaded l = input.load();
        Sensitivity.Result r = compute(l, fit, WhatIf.positives("--scale", scale), exactTop, cl);
        CompiledModel m = l.compiled();
        var out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(toJson(m, r)), out);
        if (!"-".equals(json) || outFile != null) {
            StringBuilder text = new StringBuilder();
            if (tf == TableFormat.TEXT) text.append(headline(m, r, l.file().toString()));
            for (Table t : tables(r, top)) {
                text.append(tf.render(t));
                if (tf != TableFormat.CSV) text.append('\n');
            }
            Outputs.write(outFile == null ? "-" : outFile, text.toString(), out);
        }
        if (figureDir != null && !r.parameters().isEmpty()) {
            WhatIf.writeFigure(figureDir, "sensitivity", SensitivityFigure.of(r, r.parameters(), top, "nuisance parameters"), out);
        }
        out.flush();
        return ExitCodes.OK;
    }

    /**
     * The ranking with the shared options.
     *
     * @throws InputException for bad options
     * @throws ComputationException when a fit of the model as it is fails
     */
    static Sensitivity.Result compute(ModelInput.Loaded l, FitOptions fit, double[] scales, int exactTop, double cl) {
        CompiledModel m = l.compiled();
        if (m.poi() < 0) throw new InputException(l.file() + ": the model names no parameter of interest (poi)");
        if (exactTop < 0) throw new InputException("--exact-top must be at least 0, got " + exactTop);
        if (!(cl > 0 && cl < 1)) throw new InputException("--cl must lie between 0 and 1, got " + cl);
        Problem p = WhatIf.problem(m, fit);
        int threads = fit.threadCount();
        try (Progress bar = exactTop > 0 ? Progress.start("exact recomputations", 2L * exactTop * (scales.length + 1)) : null) {
            return Sensitivity.compute(Sensitivity.request(p, WhatIf.postfit(fit), cl, scales, exactTop, threads),
                    bar == null ? null : bar.callback());
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
    }

    private static String headline(CompiledModel m, Sensitivity.Result r, String file) {
        return String.format(Locale.ROOT, "Sensitivity of model '%s' (%s)%n"
                        + "  as it is: expected %s CL limit on %s = %s, expected significance Z_A = %s sigma "
                        + "(sigma_%s = %s at mu = 0, %s at mu = 1, Asimov Fisher information)%n"
                        + "  fast path %s s; %s%n%n",
                m.name(), file, pct(r.cl()), r.poi(), Table.number(r.limit(), 4), Numbers.fixed(r.z(), 3), r.poi(),
                Table.number(r.sigma0(), 4), Table.number(r.sigma1(), 4), Numbers.fixed(r.fastSeconds(), 4),
                r.exactTop() > 0 ? String.format(Locale.ROOT, "exact path for the top %d, %s s", r.exactTop(),
                        Numbers.fixed(r.exactSeconds(), 2)) : "no exact recomputation (--exact-top N)");
    }

    private static String pct(double cl) {
        return Numbers.plain(100 * cl) + "%";
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
    static ObjectNode toJson(CompiledModel m, Sensitivity.Result r) {
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
