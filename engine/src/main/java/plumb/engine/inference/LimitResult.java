package plumb.engine.inference;

import java.util.List;

/**
 * A CLs upper limit on the parameter of interest.
 *
 * @param cl            confidence level, e.g. 0.95 (the limit is where CLs = 1 − cl)
 * @param method        "asymptotic" or "toys"
 * @param observed      the limit on the data fitted; NaN when the model is blinded
 * @param expected      expected limits under the background-only hypothesis
 * @param observedError toy-statistics error of the observed limit (NaN for asymptotic limits)
 * @param expectedError toy-statistics errors of the expected limits (NaN for asymptotic limits)
 * @param muHat         best-fit POI value on the data fitted (NaN when blinded)
 * @param points        CLs at each POI value where toys were thrown, ascending (empty for asymptotic limits)
 * @param toys          toy data sets generated in all
 * @param failedToys    toys whose fits did not converge: counted here, left out of every p-value
 * @param fits          fits made in all
 * @param seconds       wall time
 */
public record LimitResult(double cl, String method, double observed, ExpectedBands expected, double observedError,
                          ExpectedBands expectedError, double muHat, List<ClsPoint> points, int toys, int failedToys,
                          int fits, double seconds) implements java.io.Serializable {

    public LimitResult {
        points = List.copyOf(points);
    }

    /**
     * CLs from toys at one POI value μ, for the observed statistic.
     *
     * @param mu          the POI value tested
     * @param qObserved   q̃μ of the data fitted (NaN when blinded)
     * @param clsb        p_{s+b}: fraction of signal-plus-background toys with q̃μ ≥ the observed value
     * @param clb         1 − p_b: fraction of background-only toys with q̃μ ≥ the observed value
     * @param cls         clsb / clb
     * @param clsError    binomial error of cls (errors of clsb and clb added in quadrature, relative)
     * @param toysSb      converged signal-plus-background toys
     * @param toysB       converged background-only toys
     * @param expectedCls CLs of each expected band at this μ (order of {@link ExpectedBands#N})
     */
    public record ClsPoint(double mu, double qObserved, double clsb, double clb, double cls, double clsError,
                           int toysSb, int toysB, double[] expectedCls)
            implements java.io.Serializable { }
}
