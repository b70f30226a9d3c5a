package plumb.cli.build;

import plumb.cli.table.Table;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

/**
 * What a build wrote: the model file, the cut flow (also written beside the model), the warnings
 * and the per-variation changes it printed.
 */
public record BuildOutcome(Path model, List<CutFlowRow> cutFlow, List<String> warnings, List<String> changes) {

    public BuildOutcome {
        cutFlow = List.copyOf(cutFlow);
        warnings = List.copyOf(warnings);
        changes = List.copyOf(changes);
    }

    /**
     * The cut flow as a table: region, sample, step, weighted sum, events. {@code exact}: weighted
     * sums with all 17 digits (for CSV); otherwise 6 significant digits.
     */
    public Table cutFlowTable(boolean exact) {
        Table.Builder t = Table.builder("Cut flow: events left after each step (cumulative)",
                "region", "sample", "step", "weighted", "events");
        for (CutFlowRow r : cutFlow) {
            String w = exact ? Double.toString(r.weighted()) : String.format(Locale.ROOT, "%.6g", r.weighted());
            t.row(r.region(), r.sample(), r.step(), w, Long.toString(r.raw()));
        }
        return t.build();
    }
}
