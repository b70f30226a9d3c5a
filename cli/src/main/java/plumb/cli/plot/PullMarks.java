package plumb.cli.plot;

import java.util.List;

/**
 * Input of the pulls figure: constrained nuisance parameters after a fit, in display order
 * (top first).
 *
 * @param title   figure title, or null for a default
 * @param entries one per parameter; free parameters have no pull and are left out by the caller
 */
public record PullMarks(String title, List<Mark> entries) {

    /**
     * @param name       parameter name
     * @param pull       (value − prefitValue) / prefitWidth
     * @param constraint post-fit error / prefitWidth, the half-length of the error bar; NaN: none
     */
    public record Mark(String name, double pull, double constraint) {
        public Mark {
            if (name == null) throw new IllegalArgumentException("pull entry without a name");
        }
    }

    public PullMarks {
        if (entries == null || entries.isEmpty()) throw new IllegalArgumentException("no parameters to show pulls of");
        entries = List.copyOf(entries);
    }
}
