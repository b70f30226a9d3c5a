package plumb.engine.linalg;

import java.util.Locale;

/**
 * Hand-written row-oriented (Cholesky–Banachiewicz) kernel over flat row-major arrays. Written
 * here rather than taken from ojalgo because the minimisers factor a new reduced Hessian every
 * iteration: this kernel allocates nothing after construction and walks contiguous rows, so the
 * inner loops are plain dot products. {@link OjalgoCholesky} passes the same contract test.
 */
public final class DenseCholesky implements CholeskySolver {

    private final int capacity;
    /** L in the lower triangle, row stride = size of the current factor. */
    private final double[] factor;
    /** 1 / L_ii: multiplications instead of divisions in the solves. */
    private final double[] inverseDiagonal;
    /** Work space for the inverse: L⁻¹, lower triangle, stride m. */
    private final double[] work;
    private int size;
    private boolean factored;

    /**
     * @param capacity largest matrix size to factor, at least 0
     * @throws IllegalArgumentException if capacity is negative or capacity² overflows an array
     */
    public DenseCholesky(int capacity) {
        if (capacity < 0 || (long) capacity * capacity > Integer.MAX_VALUE - 8) {
            throw new IllegalArgumentException(
                    String.format(Locale.ROOT, "capacity %d is not in [0, 46340]", capacity));
        }
        this.capacity = capacity;
        this.factor = new double[capacity * capacity];
        this.inverseDiagonal = new double[capacity];
        this.work = new double[capacity * capacity];
    }

    @Override
    public int capacity() {
        return capacity;
    }

    @Override
    public int size() {
        return size;
    }

    @Override
    public boolean decompose(double[] matrix, int m) {
        Checks.matrixArgument(matrix, m, capacity);
        size = 0;
        factored = false;
        if (!factor(matrix, m, factor, inverseDiagonal)) {
            return false;
        }
        size = m;
        factored = true;
        return true;
    }

    /**
     * Kernel: factors a (m×m, stride m, lower triangle) into l; checks nothing.
     * Written as "valid case first" so NaN pivots land in the failure branch.
     */
    static boolean factor(double[] a, int m, double[] l, double[] invDiag) {
        for (int i = 0; i < m; i++) {
            final int rowI = i * m;
            for (int j = 0; j < i; j++) {
                final int rowJ = j * m;
                double sum = a[rowI + j];
                for (int k = 0; k < j; k++) {
                    sum -= l[rowI + k] * l[rowJ + k];
                }
                l[rowI + j] = sum * invDiag[j];
            }
            double pivot = a[rowI + i];
            for (int k = 0; k < i; k++) {
                final double lik = l[rowI + k];
                pivot -= lik * lik;
            }
            if (pivot > 0 && pivot < Double.POSITIVE_INFINITY) {
                final double d = Math.sqrt(pivot);
                l[rowI + i] = d;
                invDiag[i] = 1.0 / d;
            } else {
                return false;
            }
        }
        return true;
    }

    @Override
    public void solve(double[] rhs, double[] solution) {
        requireFactor();
        Checks.vectorArgument(rhs, size, "rhs");
        Checks.vectorArgument(solution, size, "solution");
        final int m = size;
        // Forward: L y = b.
        for (int i = 0; i < m; i++) {
            final int rowI = i * m;
            double sum = rhs[i];
            for (int k = 0; k < i; k++) {
                sum -= factor[rowI + k] * solution[k];
            }
            solution[i] = sum * inverseDiagonal[i];
        }
        // Backward: Lᵀ x = y, column-oriented so that L is read along its rows.
        for (int i = m - 1; i >= 0; i--) {
            final int rowI = i * m;
            final double xi = solution[i] * inverseDiagonal[i];
            solution[i] = xi;
            for (int k = 0; k < i; k++) {
                solution[k] -= factor[rowI + k] * xi;
            }
        }
    }

    @Override
    public void invert(double[] inverse) {
        requireFactor();
        final int m = size;
        Checks.vectorArgument(inverse, m * m, "inverse");
        // W = L⁻¹ (lower triangular), row by row: W_ij = -(Σ_{k=j}^{i-1} L_ik W_kj) / L_ii.
        for (int i = 0; i < m; i++) {
            final int rowI = i * m;
            for (int j = 0; j < i; j++) {
                double sum = 0;
                for (int k = j; k < i; k++) {
                    sum -= factor[rowI + k] * work[k * m + j];
                }
                work[rowI + j] = sum * inverseDiagonal[i];
            }
            work[rowI + i] = inverseDiagonal[i];
        }
        // A⁻¹ = Wᵀ W: (A⁻¹)_ij = Σ_{k ≥ max(i,j)} W_ki W_kj.
        for (int i = 0; i < m; i++) {
            final int rowI = i * m;
            for (int j = 0; j <= i; j++) {
                double sum = 0;
                for (int k = i; k < m; k++) {
                    final int rowK = k * m;
                    sum += work[rowK + i] * work[rowK + j];
                }
                inverse[rowI + j] = sum;
                inverse[j * m + i] = sum;
            }
        }
    }

    @Override
    public double logDeterminant() {
        requireFactor();
        double sum = 0;
        for (int i = 0; i < size; i++) {
            sum -= Math.log(inverseDiagonal[i]);
        }
        return 2 * sum;
    }

    private void requireFactor() {
        if (!factored) {
            throw new IllegalStateException("no successful decomposition to use");
        }
    }
}
