package plumb.spark.build;

/** Cut-flow numbers of one pass. */
final class CutFlow {

    private CutFlow() {
    }

    /** For region r and step k (cumulative): weighted sum {@code weighted[r][k]} and events {@code raw[r][k]}. */
    record Counts(double[][] weighted, long[][] raw) { }
}
