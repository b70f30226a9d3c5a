package plumb.engine.compile;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** Interpolation of docs/model-format.md ("Normalisation term", "Shape term"). */
class InterpolationTest {

    private static final double EPS = 1e-7;

    private static double[] norm(int mode, double ku, double kd, double theta) {
        double[] c = new double[NormInterpolation.COEFFS];
        NormInterpolation.coefficients(mode, ku, kd, c, 0);
        double[] out = new double[3];
        NormInterpolation.evaluate(c, 0, theta, out);
        return out;
    }

    /** Smooth norm: value, slope and curvature continuous at θ = ±1 (the defining conditions of a1..a6). */
    @ParameterizedTest
    @CsvSource({"1.1,0.9", "1.3,0.95", "0.8,1.25", "1.05,1.02", "2.5,0.3"})
    void smoothNormIsTwiceContinuouslyDifferentiable(double ku, double kd) {
        for (double at : new double[] {-1, 1}) {
            double[] inside = norm(NormInterpolation.SMOOTH, ku, kd, at * (1 - 1e-12));
            double[] outside = norm(NormInterpolation.EXPONENTIAL, ku, kd, at);
            for (int d = 0; d < 3; d++) assertEquals(outside[d], inside[d], 1e-9 * (1 + Math.abs(outside[d])), "derivative " + d);
        }
        // at θ = 0: f = 1 and the polynomial is smooth by construction; check slope continuity numerically
        double[] left = norm(NormInterpolation.SMOOTH, ku, kd, -1e-9), right = norm(NormInterpolation.SMOOTH, ku, kd, 1e-9);
        assertEquals(1, norm(NormInterpolation.SMOOTH, ku, kd, 0)[0], 1e-15);
        assertEquals(left[1], right[1], 1e-7);
        assertEquals(left[2], right[2], 1e-7);
    }

    /** Derivatives of every norm mode against central differences of the value (common practice). */
    @ParameterizedTest
    @CsvSource({"0,-2.3", "0,0.4", "1,-0.7", "1,1.5", "2,-0.3", "2,0.77", "2,-1.8", "3,0.6"})
    void normDerivativesMatchFiniteDifferences(int mode, double theta) {
        double[] at = norm(mode, 1.2, 0.85, theta);
        double[] up = norm(mode, 1.2, 0.85, theta + EPS), down = norm(mode, 1.2, 0.85, theta - EPS);
        assertEquals((up[0] - down[0]) / (2 * EPS), at[1], 1e-6);
        assertEquals((up[1] - down[1]) / (2 * EPS), at[2], 1e-6);
    }

    /** The format page's branches: exponential κu^θ / κd^(−θ), linear 1 + θ(κu − 1) / 1 + θ(1 − κd). */
    @ParameterizedTest
    @CsvSource({"0.5", "-0.5", "2", "-3"})
    void exponentialAndLinearFollowTheFormatPage(double theta) {
        double ku = 1.2, kd = 0.85;
        double expected = theta >= 0 ? Math.pow(ku, theta) : Math.pow(kd, -theta);
        assertEquals(expected, norm(NormInterpolation.EXPONENTIAL, ku, kd, theta)[0], 1e-14);
        double lin = Math.max(0, theta >= 0 ? 1 + theta * (ku - 1) : 1 + theta * (1 - kd));
        assertEquals(lin, norm(NormInterpolation.LINEAR, ku, kd, theta)[0], 1e-14);
        // outside |θ| < 1 smooth equals exponential
        if (Math.abs(theta) >= 1) assertEquals(expected, norm(NormInterpolation.SMOOTH, ku, kd, theta)[0], 1e-14);
    }

    /** Δ = S·θ + A·P(θ) reproduces the closed form θS + Aθ²(15 − 10θ² + 3θ⁴) inside and the linear branches outside. */
    @ParameterizedTest
    @CsvSource({"-2.5", "-1", "-0.6", "0", "0.3", "0.999", "1", "1.7"})
    void smoothShapeFollowsTheClosedForm(double theta) {
        double n = 40, u = 46, d = 37;
        double s = (u - d) / 2, a = (u + d - 2 * n) / 16;
        double[] p = new double[3];
        ShapeInterpolation.evaluate(ShapeInterpolation.SMOOTH, theta, p);
        double delta = s * theta + a * p[0];
        double expected = Math.abs(theta) < 1
                ? theta * s + a * theta * theta * (15 - 10 * theta * theta + 3 * Math.pow(theta, 4))
                : (theta >= 0 ? theta * (u - n) : theta * (n - d));
        assertEquals(expected, delta, 1e-12);
        ShapeInterpolation.evaluate(ShapeInterpolation.LINEAR, theta, p);
        assertEquals(theta >= 0 ? theta * (u - n) : theta * (n - d), s * theta + a * p[0], 1e-12);
    }

    /** Smooth shape: value, slope and curvature continuous at θ = ±1 and at 0. */
    @ParameterizedTest
    @CsvSource({"-1", "0", "1"})
    void smoothShapeIsTwiceContinuouslyDifferentiable(double at) {
        double[] left = new double[3], right = new double[3];
        ShapeInterpolation.evaluate(ShapeInterpolation.SMOOTH, at - 1e-9, left);
        ShapeInterpolation.evaluate(ShapeInterpolation.SMOOTH, at + 1e-9, right);
        for (int d = 0; d < 3; d++) assertEquals(left[d], right[d], 1e-6, "derivative " + d);
    }
}
