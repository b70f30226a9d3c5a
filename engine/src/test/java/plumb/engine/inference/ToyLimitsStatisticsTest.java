package plumb.engine.inference;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The counting behind toy CLs: tail fractions with binomial errors, the CLs ratio, nearest-rank quantiles. */
class ToyLimitsStatisticsTest {

    @Test
    void fractionCountsFiniteValuesAtLeastTheReferenceWithABinomialError() {
        double[] q = {0.1, 2.0, Double.NaN, 3.5, 0.0, 2.0, 7.0, Double.NaN};
        double[] f = ToyLimits.fraction(q, 2.0);
        // 6 finite values, 4 of them ≥ 2 (a tie counts): p = 4/6, error √(p(1−p)/n) (binomial, common practice)
        assertEquals(4.0 / 6, f[0], 1e-15);
        assertEquals(Math.sqrt((4.0 / 6) * (2.0 / 6) / 6), f[1], 1e-15);
        assertEquals(6, f[2]);
        assertTrue(Double.isNaN(ToyLimits.fraction(new double[] {Double.NaN}, 0)[0]));
    }

    @Test
    void ratioPropagatesBothErrors() {
        double[] r = ToyLimits.ratio(new double[] {0.02, 0.004}, new double[] {0.5, 0.05});
        assertEquals(0.04, r[0], 1e-15);
        // σ² = (0.004/0.5)² + (0.02·0.05/0.25)² = 6.4e-5 + 1.6e-5
        assertEquals(Math.sqrt(8.0e-5), r[1], 1e-15);
        assertEquals(0, ToyLimits.ratio(new double[] {0, 0}, new double[] {0, 0})[0]);
        assertEquals(1, ToyLimits.ratio(new double[] {0.1, 0.01}, new double[] {0, 0})[0]);
    }

    @Test
    void quantileIsTheNearestRank() {
        double[] sorted = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
        // nearest rank (common practice): the value at rank ⌈p·n⌉
        assertEquals(5, ToyLimits.quantile(sorted, 0.5));
        assertEquals(1, ToyLimits.quantile(sorted, 0.0));
        assertEquals(2, ToyLimits.quantile(sorted, 0.15));
        assertEquals(10, ToyLimits.quantile(sorted, 1.0));
        assertEquals(9, ToyLimits.quantile(sorted, 0.841));
        assertTrue(Double.isNaN(ToyLimits.quantile(new double[0], 0.5)));
    }
}
