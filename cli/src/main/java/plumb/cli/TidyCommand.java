package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;
import plumb.engine.tooling.Symmetrisation;
import plumb.engine.tooling.Tidy;
import plumb.engine.tooling.TidyOptions;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code plumb tidy MODEL --out NEW}: a tidier copy of a model, every change in a log. */
@Command(name = "tidy", mixinStandardHelpOptions = true,
        description = "Write a tidier copy of a model: only the operations named on the command line, each change "
                + "listed (smooth, symmetrise, split norm, prune, drop unused, applied in that order).")
final class TidyCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "MODEL", description = "Model file (.json or .json.gz).")
    Path model;

    @Option(names = "--out", required = true, paramLabel = "FILE", description = "The tidied model (.json or .json.gz).")
    Path out;

    @Option(names = "--log", paramLabel = "FILE", description = "Also write the change log to FILE, one change a line.")
    String log;

    @Option(names = "--smooth", description = "Smooth shape variations (running median of 3, then hanning, on the ratio to "
            + "nominal; each side's total kept).")
    boolean smooth;

    @Option(names = "--symmetrise", paramLabel = "larger|mean", description = "Make one-sided variations two-sided: "
            + "mirror the larger side, or move both by the mean of the two moves.")
    String symmetrise;

    @Option(names = "--split-norm", paramLabel = "TOL", arity = "0..1", fallbackValue = "1e-6",
            description = "Turn shape variations whose ratio to nominal is flat within TOL (relative; default 1e-6) into norm.")
    Double splitNorm;

    @Option(names = "--prune-norm", paramLabel = "X", description = "Drop norm parts whose largest |kappa - 1| is below X.")
    Double pruneNorm;

    @Option(names = "--prune-shape", paramLabel = "X", description = "Drop shape parts whose largest relative move in a bin is below X.")
    Double pruneShape;

    @Option(names = "--drop-unused", description = "Remove variations without any effect, and parameters left without variations.")
    boolean dropUnused;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        TidyOptions options = options();
        if (!options.any()) {
            throw new InputException("name at least one operation: --smooth, --symmetrise, --split-norm, "
                    + "--prune-norm, --prune-shape, --drop-unused");
        }
        Model input = ModelReader.read(model);
        Tidy.Result result = Tidy.apply(input, options);
        try {
            ModelWriter.write(result.model(), out);
        } catch (IOException | RuntimeException e) {
            throw new InputException("cannot write --out " + out + ": " + e.getMessage());
        }
        String text = result.changes().isEmpty() ? "" : String.join("\n", result.changes()) + "\n";
        PrintWriter pw = spec.commandLine().getOut();
        if (log != null) Outputs.write(log, text, pw);
        pw.print(text);
        pw.printf("wrote %s (%d change%s)%n", out, result.changes().size(), result.changes().size() == 1 ? "" : "s");
        pw.flush();
        return ExitCodes.OK;
    }

    private TidyOptions options() {
        Symmetrisation sym = null;
        if (symmetrise != null) {
            sym = Symmetrisation.fromName(symmetrise);
            if (sym == null) throw new InputException("--symmetrise " + symmetrise + ": expected larger or mean");
        }
        threshold("--split-norm", splitNorm);
        threshold("--prune-norm", pruneNorm);
        threshold("--prune-shape", pruneShape);
        return new TidyOptions(smooth, sym, splitNorm, pruneNorm, pruneShape, dropUnused);
    }

    private static void threshold(String option, Double x) {
        if (x != null && !(x >= 0 && x < Double.POSITIVE_INFINITY)) {
            throw new InputException(option + " " + x + ": expected a finite number >= 0");
        }
    }
}
