package plumb.engine.inference;

/**
 * Expected upper limits under the background-only hypothesis: the median and the ±1σ, ±2σ
 * bands (band N is the limit at the Φ(N) quantile of the background-only outcomes). Also used
 * for the toy-statistics errors of those limits. NaN marks a value that could not be computed.
 */
public record ExpectedBands(double minus2, double minus1, double median, double plus1, double plus2) implements java.io.Serializable {

    /** The band numbers N, in the order of the components. */
    public static final int[] N = {-2, -1, 0, 1, 2};

    /** Bands from values in the order of {@link #N}. */
    public static ExpectedBands of(double[] byBand) {
        return new ExpectedBands(byBand[0], byBand[1], byBand[2], byBand[3], byBand[4]);
    }

    /** The values in the order of {@link #N}. */
    public double[] toArray() {
        return new double[] {minus2, minus1, median, plus1, plus2};
    }

    /** All NaN: nothing computed. */
    public static ExpectedBands missing() {
        return new ExpectedBands(Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
    }
}
