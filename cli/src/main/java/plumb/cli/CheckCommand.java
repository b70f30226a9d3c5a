package plumb.cli;

import picocli.CommandLine.Command;
import plumb.cli.table.Escape;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.compile.CompiledModel;

import java.io.PrintWriter;
import java.util.List;
import java.util.concurrent.Callable;

/** {@code plumb check MODEL}: validates a model and summarises it. */
@Command(name = "check", mixinStandardHelpOptions = true,
        description = "Validate a model file and summarise it: channels, bins, samples, parameters, warnings.")
final class CheckCommand implements Callable<Integer> {

    @Mixin ModelInput input;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the summary as JSON ('-' for standard output).")
    String json;

    @Option(names = "--strict", description = "Exit with status 1 when there is any warning (for CI pipelines).")
    boolean strict;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        ModelInput.Loaded loaded = input.load();
        CompiledModel m = loaded.compiled();
        List<String> warnings = CheckJson.warnings(loaded);
        PrintWriter out = spec.commandLine().getOut();
        int factors = CheckJson.factors(m), nuisances = m.nParams() - factors - CheckJson.binFactors(m);
        if (json != null) {
            var root = CheckJson.of(m, warnings);
            if (failure(warnings) != null) Json.failed(root, failure(warnings));
            Outputs.write(json, Json.write(root), out);
            if ("-".equals(json)) return status(warnings);
        }
        out.printf("%s: valid model '%s'%n", loaded.file(), m.name());
        out.printf("  %s, %s, %s%n", Numbers.count(m.nChannels(), "channel"), Numbers.count(m.nBins(), "bin"),
                Numbers.count(m.nSamples(), "sample"));
        out.printf("  %s: %s, %s, %s%s%n", Numbers.count(m.nAll(), "parameter"), Numbers.count(factors, "free factor"),
                Numbers.count(nuisances, "nuisance parameter"), Numbers.count(m.nGamma(), "MC-statistics parameter"),
                CheckJson.binFactors(m) == 0 ? "" : ", " + Numbers.count(CheckJson.binFactors(m), "per-bin free factor"));
        out.printf("  parameter of interest: %s%n", m.poi() < 0 ? "(none)" : m.parameterNames(m.poi()));
        for (int c = 0; c < m.nChannels(); c++) {
            out.printf("  channel %-20s %4d %s%s%n", m.channelNames(c), m.bins(c), m.bins(c) == 1 ? "bin" : "bins",
                    m.blinded(c) ? "  (blinded)" : "");
        }
        if (!m.pruned().isEmpty()) {
            out.printf("  pruned %s (options.pruneBelow):%n", Numbers.count(m.pruned().size(), "variation part"));
            m.pruned().forEach(p -> out.println("    " + p));
        }
        if (!warnings.isEmpty()) {
            out.printf("  %s:%n", Numbers.count(warnings.size(), "warning"));
            warnings.forEach(w -> out.println("    warning: " + w));
        }
        out.flush();
        return status(warnings);
    }

    /** Why the check fails (--strict and warnings), or null. */
    private String failure(List<String> warnings) {
        if (!strict || warnings.isEmpty()) return null;
        return String.format("--strict: %d warning%s", warnings.size(), warnings.size() == 1 ? "" : "s");
    }

    private int status(List<String> warnings) {
        String failure = failure(warnings);
        if (failure == null) return ExitCodes.OK;
        spec.commandLine().getErr().println("plumb check: " + Escape.controls(failure));
        spec.commandLine().getErr().flush();
        return ExitCodes.FAILED;
    }

}
