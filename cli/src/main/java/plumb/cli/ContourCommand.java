package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.plot.ContourFigure;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Contour;
import plumb.engine.inference.InferenceException;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb contour MODEL --x NAME --y NAME}: 68 % and 95 % profile-likelihood regions of two parameters. */
@Command(name = "contour", mixinStandardHelpOptions = true,
        description = {"Two-parameter profile-likelihood regions: the 68.3%% and 95%% contours (2dNLL = 2.30 and 5.99, "
                + "chi-squared with two degrees of freedom), every other parameter refitted, each point found by "
                + "root-finding along a ray from the best fit."})
final class ContourCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Option(names = "--x", required = true, paramLabel = "NAME", description = "Parameter on the horizontal axis.")
    String x;

    @Option(names = "--y", required = true, paramLabel = "NAME", description = "Parameter on the vertical axis.")
    String y;

    @Option(names = "--rays", converter = OptionValues.Rays.class, defaultValue = "64", paramLabel = "N", description = "Points per contour (default: ${DEFAULT-VALUE}).")
    int rays;

    @Option(names = "--figure", paramLabel = "DIR", description = "Draw the regions into DIR/contour.png and .svg.")
    String figure;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        Path figureDir = WhatIf.figureDir(figure);
        ModelInput.Loaded l = input.load();
        FitOptions.Prepared p = fit.prepare(l.compiled(), 1.0);
        Contour.Result r = compute(l, fit, p, x, y, rays);
        CompiledModel m = l.compiled();
        PrintWriter out = spec.commandLine().getOut();
        String failure = ContourJson.failure(r);
        if (json != null) Outputs.write(json, Json.write(ContourJson.of(m, p.kind(), r)), out);
        if (!"-".equals(json)) print(out, l, r);
        if (figureDir != null) WhatIf.writeFigure(figureDir, "contour", ContourFigure.of(r), out);
        out.flush();
        return Outputs.failedAfterWriting(spec, failure);
    }

    /**
     * @throws InputException for unknown or held parameters and bad options
     * @throws ComputationException when the best fit fails
     */
    private static Contour.Result compute(ModelInput.Loaded l, FitOptions fit, FitOptions.Prepared p, String x, String y, int rays) {
        if (rays < 8) throw new InputException("--rays must be at least 8, got " + rays);
        CompiledModel m = l.compiled();
        FitOptions.requireCount("--rays", rays, m);
        for (String name : new String[] {x, y}) {
            if (m.indexOf(name) < 0) throw new InputException(String.format(Locale.ROOT, "--%s %s: the model has no parameter '%s'",
                    name.equals(x) ? "x" : "y", name, name));
        }
        try {
            return Contour.compute(p.problem(), x, y, Contour.DEFAULT_CLS, rays, fit.threadCount(), null);
        } catch (IllegalArgumentException e) {
            throw new InputException("--x/--y: " + e.getMessage());
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
    }

    private static void print(PrintWriter out, ModelInput.Loaded l, Contour.Result r) {
        out.printf(Locale.ROOT, "Profile-likelihood regions of %s and %s for model '%s' (%s)%n", r.xName(), r.yName(),
                l.compiled().name(), l.file());
        out.printf(Locale.ROOT, "  best fit %s = %s ± %s, %s = %s ± %s, correlation %s%n", r.xName(),
                Numbers.plain(r.xBest()), Numbers.plain(r.xError()), r.yName(), Numbers.plain(r.yBest()),
                Numbers.plain(r.yError()), Numbers.fixed(r.correlation(), 3));
        for (Contour.Region g : r.regions()) {
            double xl = Double.POSITIVE_INFINITY, xh = Double.NEGATIVE_INFINITY, yl = Double.POSITIVE_INFINITY,
                    yh = Double.NEGATIVE_INFINITY;
            int open = 0;
            for (int k = 0; k < g.x().length; k++) {
                if (!Double.isFinite(g.x()[k])) continue;
                xl = Math.min(xl, g.x()[k]);
                xh = Math.max(xh, g.x()[k]);
                yl = Math.min(yl, g.y()[k]);
                yh = Math.max(yh, g.y()[k]);
                if (g.open()[k]) open++;
            }
            out.printf(Locale.ROOT, "  %s CL (2dNLL = %s): %s in [%s, %s], %s in [%s, %s]%s%n",
                    Numbers.plain(Math.round(1000 * g.cl()) / 10.0) + "%", Numbers.fixed(g.level(), 3), r.xName(),
                    Numbers.plain(xl), Numbers.plain(xh), r.yName(), Numbers.plain(yl), Numbers.plain(yh),
                    open > 0 ? "; " + open + " points on a parameter bound (the region is open there)" : "");
        }
        out.printf(Locale.ROOT, "  %d rays, %d fits, %s s%n", r.rays(), r.fits(), Numbers.fixed(r.seconds(), 2));
    }

}
