package plumb.cli;

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
        if (json != null) Outputs.write(json, Json.write(SensitivityJson.of(m, r)), out);
        if (!"-".equals(json) || outFile != null) {
            StringBuilder text = new StringBuilder();
            if (tf == TableFormat.TEXT) text.append(headline(m, r, l.file().toString()));
            for (Table t : SensitivityJson.tables(r, top)) {
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

}
