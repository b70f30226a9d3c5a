package plumb.engine.inference;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The secant root search of the limits, with its fallback to a bracket and Brent's method. */
class RootsTest {

    /** h(μ) = 2 − μ/σ(μ) with σ(μ) = 0.3 (1 + 0.2 μ): the band equation with a width growing in μ. */
    private static final class Band implements org.apache.commons.math3.analysis.UnivariateFunction {
        int calls;

        @Override
        public double value(double mu) {
            calls++;
            return 2 - mu / (0.3 * (1 + 0.2 * mu));
        }
    }

    /** Solved by hand: μ = 0.6 (1 + 0.2 μ), so μ = 0.6 / 0.88. */
    private static final double ROOT = 0.6 / 0.88;

    @Test
    void secantStepsFromAGaussianSecondPointFindTheRootInFewValues() {
        Band h = new Band();
        // second point as the limits make it: μ/σ = 2 with σ measured at the first point
        double r = Roots.decreasingRoot(h, 0.6, mu -> 2 * 0.3 * (1 + 0.2 * mu), 0, 50, "the test root");
        // far inside the promised 1e-5 relative: the last step is superlinear
        assertEquals(ROOT, r, 1e-9 * ROOT);
        assertTrue(h.calls <= 4, "values of h: " + h.calls);
    }

    @Test
    void withoutASecondPointItFallsBackToTheBracket() {
        Band h = new Band();
        double r = Roots.decreasingRoot(h, 0.6, mu -> Double.NaN, 0, 50, "the test root");
        assertEquals(ROOT, r, 1e-5 * ROOT);
    }

    @Test
    void aStepAgainstTheSlopeFallsBackToTheBracket() {
        // h rises between the two first points (0.2 and 0.25): no secant step, the bracket takes over
        org.apache.commons.math3.analysis.UnivariateFunction h = mu -> mu < 0.3 ? mu : 1.3 - 3 * mu;
        double r = Roots.decreasingRoot(h, 0.2, mu -> 0.25, 0, 50, "the test root");
        assertEquals(1.3 / 3, r, 1e-5);
    }

    @Test
    void noRootInTheRangeIsAnError() {
        assertThrows(InferenceException.class,
                () -> Roots.decreasingRoot(mu -> 1, 0.5, mu -> 0.6, 0, 50, "the test root"));
    }

    @Test
    void theGaussianModelGivesTheMedianLimitWhenTheBestFitIsZero() {
        // q̃ = q_A = (μ/σ)² with μ̂ = 0: CLs = 2 (1 − Φ(μ/σ)) = 0.05 at μ/σ = Φ⁻¹(0.975) = 1.959963984540054
        // (Cowan et al., EPJ C 71 (2011) 1554, the median expected limit, eq. 89 with N = 0).
        double sigma = 0.37;
        double q = 1 / (sigma * sigma);
        double limit = AsymptoticUpperLimit.gaussianLimit(q, q, 1, 0, 50, Math.log(0.05));
        assertEquals(1.959963984540054 * sigma, limit, 1e-9);
    }
}
