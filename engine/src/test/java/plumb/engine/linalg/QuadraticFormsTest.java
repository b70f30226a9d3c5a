package plumb.engine.linalg;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** Checked against commons-math's matrix–vector product (an independent reference), vᵀ(Av). */
class QuadraticFormsTest {

    private static double[] symmetric(int n, Random rng) {
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = i; j < n; j++) {
                double v = rng.nextGaussian();
                a[i * n + j] = v;
                a[j * n + i] = v;
            }
        }
        return a;
    }

    private static RealMatrix reference(double[] a, int n) {
        double[][] rows = new double[n][n];
        for (int i = 0; i < n; i++) System.arraycopy(a, i * n, rows[i], 0, n);
        return new Array2DRowRealMatrix(rows, false);
    }

    @Test
    void formsOfManyVectorsMatchTheReference() {
        Random rng = new Random(11);
        for (int n : new int[] {1, 2, 3, 5, 8, 13, 37}) {
            double[] a = symmetric(n, rng);
            RealMatrix ref = reference(a, n);
            for (int count : new int[] {1, 3, 4, 5, 9}) {
                int stride = n + 2;
                double[] vectors = new double[count * stride];
                for (int k = 0; k < vectors.length; k++) vectors[k] = rng.nextGaussian();
                // zero entries and a whole zero vector, which the kernel skips
                vectors[0] = 0;
                if (count > 2) java.util.Arrays.fill(vectors, stride, stride + n, 0);
                double[] out = new double[count];
                new QuadraticForms(40).symmetric(a, n, vectors, stride, count, out);
                for (int r = 0; r < count; r++) {
                    double[] v = java.util.Arrays.copyOfRange(vectors, r * stride, r * stride + n);
                    ArrayRealVector vv = new ArrayRealVector(v);
                    double expected = vv.dotProduct(ref.operate(vv));
                    double scale = 0;
                    for (int i = 0; i < n; i++) for (int j = 0; j < n; j++) scale += Math.abs(v[i] * a[i * n + j] * v[j]);
                    assertEquals(expected, out[r], 1e-14 * scale + 1e-300, "n=" + n + " count=" + count + " r=" + r);
                }
            }
        }
    }

    @Test
    void onlyTheUpperTriangleIsRead() {
        Random rng = new Random(5);
        int n = 9;
        double[] a = symmetric(n, rng);
        double[] v = new double[n];
        for (int i = 0; i < n; i++) v[i] = rng.nextGaussian();
        double[] expected = new double[1], got = new double[1];
        QuadraticForms forms = new QuadraticForms(n);
        forms.symmetric(a, n, v, n, 1, expected);
        for (int i = 0; i < n; i++) for (int j = 0; j < i; j++) a[i * n + j] = Double.NaN;
        forms.symmetric(a, n, v, n, 1, got);
        assertEquals(expected[0], got[0], 0);
    }

    @Test
    void productMatchesTheReference() {
        Random rng = new Random(3);
        int n = 23;
        double[] a = symmetric(n, rng);
        double[] v = new double[n];
        for (int i = 0; i < n; i++) v[i] = i % 4 == 0 ? 0 : rng.nextGaussian();
        double[] out = new double[n];
        QuadraticForms.times(a, n, v, out);
        double[] expected = reference(a, n).operate(v);
        for (int i = 0; i < n; i++) assertEquals(expected[i], out[i], 1e-13, "row " + i);
    }

    @Test
    void refusesVectorsLongerThanItsCapacity() {
        assertThrows(IllegalArgumentException.class,
                () -> new QuadraticForms(3).symmetric(new double[16], 4, new double[4], 4, 1, new double[1]));
    }
}
