package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.io.AtomicFiles;
import plumb.models.DemoModel;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

/**
 * {@code plumb demo [--out DIR]}: the built-in demonstration model copied to DIR/model.json and
 * the whole report made on it.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Run the whole report on the built-in demonstration model (a two-photon resonance at an "
                + "invented collider): copies it to DIR/model.json and writes DIR/index.html.")
final class DemoCommand implements Callable<Integer> {

    @Option(names = "--out", paramLabel = "DIR", defaultValue = "plumb-demo",
            description = "Directory of the model and report (default: ${DEFAULT-VALUE}).")
    Path out;

    @Option(names = "--toys", converter = OptionValues.NonNegative.class, paramLabel = "N", defaultValue = "" + ReportCommand.DEFAULT_TOYS,
            description = "Toys per injected value of the injection test (default: ${DEFAULT-VALUE}).")
    int toys;

    @Mixin FitOptions fit;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (toys < 0) throw new InputException("--toys must be at least 0, got " + toys);
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
}
