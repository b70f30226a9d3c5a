package plumb.engine.inference;

/**
 * A p-value from toys: the fraction of toys whose statistic is at least the observed one.
 *
 * @param observed  the statistic of the data fitted
 * @param toys      toys generated
 * @param failed    toys whose fits did not converge: counted here, left out of p
 * @param exceeding converged toys with a statistic ≥ {@code observed}
 * @param p         exceeding / (toys − failed), NaN when no toy converged
 * @param error     binomial error √(p(1 − p)/(toys − failed)); 0 when p is 0 or 1 (then p is
 *                  only known to be within about 1/(toys − failed) of it)
 */
public record ToyPValue(double observed, int toys, int failed, int exceeding, double p, double error) {

    /**
     * Statistics of two toys from the same counts differ by fit rounding (~1e-8); without a
     * tolerance a discrete distribution's atom at the observed value would be split at random.
     */
    static final double TIE_TOLERANCE = 1e-6;

    /**
     * The significance of p, Φ⁻¹(1 − p) (one-sided, Cowan et al. 2011 eq. 2): infinite when no toy
     * reached the observed statistic, NaN when p is.
     */
    public double z() {
        if (!(p > 0)) return p == 0 ? Double.POSITIVE_INFINITY : Double.NaN;
        return -NORMAL.inverseCumulativeProbability(p);
    }

    private static final org.apache.commons.math3.distribution.NormalDistribution NORMAL =
            new org.apache.commons.math3.distribution.NormalDistribution(null, 0, 1);

    /** Counts the toy statistics (NaN = failed fit) at least {@code observed}. */
    static ToyPValue of(double observed, double[] statistics) {
        int failed = 0, exceeding = 0;
        for (double t : statistics) {
            if (Double.isNaN(t)) failed++;
            else if (t >= observed - TIE_TOLERANCE) exceeding++;
        }
        int n = statistics.length - failed;
        double p = n > 0 ? (double) exceeding / n : Double.NaN;
        double error = n > 0 ? Math.sqrt(p * (1 - p) / n) : Double.NaN;
        return new ToyPValue(observed, statistics.length, failed, exceeding, p, error);
    }
}
