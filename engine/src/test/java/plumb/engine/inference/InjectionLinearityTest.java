package plumb.engine.inference;

import org.apache.commons.math3.stat.regression.GLSMultipleLinearRegression;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

class InjectionLinearityTest {

    /**
     * Weighted least squares with known errors equals commons-math 3.6.1's generalised least squares
     * with a diagonal covariance diag(σ²): parameters β = (XᵀΩ⁻¹X)⁻¹XᵀΩ⁻¹y and their variances the
     * diagonal of (XᵀΩ⁻¹X)⁻¹ (GLSMultipleLinearRegression.estimateRegressionParametersVariance, unscaled).
     */
    @ParameterizedTest
    @CsvSource({"4,1", "2,2", "7,3", "5,4"})
    void agreesWithCommonsMathGeneralisedLeastSquares(int n, long seed) {
        Random r = new Random(seed);
        double[] x = new double[n], y = new double[n], e = new double[n];
        double[][] design = new double[n][1], omega = new double[n][n];
        for (int i = 0; i < n; i++) {
            x[i] = i * 1.5 + r.nextDouble() + (seed == 4 ? 1000 : 0); // seed 4: far from 0, tests the centring
            e[i] = 0.02 + 0.1 * r.nextDouble();
            y[i] = 0.1 + 0.97 * x[i] + e[i] * r.nextGaussian();
            design[i][0] = x[i];
            omega[i][i] = e[i] * e[i];
        }
        GLSMultipleLinearRegression gls = new GLSMultipleLinearRegression();
        gls.newSampleData(y, design, omega);
        double[] beta = gls.estimateRegressionParameters();
        double[][] var = gls.estimateRegressionParametersVariance();
        InjectionLinearity line = InjectionLinearity.fit(x, y, e);
        assertEquals(beta[1], line.slope(), 1e-9 * Math.abs(beta[1]));
        // offset: far from x = 0 (seed 4) the uncentred QR of commons-math loses digits (cond(X) ≈ 1e6),
        // so the offset is compared on the scale of its own error
        assertEquals(beta[0], line.offset(), 1e-6 * line.offsetError());
        assertEquals(Math.sqrt(var[1][1]), line.slopeError(), 1e-6 * Math.sqrt(var[1][1]));
        assertEquals(Math.sqrt(var[0][0]), line.offsetError(), 1e-6 * Math.sqrt(var[0][0]));
    }

    @ParameterizedTest
    @CsvSource({"1", "2"})
    void needsTwoDistinctValues(int n) {
        double[] x = new double[n], y = new double[n], e = new double[n];
        java.util.Arrays.fill(x, 2);
        java.util.Arrays.fill(e, 0.1);
        assertThrows(IllegalArgumentException.class, () -> InjectionLinearity.fit(x, y, e));
    }

    /**
     * Points without a positive, finite error of the mean are left out, and what is left must hold
     * two distinct injected values: (1, 2, 3) on y = 0.1 + 0.9x with the point at 2 lacking an
     * error gives the line through the other two exactly.
     */
    @org.junit.jupiter.api.Test
    void throughUsableLeavesOutPointsWithoutError() {
        InjectionLinearity line = InjectionLinearity.throughUsable(new double[] {1, 2, 3}, new double[] {1.0, 5, 2.8},
                new double[] {0.1, Double.NaN, 0.1});
        assertEquals(0.9, line.slope(), 1e-12);
        assertEquals(0.1, line.offset(), 1e-12);
        org.junit.jupiter.api.Assertions.assertNull(InjectionLinearity.throughUsable(new double[] {1, 2},
                new double[] {1, 2}, new double[] {0.1, 0}));
    }
}
