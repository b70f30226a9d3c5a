package plumb.engine.linalg;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The contract every {@link CholeskySolver} passes: hand-built cases whose answers follow from the
 * definition, and fixed-seed random SPD matrices compared against commons-math 3.6.1's
 * CholeskyDecomposition (an independent general-purpose library).
 */
abstract class CholeskySolverContract {

    abstract CholeskySolver create(int capacity);

    // A = L Lᵀ with L = [[2,0,0],[6,1,0],[-8,5,3]], multiplied out by hand (definition of the
    // factorisation); det A = (2·1·3)² = 36.
    private static final double[] A3 = {4, 12, -16, 12, 37, -43, -16, -43, 98};

    @Test
    void factorsAHandBuiltMatrix() {
        CholeskySolver solver = create(3);
        assertTrue(solver.decompose(A3, 3));
        assertEquals(3, solver.size());
        assertEquals(Math.log(36), logDeterminant(solver), 1e-13); // det = 36, see A3
        double[] x = {1, -2, 0.5};
        double[] b = multiply(A3, x, 3);
        double[] solution = new double[3];
        solver.solve(b, solution);
        assertArrayEquals(x, solution, 1e-11); // definition: A x = b
        double[] inverse = new double[9];
        solver.invert(inverse);
        assertArrayEquals(identity(3), product(A3, inverse, 3), 1e-11); // definition: A A⁻¹ = I
    }

    @Test
    void solvesInPlace() {
        CholeskySolver solver = create(3);
        assertTrue(solver.decompose(A3, 3));
        double[] x = {3, 1, -1};
        double[] b = multiply(A3, x, 3);
        solver.solve(b, b);
        assertArrayEquals(x, b, 1e-11); // definition: A x = b, rhs overwritten
    }

    @Test
    void readsOnlyTheLowerTriangle() {
        double[] a = A3.clone();
        a[1] = Double.NaN;
        a[2] = 1e300;
        a[5] = -7;
        CholeskySolver solver = create(3);
        assertTrue(solver.decompose(a, 3));
        assertEquals(Math.log(36), logDeterminant(solver), 1e-13); // same A3 as above
    }

    @Test
    void leavesTheInputUnchanged() {
        double[] a = A3.clone();
        create(3).decompose(a, 3);
        assertArrayEquals(A3, a, 0.0);
    }

    @Test
    void factorsASmallerMatrixPackedAtTheStartOfABiggerArray() {
        CholeskySolver solver = create(5);
        double[] big = new double[25];
        Arrays.fill(big, Double.NaN); // entries past 3·3 must not be read
        System.arraycopy(A3, 0, big, 0, 9);
        assertTrue(solver.decompose(big, 3));
        double[] b = {1, 1, 1, Double.NaN, Double.NaN};
        double[] solution = new double[5];
        Arrays.fill(solution, 42);
        solver.solve(b, solution);
        assertArrayEquals(Arrays.copyOf(b, 3), multiply(A3, solution, 3), 1e-11); // A x = b
        assertEquals(42, solution[3], 0.0);
    }

    @Test
    void reportsNonPositiveDefiniteMatricesWithFalse() {
        CholeskySolver solver = create(3);
        // Eigenvalues 3 and -1 (from the characteristic polynomial, by hand).
        assertFalse(solver.decompose(new double[] {1, 2, 2, 1}, 2));
        // Singular: eigenvalues 2 and 0, second pivot exactly 0.
        assertFalse(solver.decompose(new double[] {1, 1, 1, 1}, 2));
        assertFalse(solver.decompose(new double[] {-1, 0, 0, 1}, 2));
        assertFalse(solver.decompose(new double[] {0, 0, 0, 0}, 2));
        assertFalse(solver.decompose(new double[] {1, Double.NaN, Double.NaN, 1}, 2));
        assertFalse(solver.decompose(new double[] {Double.NaN}, 1));
        assertFalse(solver.decompose(new double[] {Double.POSITIVE_INFINITY}, 1));
        assertFalse(solver.decompose(new double[] {1, 0, 0, 0, 1, 0, 0, 0, Double.POSITIVE_INFINITY}, 3));
        assertThrows(IllegalStateException.class, () -> solver.solve(new double[2], new double[2]));
        assertThrows(IllegalStateException.class, () -> solver.invert(new double[4]));
    }

    @Test
    void rejectsMisuse() {
        CholeskySolver solver = create(2);
        assertThrows(IllegalArgumentException.class, () -> solver.decompose(new double[9], 3));
        assertThrows(IllegalArgumentException.class, () -> solver.decompose(new double[3], 2));
        assertTrue(solver.decompose(new double[] {2, 0, 0, 2}, 2));
        assertThrows(IllegalArgumentException.class, () -> solver.solve(new double[1], new double[2]));
        assertThrows(IllegalArgumentException.class, () -> solver.invert(new double[3]));
    }

