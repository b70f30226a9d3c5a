package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.build.BuildOutcome;
import plumb.cli.build.EventBuilds;
import plumb.cli.io.AtomicFiles;
import plumb.models.DemoModel;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

/**
 * {@code plumb demo [--out DIR]}: the built-in demonstration model copied to DIR/model.json and
 * the whole report made on it. {@code plumb demo --events [DIR]}: the same scenario from invented
 * event tables, built into a model on Spark as {@code plumb build} does, and the report with the
 * build's cut flow.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = {"Run the whole report on the built-in demonstration model (a two-photon resonance at an "
                + "invented collider): copies it to DIR/model.json and writes DIR/index.html.",
                "With --events: invented event tables of the same scenario (Parquet, DIR/events), their build "
                + "description (DIR/build.json), the model built from them on Spark (DIR/model.json, cut flow in "
                + "DIR/model.cutflow.{txt,csv,tex}) and the report with a cut-flow section (DIR/report/index.html)."})
final class DemoCommand implements Callable<Integer> {

    /** Folders written when neither --out nor --events DIR names one. */
    static final String DEFAULT_DIR = "plumb-demo";
    static final String DEFAULT_EVENTS_DIR = "plumb-demo-events";

    @Option(names = "--out", paramLabel = "DIR",
            description = "Directory of the model and report (default: " + DEFAULT_DIR + ", with --events "
                    + DEFAULT_EVENTS_DIR + ").")
    Path out;

    @Option(names = "--events", arity = "0..1", paramLabel = "DIR", fallbackValue = "",
            description = "Start from invented event tables: write them, build the model on Spark, report with the "
                    + "cut flow; DIR as --out.")
    String events;

    @Option(names = "--spark", paramLabel = "MASTER",
            description = "With --events: where Spark runs (default: local[*], in this process).")
    String master;

    @Option(names = "--spark-timeout", converter = OptionValues.Positive.class, paramLabel = "S", defaultValue = "60",
            description = "With --events: seconds to wait for the Spark master (default: ${DEFAULT-VALUE}).")
    int timeout;

    @Option(names = "--toys", converter = OptionValues.NonNegative.class, paramLabel = "N", defaultValue = "" + ReportCommand.DEFAULT_TOYS,
            description = "Toys per injected value of the injection test (default: ${DEFAULT-VALUE}).")
    int toys;

    @Mixin FitOptions fit;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (toys < 0) throw new InputException("--toys must be at least 0, got " + toys);
        if (events != null) return fromEvents();
        if (master != null) throw new InputException("--spark: only with --events (the built-in model needs no Spark)");
        Path out = this.out == null ? Path.of(DEFAULT_DIR) : this.out;
        Path model = out.resolve("model.json");
        ReportJob.requireReportFolder(out, List.of(model));   // before the model is copied in
        ReportJob.requireOptions(plumb.engine.compile.ModelCompiler.compile(DemoModel.load()), fit, toys);
        try (InputStream in = DemoModel.openStream()) {
            byte[] bytes = in.readAllBytes();
            AtomicFiles.write(model, o -> o.write(bytes));
        } catch (IOException e) {
            throw new InputException("--out " + out + ": cannot write " + model + ": " + Outputs.cause(e));
        }
        ReportJob job = new ReportJob(List.of(model), fit, toys, ReportCommand.DEFAULT_IMPACTS_TOP, null);
        return ReportCommand.run(job, out, spec.commandLine().getOut(), spec.commandLine().getErr(), "demo");
    }

    /** The events demo: tables, description and model from the spark module, then the report with the cut flow. */
    private int fromEvents() {
        if (!events.isEmpty() && out != null) {
            throw new InputException("--events " + events + " and --out " + out + ": give the folder once");
        }
        String m = master == null ? "local[*]" : master;
        if (m.isBlank()) throw new InputException("--spark: the master is empty (local[*], spark://HOST:PORT or yarn)");
        Path dir = !events.isEmpty() ? Path.of(events) : out != null ? out : Path.of(DEFAULT_EVENTS_DIR);
        // the report replaces its folder whole, so it gets one of its own beside the tables and the model
        Path report = dir.resolve("report");
        ReportJob.requireReportFolder(report, List.of());   // before any work
        PrintWriter o = spec.commandLine().getOut(), e = spec.commandLine().getErr();
        BuildOutcome built = EventBuilds.demo(dir, m, timeout, fit.seed, o, e);
        ReportJob job = new ReportJob(List.of(built.model()), fit, toys, ReportCommand.DEFAULT_IMPACTS_TOP, null);
        job.cutFlow = built.cutFlow();
        int code = ReportCommand.run(job, report, o, e, "demo");
        String stem = built.model().getFileName().toString().replaceFirst("\\.json$", "");
        o.println("Events demo in " + dir + ":");
        o.printf("  %-20s %s%n", "event tables", dir.resolve("events").resolve("*.parquet"));
        o.printf("  %-20s %s  (plumb build %s --out MODEL builds it again)%n", "build description",
                dir.resolve("build.json"), dir.resolve("build.json"));
        o.printf("  %-20s %s%n", "model", built.model());
        o.printf("  %-20s %s.{txt,csv,tex}%n", "cut flow", dir.resolve(stem + ".cutflow"));
        o.printf("  %-20s %s%n", "report", report.resolve("index.html"));
        o.flush();
        return code;
    }
}
