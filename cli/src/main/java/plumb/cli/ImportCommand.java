package plumb.cli;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelValidator;
import plumb.engine.model.ModelWriter;
import plumb.engine.tooling.CsvHistograms;
import plumb.engine.tooling.HistogramImport;
import plumb.engine.tooling.HistogramRow;
import plumb.engine.tooling.JsonHistograms;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code plumb import TABLE --out MODEL}: a model from a histogram table (docs/import-format.md). */
@Command(name = "import", mixinStandardHelpOptions = true,
        description = "Build a model from histograms: a long-format CSV table, or a JSON histogram file (.json), "
                + "plus optional settings (POI, factors, parameters, groups, ...). The model is checked before it is written.")
final class ImportCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "TABLE", description = "Histogram table (.csv) or histogram file (.json).")
    Path table;

    @Option(names = "--settings", paramLabel = "FILE", description = "Model settings: a model file without its per-bin numbers.")
    Path settings;

    @Option(names = "--name", paramLabel = "NAME", description = "Model name when the settings give none (default: the table's file name).")
    String name;

    @Option(names = "--out", required = true, paramLabel = "FILE", description = "The model to write (.json or .json.gz).")
    Path out;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        List<HistogramRow> rows = table.toString().endsWith(".json") ? JsonHistograms.read(table) : CsvHistograms.read(table);
        JsonNode settingsTree = settings == null ? null : readSettings(settings);
        Model model = HistogramImport.build(rows, table.toString(), settingsTree,
                settings == null ? null : settings.toString(), modelName());
        try {
            ModelWriter.write(model, out);
        } catch (IOException | RuntimeException e) {
            throw new InputException("cannot write --out " + out + ": " + e.getMessage());
        }
        int samples = 0, variations = 0;
        for (var ch : model.channels()) {
            samples += ch.samples().size();
            for (var s : ch.samples()) variations += s.variations().size();
        }
        spec.commandLine().getOut().printf("wrote %s (%d channels, %d samples, %d variations)%n", out,
                model.channels().size(), samples, variations);
        spec.commandLine().getOut().flush();
        return ExitCodes.OK;
    }

    private String modelName() {
        if (name != null) {
            if (!ModelValidator.NAME.matcher(name).matches()) throw new InputException("--name " + name + ": not a valid name");
            return name;
        }
        String stem = table.getFileName().toString().replaceFirst("\\.(csv|json)$", "");
        return ModelValidator.NAME.matcher(stem).matches() ? stem : "imported";
    }

    private static JsonNode readSettings(Path file) {
        try {
            return new ObjectMapper().readTree(file.toFile());
        } catch (JsonProcessingException e) {
            var loc = e.getLocation();
            throw new ModelException(file.toString(), loc == null ? "" : "line " + loc.getLineNr() + ", column " + loc.getColumnNr(),
                    "not valid JSON: %s", e.getOriginalMessage());
        } catch (IOException e) {
            throw new ModelException(file.toString(), "", "cannot read: %s", e.getMessage());
        }
    }
}
