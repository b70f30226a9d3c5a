package plumb.cli.report;

import java.util.List;
import plumb.cli.plot.LimitBands;

/**
 * Small result records of the report sections that have no figure input of their own. Numbers
 * that could not be computed are NaN.
 */
public final class Results {

    private Results() {
    }

    /** One discovery test: q0, its significance Z and p-value. */
    public record Q0Values(double q0, double z, double p) {
    }

    /**
     * DiscoveryValues test of POI = 0 (cli-contract.md, {@code plumb discovery}).
     *
     * @param observed null for a blinded model
     * @param expected on the Asimov data set at POI = 1
     */
    public record DiscoveryValues(Q0Values observed, Q0Values expected) {
    }

    /**
     * CLs upper limits (cli-contract.md, {@code plumb limit}) at one or more values of a label.
     *
     * @param poi    parameter of interest
     * @param method "asymptotic" or "toys"
     * @param cl     confidence level, e.g. 0.95
     * @param xLabel name of the label the points are at (e.g. "mass [GeV]"), or null for one point
     * @param points one per model; {@code observed} NaN when blinded
     */
    public record Limits(String poi, String method, double cl, String xLabel, List<LimitBands.Point> points) {
        public Limits {
            points = List.copyOf(points);
            if (points.isEmpty()) throw new IllegalArgumentException("no limit points");
        }
    }

    /** Saturated-model goodness of fit (cli-contract.md, {@code plumb gof}); p NaN when ndof ≤ 0. */
    public record GofValues(double statistic, int ndof, double p) {
    }

    /** One signal-injection study (cli-contract.md, {@code plumb inject}). */
    public record InjectionValues(double injected, int toys, int converged, double mean, double meanError,
                            double pullMean, double pullWidth, double coverage68) {
    }

    /**
     * The Asimov closure check at one injected value: a fit to the Asimov data set made at the
     * generating point must return every parameter to its generating value within {@code tolerance}.
     *
     * @param worstParameter the parameter farthest from its generating value, or null
     */
    public record Closure(double injected, boolean converged, boolean passed, double maxDeviation,
                          String worstParameter, double tolerance) {
    }

    /**
     * Uncertainty of the parameter of interest split by groups of parameters (each group's share
     * in quadrature), with the total and the statistical part.
     */
    public record ErrorBreakdown(double total, double statOnly, List<Group> groups) {
        public ErrorBreakdown {
            groups = List.copyOf(groups);
        }

        /**
         * @param error      the group's share, √(total² − fixedError²)
         * @param fixedError the POI's error with the group held at its best-fit values
         */
        public record Group(String name, int parameters, double error, double fixedError) {
        }
    }

    /**
     * A file copied into the report as it is (e.g. a command's JSON result).
     *
     * @param path    relative path inside the report directory, e.g. "json/fit.json"
     * @param label   link text
     * @param content the bytes
     */
    public record Attachment(String path, String label, byte[] content) {
        public Attachment {
            if (path == null || path.isEmpty() || path.startsWith("/") || path.contains("\\")
                    || path.contains("..") || path.equals("index.html")) {
                throw new IllegalArgumentException("attachment path '" + path + "' must be relative, inside the report and not index.html");
            }
            content = content.clone();
        }
    }

    /**
     * One part of the planning section: a heading, a line of text, a table and a figure (each
     * optional). The figure is drawn when the page is written.
     *
     * @param name base name of the table and figure files
     */
    public record PlanningPart(String heading, String text, plumb.cli.table.Table table, String name,
                               java.util.function.Supplier<plumb.cli.plot.Figure> figure, String caption) {
    }
}
