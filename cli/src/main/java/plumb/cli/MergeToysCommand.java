package plumb.cli;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.InjectionToyBatch;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

/**
 * {@code plumb merge-toys PART...}: merges batches written by {@code plumb inject --first K --count N}
 * into the result a single run of all their toys gives (byte for byte).
 */
@Command(name = "merge-toys", mixinStandardHelpOptions = true,
        description = "Merge toy batches (part files of 'plumb inject --first K --count N --json PART') into the "
                + "result of one run of all their toys.")
final class MergeToysCommand implements Callable<Integer> {

    @Parameters(arity = "1..*", paramLabel = "PART", description = "Part files, in any order; together they must "
            + "cover consecutive toys without overlap.")
    List<Path> parts;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Option(names = "--nuisances", description = "List every constrained parameter's pull mean and width.")
    boolean showNuisances;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        InjectionToyBatch c = ToyBatchFiles.merge(parts);
        List<InjectionSummary> summaries = c.summaries();
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(InjectionJson.of(c, null, List.of(), summaries)), out);
        if (!"-".equals(json)) {
            out.printf("Merged %d part file(s): toys %d..%d of each injected value (model %s, seed %d)%n", parts.size(),
                    c.first(), c.first() + c.count() - 1, c.run().get("model").asText(), c.run().get("seed").asLong());
            InjectCommand.printSummaries(out, summaries, showNuisances, c.run().get("poi").asText());
        }
        return ExitCodes.OK;
    }
}
