package plumb.cli.plot;

/**
 * Input of the profile-likelihood scan figure.
 *
 * @param parameter name of the scanned parameter (x-axis title)
 * @param values    scanned values, increasing
 * @param nllAboveMin  −ln L profiled at each value minus its minimum (≥ 0)
 * @param best      best-fit value (NaN: not marked)
 * @param interval68 [lo, hi] where 2ΔNLL = 1; either end NaN when not reached
 * @param interval95 [lo, hi] where 2ΔNLL = 3.841; either end NaN when not reached
 */
public record ScanCurve(String parameter, double[] values, double[] nllAboveMin, double best,
                        double[] interval68, double[] interval95) {

    public ScanCurve {
        if (values.length != nllAboveMin.length) throw new IllegalArgumentException("scan has " + values.length + " values and " + nllAboveMin.length + " nllAboveMin");
        if (values.length < 2) throw new IllegalArgumentException("a scan needs at least two points");
        values = values.clone();
        nllAboveMin = nllAboveMin.clone();
        interval68 = interval68 == null ? new double[] {Double.NaN, Double.NaN} : interval68.clone();
        interval95 = interval95 == null ? new double[] {Double.NaN, Double.NaN} : interval95.clone();
    }
}