    @Test
    void handlesTheEmptyAndOneByOneMatrix() {
        CholeskySolver solver = create(1);
        assertTrue(solver.decompose(new double[0], 0));
        assertTrue(solver.decompose(new double[] {4}, 1));
        double[] x = new double[1];
        solver.solve(new double[] {2}, x);
        assertEquals(0.5, x[0], 1e-15);
        double[] inv = new double[1];
        solver.invert(inv);
        assertEquals(0.25, inv[0], 1e-15);
        assertEquals(Math.log(4), logDeterminant(solver), 1e-15);
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 5, 17, 40, 131, 300, 700})
    void agreesWithCommonsMathOnRandomSpdMatrices(int m) {
        // 700: large enough that DenseCholesky splits its factor and inverse between two threads
        SplittableRandom random = new SplittableRandom(20240601L + m);
        CholeskySolver solver = create(Math.max(300, m));
        for (int trial = 0; trial < 3; trial++) {
            double[] a = randomSpd(m, random);
            if (trial == 2) blockPattern(a, m);
            double[] b = new double[m];
            for (int i = 0; i < m; i++) {
                b[i] = random.nextDouble(-1, 1);
            }
            RealMatrix reference = new Array2DRowRealMatrix(m, m);
            for (int i = 0; i < m; i++) {
                for (int j = 0; j < m; j++) {
                    reference.setEntry(i, j, a[i * m + j]);
                }
            }
            CholeskyDecomposition cm = new CholeskyDecomposition(reference);
            assertTrue(solver.decompose(a, m));
            // Matrices below have condition numbers ≲ 1e3; 1e-10 relative leaves ample room.
            assertEquals(Math.log(cm.getDeterminant()), logDeterminant(solver),
                    1e-10 * Math.abs(Math.log(cm.getDeterminant())) + 1e-12);
            double[] x = new double[m];
            solver.solve(b, x);
            assertArrayEquals(cm.getSolver().solve(new ArrayRealVector(b)).toArray(), x, 1e-10);
            double[] inverse = new double[m * m];
            solver.invert(inverse);
            double[] expected = new double[m * m];
            RealMatrix cmInverse = cm.getSolver().getInverse();
            for (int i = 0; i < m; i++) {
                for (int j = 0; j < m; j++) {
                    expected[i * m + j] = cmInverse.getEntry(i, j);
                }
            }
            assertArrayEquals(expected, inverse, 1e-10);
            for (int i = 0; i < m; i++) {
                for (int j = 0; j < m; j++) {
                    assertEquals(inverse[i * m + j], inverse[j * m + i], 0.0); // exactly symmetric
                }
            }
        }
    }

    /**
     * Zeros between blocks of 30 among all but the last 10 variables (the pattern of a likelihood's
     * Hessian: channel parameters and global ones), kept positive definite by a dominant diagonal.
     */
    private static void blockPattern(double[] a, int m) {
        for (int i = 0; i < m; i++) {
            for (int j = 0; j < m; j++) {
                if (i < m - 10 && j < m - 10 && i / 30 != j / 30) a[i * m + j] = 0;
            }
        }
        for (int i = 0; i < m; i++) {
            double sum = 0;
            for (int j = 0; j < m; j++) if (j != i) sum += Math.abs(a[i * m + j]);
            a[i * m + i] = sum + 1;
        }
    }

    @Test
    void isReusableAcrossSizes() {
        SplittableRandom random = new SplittableRandom(7);
        CholeskySolver solver = create(6);
        double[] big = randomSpd(6, random);
        assertTrue(solver.decompose(big, 6));
        double first = logDeterminant(solver);
        assertTrue(solver.decompose(A3, 3));
        assertEquals(Math.log(36), logDeterminant(solver), 1e-13);
        assertTrue(solver.decompose(big, 6));
        assertEquals(first, logDeterminant(solver), 0.0); // same input, same arithmetic
    }

    /** B Bᵀ + I with B uniform in (-1, 1): symmetric, eigenvalues ≥ 1 (common practice). */
    static double[] randomSpd(int m, SplittableRandom random) {
        double[] bm = new double[m * m];
        for (int i = 0; i < bm.length; i++) {
            bm[i] = random.nextDouble(-1, 1);
        }
        double[] a = new double[m * m];
        for (int i = 0; i < m; i++) {
            for (int j = 0; j < m; j++) {
                double s = i == j ? 1 : 0;
                for (int k = 0; k < m; k++) {
                    s += bm[i * m + k] * bm[j * m + k];
                }
                a[i * m + j] = s;
            }
        }
        return a;
    }

    static double[] multiply(double[] a, double[] x, int m) {
        double[] y = new double[m];
        for (int i = 0; i < m; i++) {
            for (int k = 0; k < m; k++) {
                y[i] += a[i * m + k] * x[k];
            }
        }
        return y;
    }

    static double[] product(double[] a, double[] b, int m) {
        double[] c = new double[m * m];
        for (int i = 0; i < m; i++) {
            for (int j = 0; j < m; j++) {
                for (int k = 0; k < m; k++) {
                    c[i * m + j] += a[i * m + k] * b[k * m + j];
                }
            }
        }
        return c;
    }

    static double[] identity(int m) {
        double[] e = new double[m * m];
        for (int i = 0; i < m; i++) {
            e[i * m + i] = 1;
        }
        return e;
    }

    /** ln det A of the last factored A, from the solver's inverse: −ln det A⁻¹ by commons-math's LU. */
    static double logDeterminant(CholeskySolver solver) {
        int m = solver.size();
        double[] inv = new double[m * m];
        solver.invert(inv);
        double[][] rows = new double[m][m];
        for (int i = 0; i < m; i++) System.arraycopy(inv, i * m, rows[i], 0, m);
        return -Math.log(new org.apache.commons.math3.linear.LUDecomposition(
                new org.apache.commons.math3.linear.Array2DRowRealMatrix(rows, false)).getDeterminant());
    }
}
