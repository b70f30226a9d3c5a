package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import picocli.CommandLine.Command;
import plumb.cli.table.Escape;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import plumb.cli.report.RunSummary;
import plumb.cli.table.Table;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/**
 * {@code plumb report MODEL… --out DIR}: the whole analysis in one self-contained HTML page, with
 * every figure as PNG and SVG, every table as CSV, Markdown and LaTeX, and every command's JSON.
 */
@Command(name = "report", mixinStandardHelpOptions = true,
        description = {"The whole analysis in one report: check, fit, pulls, impacts, yields, POI scan, discovery, "
                + "limits, goodness of fit, Asimov closure and an injection test; DIR/index.html with every figure "
                + "(PNG and SVG), table (CSV, Markdown, LaTeX) and each command's JSON.",
                "The first model is the main one; every model given feeds the limits against --label."})
final class ReportCommand implements Callable<Integer> {

    /** Toys per injected value of the injection test, when --toys is not given. */
    static final int DEFAULT_TOYS = 200;

    /** Parameters refitted exactly and drawn in the impacts ranking, when --impacts-top is not given. */
    static final int DEFAULT_IMPACTS_TOP = 30;

    @Parameters(arity = "1..*", paramLabel = "MODEL",
            description = "Model files (.json or .json.gz) or folders of them; the first is the main one.")
    List<Path> models;

    @Mixin FitOptions fit;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Directory of the report (created when missing).")
    Path out;

    @Option(names = "--toys", converter = OptionValues.NonNegative.class, paramLabel = "N", defaultValue = "" + DEFAULT_TOYS,
            description = "Toys per injected value (1, 2, 3) of the injection test; 0 for the Asimov closure only "
                    + "(default: ${DEFAULT-VALUE}).")
    int toys;

    @Option(names = "--impacts-top", converter = OptionValues.Positive.class, paramLabel = "N", defaultValue = "" + DEFAULT_IMPACTS_TOP,
            description = "Parameters whose impacts are refitted exactly and drawn; the rest are linearised (default: ${DEFAULT-VALUE}).")
    int impactsTop;

    @Option(names = "--label", paramLabel = "KEY",
            description = "Label of the models that orders the limits (default: the first numeric label all models have).")
    String label;

    @Option(names = "--templates", description = "Also draw every variation's nominal, up and down templates "
            + "(a folded section; about a second per figure).")
    boolean templates;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (toys < 0) throw new InputException("--toys must be at least 0, got " + toys);
        if (impactsTop < 1) throw new InputException("--impacts-top must be at least 1, got " + impactsTop);
        List<Path> files = ModelLabels.modelFiles(models);
        ReportJob job = new ReportJob(files, fit, toys, impactsTop, label);
        job.templates = templates;
        return run(job, out, spec.commandLine().getOut(),
                spec.commandLine().getErr(), "report");
    }

    /** Runs a report job, prints where the page is and what failed; the exit status. */
    static int run(ReportJob job, Path dir, PrintWriter out, PrintWriter err, String command) {
        long t0 = System.nanoTime();
        ReportJob.Written o = job.run(dir);
        RunSummary s = o.summary();
        headline(dir.resolve("json"), out);
        out.printf(Locale.ROOT, "Report written to %s (%s)%n", o.index(), duration((System.nanoTime() - t0) * 1e-9));
        out.flush();
        for (RunSummary.Failure f : s.failures()) {
            err.printf("plumb %s: %s failed: %s%n", command, f.section(), Escape.controls(String.valueOf(f.message())));
        }
        for (String f : s.nonConverged()) err.printf("plumb %s: did not converge: %s%n", command, Escape.controls(f));
        err.flush();
        return s.anyFailure() ? ExitCodes.FAILED : ExitCodes.OK;
    }

    /**
     * The results an analyst quotes first, read back from the report's own JSON files (so they are
     * exactly what the page shows): the POI, the significance and the upper limit.
     */
    static void headline(Path jsonDir, PrintWriter out) {
        JsonNode discovery = readJson(jsonDir.resolve("discovery.json"));
        JsonNode fit = readJson(jsonDir.resolve("fit.json"));
        JsonNode limit = readJson(jsonDir.resolve("limit.json"));
        String poi = discovery != null && discovery.hasNonNull("poi") ? discovery.get("poi").asText() : null;
        if (fit != null && poi != null) {
            for (JsonNode p : fit.get("parameters")) {
                if (poi.equals(p.path("name").asText())) {
                    boolean blinded = discovery.path("observed").isNull() && "observed".equals(fit.path("data").asText());
                    out.printf(Locale.ROOT, "  best fit %s = %s (%s)%n", poi,
                            Table.measurement(p.path("value").asDouble(Double.NaN), p.path("error").asDouble(Double.NaN)),
                            blinded ? "observed data of the unblinded channels only: the model is blinded"
                                    : fit.path("data").asText() + " data");
                }
            }
        }
        if (discovery != null) {
            out.printf(Locale.ROOT, "  significance of the excess: observed %s, expected %s (q0, asymptotic)%n",
                    sigma(discovery.path("observed").path("z")), sigma(discovery.path("expected").path("z")));
        }
        if (limit != null && limit.has("expected")) {
            out.printf(Locale.ROOT, "  %s%% CLs upper limit on %s: observed %s, expected %s (%s)%n",
                    Numbers.plain(100 * limit.path("cl").asDouble()), poi == null ? "the POI" : poi,
                    number(limit.path("observed")), number(limit.path("expected").path("median")),
                    limit.path("method").asText());
        }
    }

    private static JsonNode readJson(Path file) {
        try {
            return java.nio.file.Files.isRegularFile(file) ? Json.mapper().readTree(file.toFile()) : null;
        } catch (java.io.IOException e) {
            return null;
        }
    }

    private static String sigma(JsonNode z) {
        return z.isNumber() ? String.format(Locale.ROOT, "%.2f σ", z.asDouble()) : "–";
    }

    private static String number(JsonNode v) {
        return v.isNumber() ? Table.number(v.asDouble(), 3) : "–";
    }

    private static String duration(double seconds) {
        return String.format(Locale.ROOT, "%.1f s", seconds);
    }
}
