package plumb.cli.plot;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.List;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** The numbers behind the figures: data error bars and the linearity line. */
class NumbersTest {

    // Garwood (1936) central interval, defined by the Poisson tails: the upper end u has
    // P(N <= n | u) = 0.1587 and the lower end l has P(N >= n | l) = 0.1587. Checked against
    // commons-math's Poisson CDF, an implementation independent of the chi-square quantiles used.
    @ParameterizedTest
    @ValueSource(ints = {1, 2, 5, 10, 37, 250})
    void garwoodEndsLeaveEqualPoissonTails(int n) {
        double tail = PoissonInterval.TAIL;
        double upper = PoissonInterval.upper(n);
        double lower = PoissonInterval.lower(n);
        assertEquals(tail, new PoissonDistribution(upper).cumulativeProbability(n), 1e-7);
        assertEquals(tail, 1 - new PoissonDistribution(lower).cumulativeProbability(n - 1), 1e-7);
    }

    @Test
    void garwoodForZeroAndSmallCounts() {
        // n = 0: lower 0, upper = −ln(0.1587) = 1.8410 (closed form of P(0 | u) = tail).
        assertEquals(0.0, PoissonInterval.lower(0));
        assertEquals(-Math.log(PoissonInterval.TAIL), PoissonInterval.upper(0), 1e-9);
        // n = 1: [0.1727, 3.2995], n = 10: [6.891, 14.267] (tabulated 68.27% intervals, from memory).
        assertEquals(0.1727, PoissonInterval.lower(1), 1e-4);
        assertEquals(3.2995, PoissonInterval.upper(1), 1e-4);
        assertEquals(6.891, PoissonInterval.lower(10), 1e-3);
        assertEquals(14.267, PoissonInterval.upper(10), 1e-3);
    }

    @Test
    void pointsWithoutErrorBarsGiveNoLine() {
        // Like the injection result file: only points with an error of the mean carry the line.
        Linearity lin = new Linearity("mu", List.of(new Linearity.Point(0, 0.1, Double.NaN),
                new Linearity.Point(1, 0.9, Double.NaN), new Linearity.Point(2, 2.2, 0.1)));
        assertNull(lin.line());
    }

    @Test
    void weightedLineOfExactPointsAndItsErrors() {
        // Points on y = 1 + 2x with equal errors σ: slope error² = σ² n / (n Σx² − (Σx)²)
        // (weighted least squares, Bevington & Robinson ch. 6; from memory). x = 0, 1, 2; σ = 0.5.
        Linearity lin = new Linearity("mu", List.of(new Linearity.Point(2, 5, 0.5),
                new Linearity.Point(0, 1, 0.5), new Linearity.Point(1, 3, 0.5)));
        var line = lin.line();
        assertEquals(2.0, line.slope(), 1e-12);
        assertEquals(1.0, line.offset(), 1e-12);
        assertEquals(Math.sqrt(0.25 * 3 / (3 * 5 - 9)), line.slopeError(), 1e-12);
        assertEquals(Math.sqrt(0.25 * 5 / (3 * 5 - 9)), line.offsetError(), 1e-12);
        assertNull(new Linearity("mu", List.of(new Linearity.Point(1, 1, 0.1))).line());
    }

    @Test
    void divergingScaleEndsAndMiddle() {
        assertEquals(Theme.DIVERGING.get(0), Theme.diverging(-1));
        assertEquals(Theme.DIVERGING.get(4), Theme.diverging(0));
        assertEquals(Theme.DIVERGING.get(8), Theme.diverging(1.5));
        assertEquals(java.awt.Color.WHITE, Theme.textOn(Theme.diverging(-1)));
        assertEquals(Theme.INK, Theme.textOn(Theme.diverging(0)));
    }
}
