package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.plot.ProjectionFigure;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.Projection;

import java.nio.file.Path;
import java.util.List;
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
        String failure = ProjectionJson.failure(r);
        if (json != null) Outputs.write(json, Json.write(ProjectionJson.of(m, r)), out);
        if (!"-".equals(json) || outFile != null) {
            Outputs.write(outFile == null ? "-" : outFile, tf.render(ProjectionJson.table(r)), out);
        }
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

}
