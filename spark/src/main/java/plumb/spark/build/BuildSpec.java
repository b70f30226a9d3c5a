package plumb.spark.build;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;

/**
 * A build description as read from its file (docs/build-format.md). Every expression keeps the
 * JSON path it came from, so an error found later by Spark can name it.
 *
 * @param file the description's file; relative event paths are resolved against its folder
 */
public record BuildSpec(Path file, String name, String description, String poi, Map<String, Object> labels,
                        Outside outside, Events data, List<Region> regions, List<SampleSpec> samples) {

    public static final String FORMAT = "plumb-build/1";

    /** Events whose observable lies outside the edges: left out, or added to the end bins. */
    public enum Outside { DROP, FOLD }

    /** An expression of the description and where it stands in the file (e.g. {@code regions[0].observable}). */
    public record Expr(String sql, String path) { }

    /** A list of files or globs, already resolved against the description's folder. */
    public record Events(List<String> paths, String path) { }

    public record Step(String name, Expr keep) { }

    public record Region(String name, String title, List<Step> steps, Expr observable, double[] edges,
                         Outside outside, boolean blinded) {
        public int bins() {
            return edges.length - 1;
        }
    }

    public record SampleSpec(String name, Events events, Expr weight, List<String> factors, boolean mcStatistics,
                             List<String> regions, List<VariationSpec> variations, String path) { }

    /** How a variation's alternative histograms come about. */
    public enum Source { WEIGHTS, EVENTS, OBSERVABLE, NORM }

    /**
     * One variation. Depending on {@code source}: {@code up}/{@code down} weight or observable
     * expressions (null side: nominal), {@code upEvents}/{@code downEvents} tables, or κ values.
     */
    public record VariationSpec(String parameter, Source source, Expr up, Expr down, Events upEvents, Events downEvents,
                                double kappaUp, double kappaDown, List<String> regions, TidyChoice tidy, String path) { }

    /**
     * Per-variation options (the operations of {@code plumb tidy}).
     *
     * @param symmetrise "larger", "mean" or null
     */
    public record TidyChoice(boolean smooth, String symmetrise, boolean splitNorm, double pruneNorm, double pruneShape) {
        public static final TidyChoice NONE = new TidyChoice(false, null, false, 0, 0);
    }
}
