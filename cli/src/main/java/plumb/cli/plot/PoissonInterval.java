package plumb.cli.plot;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;

/**
 * Central 68.27% confidence interval for a Poisson mean given an observed count n (Garwood
 * 1936, Biometrika 28, 437; common practice for error bars on counts):
 * lower = ½ χ²(0.15866; 2n), upper = ½ χ²(0.84134; 2n + 2), lower = 0 for n = 0.
 * Quantiles from commons-math's chi-squared distribution. Non-integer n (Asimov data sets) are
 * accepted: the formula is continuous in n.
 */
public final class PoissonInterval {

    /** Tail probability on each side of a central ±1σ interval, (1 − 0.682689)/2. */
    static final double TAIL = 0.15865525393145707;

    private PoissonInterval() {
    }

    /** Lower end of the interval for count {@code n} ≥ 0. */
    public static double lower(double n) {
        if (!(n > 0)) return 0;
        return 0.5 * new ChiSquaredDistribution(null, 2 * n).inverseCumulativeProbability(TAIL);
    }

    /** Upper end of the interval for count {@code n} ≥ 0. */
    public static double upper(double n) {
        double k = Math.max(n, 0);
        return 0.5 * new ChiSquaredDistribution(null, 2 * k + 2).inverseCumulativeProbability(1 - TAIL);
    }
}
