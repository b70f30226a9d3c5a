package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.plot.ProjectionFigure;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.Projection;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb project MODEL --lumi 1,2,5,10}: expected limit and significance with more data. */
@Command(name = "project", mixinStandardHelpOptions = true,
        description = {"Reach with more data: the expected CLs limit and the expected discovery significance (Asimov) "
                + "with every expected yield scaled by each luminosity factor, in three scenarios: systematics as they "
                + "are, MC-statistics errors scaled by 1/sqrt(L), statistics only."})
final class ProjectCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Option(names = "--lumi", paramLabel = "L[,L…]", split = ",", defaultValue = "1,2,5,10",
            description = "Luminosity factors (default: ${DEFAULT-VALUE}).")
    List<String> lumi;

    @Option(names = "--cl", converter = OptionValues.ConfidenceLevel.class, defaultValue = "0.95", paramLabel = "CL", description = "Confidence level of the limits (default: ${DEFAULT-VALUE}).")
    double cl;

    @Option(names = "--format", paramLabel = "text|markdown|csv|latex", defaultValue = "text",
            description = "Table format (default: ${DEFAULT-VALUE}).")
    String format;

    @Option(names = "--out", paramLabel = "FILE", description = "Write the table to FILE instead of the terminal.")
    String outFile;

    @Option(names = "--figure", paramLabel = "DIR", description = "Draw the projection into DIR/projection.png and .svg.")
    String figure;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        TableFormat tf = WhatIf.format(format);
        Path figureDir = WhatIf.figureDir(figure);
        double[] lumis = WhatIf.positives("--lumi", lumi);
        if (lumis.length == 0) throw new InputException("--lumi: give at least one luminosity factor");
        ModelInput.Loaded l = input.load();
        Projection.Result r = compute(l, fit, lumis, cl);
        CompiledModel m = l.compiled();
        var out = spec.commandLine().getOut();
        List<String> errors = new ArrayList<>();
        for (Projection.Point p : r.points()) {
            if (p.error() != null) errors.add("L = " + Numbers.plain(p.lumi()) + ", " + p.scenario().label() + ": " + p.error());
        }
        String failure = errors.isEmpty() ? null : String.join("; ", errors);
        if (json != null) {
            var root = toJson(m, r);
            if (failure != null) Json.failed(root, failure);
            Outputs.write(json, Json.write(root), out);
        }
        if (!"-".equals(json) || outFile != null) Outputs.write(outFile == null ? "-" : outFile, tf.render(table(r)), out);
        if (figureDir != null) WhatIf.writeFigure(figureDir, "projection", ProjectionFigure.of(r), out);
        out.flush();
        return Outputs.failedAfterWriting(spec, failure);
    }

    /**
     * @throws InputException for bad options
     * @throws ComputationException when the fit that sets the Asimov values fails
     */
    static Projection.Result compute(ModelInput.Loaded l, FitOptions fit, double[] lumis, double cl) {
        CompiledModel m = l.compiled();
        if (m.poi() < 0) throw new InputException(l.file() + ": the model names no parameter of interest (poi)");
        if (!(cl > 0 && cl < 1)) throw new InputException("--cl must lie between 0 and 1, got " + cl);
        try {
            return Projection.compute(WhatIf.problem(m, fit), WhatIf.postfit(fit), cl, lumis, fit.threadCount(), null);
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
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

    /** The projection file of docs/cli-contract.md. */
    static ObjectNode toJson(CompiledModel m, Projection.Result r) {
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
