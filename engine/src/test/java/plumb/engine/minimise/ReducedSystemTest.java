package plumb.engine.minimise;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;

import java.util.Arrays;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A system big enough to be factored in the fill-reducing order: its solutions, inverse and damped
 * factor, in the variables' own order, against commons-math's Cholesky of the same matrix.
 */
class ReducedSystemTest {

    /** Block-sparse SPD: 20 global variables first (coupled to all), then blocks of 40 local ones. */
    private static double[] blockSparse(int n, SplittableRandom r) {
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < i; j++) {
                boolean coupled = i < 20 || j < 20 || (i - 20) / 40 == (j - 20) / 40;
                if (coupled) a[i * n + j] = a[j * n + i] = r.nextDouble(-1, 1);
            }
        }
        for (int i = 0; i < n; i++) {
            double sum = 0;
            for (int j = 0; j < n; j++) if (j != i) sum += Math.abs(a[i * n + j]);
            a[i * n + i] = sum + 1 + r.nextDouble();
        }
        return a;
    }

    private static Box box(int n, boolean[] fixed) {
        double[] lo = new double[n], hi = new double[n];
        Arrays.fill(lo, -10);
        Arrays.fill(hi, 10);
        Objective none = new Objective() {
            public int dimension() { return n; }
            public double value(double[] x) { return 0; }
            public double valueAndGradient(double[] x, double[] g) { return 0; }
            public double valueGradientHessian(double[] x, double[] g, double[] h) { return 0; }
        };
        return Box.of(n, none, new double[n], lo, hi, fixed);
    }

    @Test
    void orderedFactorAgreesWithCommonsMath() {
        int n = 460;
        SplittableRandom r = new SplittableRandom(41);
        double[] h = blockSparse(n, r);
        boolean[] fixed = new boolean[n];
        fixed[3] = fixed[100] = fixed[459] = true;
        ReducedSystem system = new ReducedSystem(n);
        int k = system.selectNotHeld(box(n, fixed));
        assertEquals(n - 3, k);
        assertTrue(k >= ReducedSystem.ORDERED_FROM);
        for (double lambda : new double[] {0, 0.3, 0}) {
            RealMatrix reference = new Array2DRowRealMatrix(k, k);
            for (int a = 0; a < k; a++) {
                for (int b = 0; b < k; b++) {
                    double v = h[system.index[a] * n + system.index[b]];
                    if (a == b) v += lambda * Math.abs(v);
                    reference.setEntry(a, b, v);
                }
            }
            CholeskyDecomposition cm = new CholeskyDecomposition(reference);
            assertTrue(system.factor(h, lambda));
            double[] v = new double[n];
            for (int i = 0; i < n; i++) v[i] = r.nextDouble(-1, 1);
            double quadratic = system.solve(v);
            double[] vF = new double[k];
            for (int a = 0; a < k; a++) vF[a] = v[system.index[a]];
            double[] expected = cm.getSolver().solve(new ArrayRealVector(vF)).toArray();
            double expectedQuadratic = 0;
            for (int a = 0; a < k; a++) {
                // diagonally dominant, condition ≲ 10: 1e-12 leaves room for rounding
                assertEquals(expected[a], system.solution[a], 1e-12, "solution " + a);
                expectedQuadratic += vF[a] * expected[a];
            }
            assertEquals(expectedQuadratic, quadratic, 1e-12 * Math.abs(expectedQuadratic));
            double[] inverse = new double[k * k];
            system.invert(inverse);
            RealMatrix cmInverse = cm.getSolver().getInverse();
            for (int a = 0; a < k; a++) {
                for (int b = 0; b < k; b++) {
                    assertEquals(cmInverse.getEntry(a, b), inverse[a * k + b], 1e-12, "inverse " + a + "," + b);
                }
            }
        }
    }
}
