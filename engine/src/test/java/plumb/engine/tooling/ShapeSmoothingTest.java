package plumb.engine.tooling;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Running median of three, then hanning, on the ratio to nominal, total restored (J. W. Tukey,
 * Exploratory Data Analysis, 1977, from memory): a linear ratio passes unchanged, a single spike is
 * removed by the median, alternating noise is damped, and the total never moves.
 */
class ShapeSmoothingTest {

    private static final double[] N = {40, 80, 120, 100, 60, 30, 10};

    private static double sum(double[] x) {
        double s = 0;
        for (double v : x) s += v;
        return s;
    }

    @Test
    void aLinearRatioPassesUnchanged() {
        double[] v = new double[N.length];
        for (int b = 0; b < N.length; b++) v[b] = N[b] * (1 + 0.01 * b);
        assertArrayEquals(v, ShapeSmoothing.smooth(N, v), 1e-12);
    }

    @Test
    void aSingleSpikeIsRemovedAndTheTotalKept() {
        double[] v = N.clone();
        v[3] = 150; // +50 % in one bin, nominal elsewhere
        double[] s = ShapeSmoothing.smooth(N, v);
        assertEquals(sum(v), sum(s), 1e-12 * sum(v));
        // the median removes the spike; the restored total spreads its 50 events over all bins
        // in proportion to nominal: every ratio is then sum(v)/sum(N)
        double ratio = sum(v) / sum(N);
        for (int b = 0; b < N.length; b++) assertEquals(ratio, s[b] / N[b], 1e-12, "bin " + b);
    }

    @Test
    void alternatingNoiseIsDamped() {
        double[] v = new double[N.length];
        double rawSpread = 0, smoothSpread = 0;
        for (int b = 0; b < N.length; b++) v[b] = N[b] * (1 + (b % 2 == 0 ? 0.05 : -0.05));
        double[] s = ShapeSmoothing.smooth(N, v);
        double ratio = sum(v) / sum(N);
        for (int b = 1; b < N.length - 1; b++) {
            rawSpread = Math.max(rawSpread, Math.abs(v[b] / N[b] - ratio));
            smoothSpread = Math.max(smoothSpread, Math.abs(s[b] / N[b] - ratio));
        }
        assertTrue(smoothSpread < 0.5 * rawSpread, smoothSpread + " vs " + rawSpread);
        assertEquals(sum(v), sum(s), 1e-12 * sum(v));
    }

    @Test
    void binsWithoutNominalKeepTheirValueAndTooFewBinsAreLeftAlone() {
        double[] n = {10, 0, 20, 30};
        double[] v = {11, 2, 19, 33};
        double[] s = ShapeSmoothing.smooth(n, v);
        assertEquals(2, s[1], 0);
        assertEquals(sum(v), sum(s), 1e-12);
        assertNull(ShapeSmoothing.smooth(new double[] {10, 0, 20}, new double[] {11, 1, 19}));
    }
}
