package plumb.engine.linalg;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;

class WeightedGramTest {

    /** The row-by-row update the kernel blocks: groups of four rows, then single rows. */
    private static void unblocked(double[] v, int stride, double[] w, int rows, int n, double[] c) {
        int r = 0;
        for (; r + 3 < rows; r += 4) {
            int o0 = r * stride, o1 = o0 + stride, o2 = o1 + stride, o3 = o2 + stride;
            for (int i = 0; i < n; i++) {
                double a0 = w[r] * v[o0 + i], a1 = w[r + 1] * v[o1 + i], a2 = w[r + 2] * v[o2 + i], a3 = w[r + 3] * v[o3 + i];
                if (a0 == 0 && a1 == 0 && a2 == 0 && a3 == 0) continue;
                for (int j = i; j < n; j++) c[i * n + j] += a0 * v[o0 + j] + a1 * v[o1 + j] + a2 * v[o2 + j] + a3 * v[o3 + j];
            }
        }
        for (; r < rows; r++) {
            for (int i = 0; i < n; i++) {
                double vi = w[r] * v[r * stride + i];
                if (vi == 0) continue;
                for (int j = i; j < n; j++) c[i * n + j] += vi * v[r * stride + j];
            }
        }
    }

    private static double[] random(int size, Random rng, double zeroShare) {
        double[] a = new double[size];
        for (int k = 0; k < size; k++) a[k] = rng.nextDouble() < zeroShare ? 0 : rng.nextGaussian();
        return a;
    }

    @Test
    void sameSumsAsTheRowByRowUpdate() {
        Random rng = new Random(17);
        for (int n : new int[] {1, 5, 16, 17, 129, 293}) {
            for (int rows : new int[] {0, 1, 3, 4, 7, 61}) {
                int stride = n + 3;
                double[] v = random(rows * stride, rng, 0.3);
                double[] w = random(rows, rng, 0.1);
                double[] start = random(n * n, rng, 0);
                double[] expected = start.clone(), got = start.clone();
                unblocked(v, stride, w, rows, n, expected);
                WeightedGram.addUpper(v, stride, w, rows, n, got);
                for (int k = 0; k < n * n; k++) {
                    assertEquals(expected[k], got[k], 0, "n=" + n + " rows=" + rows + " entry " + k);
                }
            }
        }
    }

    /** Against Vᵀ·diag(w)·V by commons-math's matrix products (an independent reference). */
    @Test
    void upperTriangleIsTheWeightedGramMatrix() {
        Random rng = new Random(4);
        int n = 150, rows = 37;
        double[] v = random(rows * n, rng, 0.2);
        double[] w = random(rows, rng, 0);
        double[] c = new double[n * n];
        WeightedGram.addUpper(v, n, w, rows, n, c);
        double[][] vm = new double[rows][n], wv = new double[rows][n];
        for (int r = 0; r < rows; r++) {
            for (int j = 0; j < n; j++) {
                vm[r][j] = v[r * n + j];
                wv[r][j] = w[r] * v[r * n + j];
            }
        }
        RealMatrix expected = new Array2DRowRealMatrix(vm).transpose().multiply(new Array2DRowRealMatrix(wv));
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double want = j >= i ? expected.getEntry(i, j) : 0;
                assertEquals(want, c[i * n + j], 1e-12 * (1 + Math.abs(want)), "entry " + i + "," + j);
            }
        }
    }
}
