package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import plumb.cli.build.BuildRequest;
import plumb.cli.build.EventBuilds;

import java.nio.file.Path;
import java.util.concurrent.Callable;

/** {@code plumb build SPEC --out MODEL}: event tables to a model with Spark SQL (docs/build-format.md). */
@Command(name = "build", mixinStandardHelpOptions = true,
        description = {"Build a model from event tables (Parquet or CSV) with Spark SQL: selections, histograms, "
                + "MC statistics, systematic variations and the cut flow, as SPEC describes (docs/build-format.md).",
                "Writes MODEL and MODEL-without-.json.cutflow.{txt,csv,tex}; nothing when anything fails."})
final class BuildCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "SPEC", description = "The build description (JSON).")
    Path specFile;

    @Option(names = "--out", required = true, paramLabel = "MODEL", description = "The model file to write.")
    Path out;

    @Option(names = "--spark", paramLabel = "MASTER", defaultValue = "local[*]",
            description = "Where Spark runs: local[*] or local[N] in this process (default: ${DEFAULT-VALUE}), "
                    + "spark://HOST:PORT or yarn on a cluster.")
    String master;

    @Option(names = "--spark-timeout", converter = OptionValues.Positive.class, paramLabel = "S", defaultValue = "60",
            description = "Seconds to wait for the Spark master and a first executor (default: ${DEFAULT-VALUE}).")
    int timeout;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (master.isBlank()) throw new InputException("--spark: the master is empty (local[*], spark://HOST:PORT or yarn)");
        if (timeout < 1) throw new InputException("--spark-timeout must be at least 1 second, got " + timeout);
        if (!java.nio.file.Files.isRegularFile(specFile)) throw new InputException(specFile + ": no such file");
        EventBuilds.build(new BuildRequest(specFile, out, master, timeout), spec.commandLine().getOut(), spec.commandLine().getErr());
        return ExitCodes.OK;
    }
}
