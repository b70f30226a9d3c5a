package plumb.cli;

import plumb.cli.plot.Figure;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.Problem;
import plumb.engine.likelihood.DataSet;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/** Option handling shared by the planning commands (sensitivity, project, contour). */
final class WhatIf {

    private WhatIf() {
    }

    /** A comma-separated list of positive numbers, e.g. "1,2,5,10". */
    static double[] positives(String option, List<String> text) {
        List<Double> out = new ArrayList<>();
        for (String part : text) {
            for (String s : part.split(",")) {
                if (s.isBlank()) continue;
                double v;
                try {
                    v = Double.parseDouble(s.trim());
                } catch (NumberFormatException e) {
                    throw new InputException(option + ": '" + s.trim() + "' is not a number");
                }
                if (!(v > 0 && Double.isFinite(v))) throw new InputException(option + ": " + s.trim() + " must be positive");
                out.add(v);
            }
        }
        return out.stream().mapToDouble(Double::doubleValue).toArray();
    }

    static TableFormat format(String format) {
        try {
            return TableFormat.parse(format);
        } catch (IllegalArgumentException e) {
            throw new InputException("--format: " + e.getMessage());
        }
    }

    /**
     * The problem of a planning command: the model, its held parameters (--fix) and settings; the
     * data set is the observed one when some channel has data, else the nominal Asimov set (it is
     * only used by commands that fit it).
     */
    static Problem problem(CompiledModel m, FitOptions fit) {
        Map<Integer, Double> fixes = fit.fixes(m);
        if (m.poi() >= 0 && fixes.containsKey(m.poi())) throw new InputException("--fix: the POI " + m.parameterNames(m.poi()) + " cannot be held");
        Map<String, Double> held = new java.util.LinkedHashMap<>();
        fixes.forEach((i, v) -> held.put(m.parameterNames(i), v));
        DataSet data = DataSet.observed(m);
        if (!data.anyChannel()) data = plumb.engine.inference.DataSets.asimov(m, m.nominal());
        return Problem.of(m, data, fit.settings(), held);
    }

    /** Whether Asimov data sets take post-fit nuisance values (the shared --asimov-from option). */
    static boolean postfit(FitOptions fit) {
        return fit.asimovFrom != FitOptions.AsimovFrom.prefit;
    }

    /** Checks that a figure folder can be made before any long computation. */
    static Path figureDir(String dir) {
        if (dir == null) return null;
        Path p = Path.of(dir);
        if (Files.exists(p) && !Files.isDirectory(p)) throw new InputException("--figure " + dir + ": not a folder");
        return p;
    }

    /** Writes NAME.png and NAME.svg into the folder; prints where. */
    static void writeFigure(Path dir, String name, Figure f, java.io.PrintWriter out) {
        try {
            Files.createDirectories(dir);
            var files = f.write(dir, name);
            out.printf(Locale.ROOT, "figure: %s, %s%n", files.png(), files.svg());
        } catch (IOException | RuntimeException e) {
            throw Outputs.cannotWrite(dir, e);
        }
    }
}
