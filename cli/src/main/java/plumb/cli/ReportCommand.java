package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import plumb.cli.report.RunSummary;

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

    @Option(names = "--toys", paramLabel = "N", defaultValue = "" + DEFAULT_TOYS,
            description = "Toys per injected value (1, 2, 3) of the injection test; 0 for the Asimov closure only "
                    + "(default: ${DEFAULT-VALUE}).")
    int toys;

    @Option(names = "--impacts-top", paramLabel = "N", defaultValue = "" + DEFAULT_IMPACTS_TOP,
            description = "Parameters whose impacts are refitted exactly and drawn; the rest are linearised (default: ${DEFAULT-VALUE}).")
    int impactsTop;

    @Option(names = "--label", paramLabel = "KEY",
            description = "Label of the models that orders the limits (default: the first numeric label all models have).")
    String label;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (toys < 0) throw new InputException("--toys must be at least 0, got " + toys);
        if (impactsTop < 1) throw new InputException("--impacts-top must be at least 1, got " + impactsTop);
        List<Path> files = LimitCommand.modelFiles(models);
        return run(new ReportJob(files, fit, toys, impactsTop, label), out, spec.commandLine().getOut(),
                spec.commandLine().getErr(), "report");
    }

    /** Runs a report job, prints where the page is and what failed; the exit status. */
    static int run(ReportJob job, Path dir, PrintWriter out, PrintWriter err, String command) {
        long t0 = System.nanoTime();
        ReportJob.Outcome o = job.run(dir);
        RunSummary s = o.summary();
        out.printf(Locale.ROOT, "Report written to %s (%s)%n", o.index(), duration((System.nanoTime() - t0) * 1e-9));
        out.flush();
        for (RunSummary.Failure f : s.failures()) err.printf("plumb %s: %s failed: %s%n", command, f.section(), f.message());
        for (String f : s.nonConverged()) err.printf("plumb %s: did not converge: %s%n", command, f);
        err.flush();
        return s.anyFailure() ? ExitCodes.FAILED : ExitCodes.OK;
    }

    private static String duration(double seconds) {
        return String.format(Locale.ROOT, "%.1f s", seconds);
    }
}
