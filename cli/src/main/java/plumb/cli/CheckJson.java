package plumb.cli;

import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.compile.CompiledModel;
import plumb.engine.model.ParameterKind;
import plumb.engine.tooling.Lint;

import java.util.ArrayList;
import java.util.List;

/** The model summary of {@code plumb check} as JSON, for the command and the report (no fit, no statistic). */
final class CheckJson {

    private CheckJson() {
    }

    /** The compiler's warnings (one-sided and over-100 % variations), then the lint warnings. */
    static List<String> warnings(ModelInput.Loaded loaded) {
        List<String> all = new ArrayList<>(loaded.compiled().warnings());
        all.addAll(Lint.warnings(loaded.model()));
        return all;
    }

    /** The check result file of docs/cli-contract.md. */
    static ObjectNode of(CompiledModel m, List<String> warningLines) {
        int factors = factors(m);
        ObjectNode root = Json.result(m.labels(), m.anyBlinded() ? "blinded" : "observed");
        root.put("valid", true);
        root.put("channels", m.nChannels());
        root.put("bins", m.nBins());
        root.put("samples", m.nSamples());
        root.put("parameters", m.nAll());
        root.put("freeFactors", factors);
        root.put("nuisanceParameters", m.nParams() - factors - binFactors(m));
        root.put("binFactors", binFactors(m));
        root.put("mcStatParameters", m.nGamma());
        root.put("poi", m.poi() < 0 ? null : m.parameterNames(m.poi()));
        var pruned = root.putArray("pruned");
        m.pruned().forEach(pruned::add);
        var warnings = root.putArray("warnings");
        warningLines.forEach(warnings::add);
        return root;
    }

    static int binFactors(CompiledModel m) {
        int n = 0;
        for (int i = 0; i < m.nParams(); i++) if (m.kind(i) == ParameterKind.BIN_FACTOR) n++;
        return n;
    }

    static int factors(CompiledModel m) {
        int factors = 0;
        for (int i = 0; i < m.nParams(); i++) if (m.kind(i) == ParameterKind.FACTOR) factors++;
        return factors;
    }
}
