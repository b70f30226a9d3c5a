package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.cli.io.AtomicFiles;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.util.zip.GZIPOutputStream;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code plumb generate}: a synthetic model of any size, for benchmarks and scale tests. */
@Command(name = "generate", mixinStandardHelpOptions = true,
        description = "Write a synthetic model of the given size (falling spectra, a narrow signal, norm and shape "
                + "variations, MC-statistics errors, free background factors, observed counts drawn from it).")
final class GenerateCommand implements Callable<Integer> {

    @Option(names = "--channels", defaultValue = "5", paramLabel = "C", description = "Channels (default: ${DEFAULT-VALUE}).")
    int channels;

    @Option(names = "--bins", defaultValue = "40", paramLabel = "B", description = "Bins per channel (default: ${DEFAULT-VALUE}).")
    int bins;

    @Option(names = "--samples", defaultValue = "6", paramLabel = "S", description = "Samples per channel (default: ${DEFAULT-VALUE}).")
    int samples;

    @Option(names = "--nuisances", defaultValue = "50", paramLabel = "K", description = "Nuisance parameters (default: ${DEFAULT-VALUE}).")
    int nuisances;

    @Option(names = "--seed", defaultValue = "1", paramLabel = "N", description = "Seed; the same seed gives the same file (default: ${DEFAULT-VALUE}).")
    long seed;

    @Option(names = "--out", required = true, paramLabel = "FILE", description = "Model file to write (.json or .json.gz).")
    Path out;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        Model model;
        try {
            model = SyntheticModels.generate(channels, bins, samples, nuisances, seed);
        } catch (IllegalArgumentException e) {
            throw new InputException(e.getMessage());
        }
        // through AtomicFiles: a device or pipe named by --out is written into, never replaced;
        // the text is formatted straight into the stream (a large model is hundreds of megabytes)
        boolean gzip = out.getFileName() != null && out.getFileName().toString().endsWith(".json.gz");
        try {
            AtomicFiles.write(out, o -> {
                if (gzip) {
                    GZIPOutputStream z = new GZIPOutputStream(o, 1 << 16);
                    ModelWriter.write(model, z);
                    z.finish();
                } else {
                    ModelWriter.write(model, o);
                }
            });
        } catch (IOException e) {
            throw Outputs.cannotWrite(out, e);
        }
        spec.commandLine().getOut().printf("wrote %s (%d channels x %d bins, %d samples, %d nuisance parameters, seed %d)%n",
                out, channels, bins, samples, nuisances, seed);
        return ExitCodes.OK;
    }
}
