package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.model.Model;
import plumb.engine.tooling.CsvHistograms;
import plumb.engine.tooling.ModelSettings;

import java.io.IOException;
import java.io.StringWriter;
import java.util.concurrent.Callable;

/** {@code plumb export MODEL --csv FILE [--settings FILE]}: the model as a histogram table and settings. */
@Command(name = "export", mixinStandardHelpOptions = true,
        description = "Write a model as a long-format histogram table (CSV) and its settings (JSON); "
                + "plumb import turns both back into the same model.")
final class ExportCommand implements Callable<Integer> {

    @Mixin ModelInput input;

    @Option(names = "--csv", required = true, paramLabel = "FILE", description = "The histogram table to write.")
    String csv;

    @Option(names = "--settings", paramLabel = "FILE", description = "The settings to write (everything that is not a histogram).")
    String settings;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        Model m = input.load().model();
        StringWriter table = new StringWriter();
        try {
            CsvHistograms.write(m, table);
        } catch (IOException e) {
            throw new IllegalStateException(e);   // a StringWriter does not fail
        }
        var out = spec.commandLine().getOut();
        Outputs.write(csv, table.toString(), out);
        if (settings != null) Outputs.write(settings, ModelSettings.of(m), out);
        if (!"-".equals(csv)) out.printf("wrote %s%s%n", csv, settings == null ? "" : " and " + settings);
        out.flush();
        return ExitCodes.OK;
    }
}
