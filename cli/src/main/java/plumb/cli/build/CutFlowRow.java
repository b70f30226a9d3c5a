package plumb.cli.build;

/**
 * One row of a cut flow: after {@code step} of {@code region}, the weighted sum and the number of
 * events of {@code sample} ("data" for the observed events) that are left.
 */
public record CutFlowRow(String region, String sample, String step, double weighted, long raw) {

    /** The name of the last row of each region and sample: what the histogram holds. */
    public static final String IN_THE_BINS = "in the bins";

    /** The sample name of the observed events' rows. */
    public static final String DATA = "data";
}
