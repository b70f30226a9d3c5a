package plumb.engine.linalg;

import java.util.Locale;

/**
 * Hand-written blocked kernel over flat row-major arrays. It holds U = Lᵀ in the upper triangle
 * (row k of U is column k of L), so every inner loop is an update {@code y[j] -= s·x[j]} along
 * contiguous rows, which the JIT compiles to vector instructions; dot products (the textbook
 * row-oriented form) would stay scalar. The trailing rows are updated by panels of
 * {@link #PANEL} rows at once, four rows fused per pass, so a row is read and written once per
 * four multipliers, and a multiplier that is zero (the block sparsity of a likelihood's
 * Hessian: parameters of different channels) skips its row altogether.
 *
 * <p>Measured against ojalgo's dense Cholesky (which copies into its own store every call) and
 * the earlier row-oriented kernel by {@code CholeskyBenchmark}; this one allocates nothing after
 * construction. An ojalgo-backed solver in the tests (OjalgoCholesky) passes the same contract test.
 */
public final class DenseCholesky implements CholeskySolver {

    /** Rows per panel: a panel of a 2,000-parameter problem (16 × 16 KB) stays in L2. */
    private static final int PANEL = 16;
    /**
     * Fewest rows below a panel, and fewest rows of the inverse, worth a second thread: a
     * 384-row remainder is about 1 ms of work per panel, against tens of µs to hand half of it over.
     */
    static final int PARALLEL_ROWS = 384;

    private final int capacity;
    /** U = Lᵀ in the upper triangle, row stride = size of the current factor; lower part unused. */
    private final double[] factor;
    /** 1 / U_ii: multiplications instead of divisions in the solves. */
    private final double[] inverseDiagonal;
    /** Work space for the inverse: (Uᵀ)⁻¹, lower triangle, stride m. */
    private final double[] work;
    /** Unit weights of the Gram update in {@link #invert}. */
    private final double[] ones;
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
        this.ones = new double[capacity];
        java.util.Arrays.fill(ones, 1);
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
        // U starts as the upper triangle of A, read from A's lower triangle.
        for (int i = 0; i < m; i++) {
            final int rowI = i * m;
            for (int j = 0; j <= i; j++) {
                factor[j * m + i] = matrix[rowI + j];
            }
        }
        if (!factor(factor, m, inverseDiagonal)) {
            return false;
        }
        size = m;
        factored = true;
        return true;
    }

    /**
     * Kernel: factors in place the upper triangle of u (m×m, stride m) into U with UᵀU = A;
     * checks nothing. Written as "valid case first" so NaN pivots land in the failure branch.
     */
    static boolean factor(double[] u, int m, double[] invDiag) {
        for (int k0 = 0; k0 < m; k0 += PANEL) {
            final int k1 = Math.min(k0 + PANEL, m);
            // The panel's rows, which hold every update from the rows above it.
            for (int k = k0; k < k1; k++) {
                final int rowK = k * m;
                final double pivot = u[rowK + k];
                if (!(pivot > 0 && pivot < Double.POSITIVE_INFINITY)) {
                    return false;
                }
                final double d = Math.sqrt(pivot);
                final double inv = 1.0 / d;
                u[rowK + k] = d;
                invDiag[k] = inv;
                for (int j = k + 1; j < m; j++) {
                    u[rowK + j] *= inv;
                }
                for (int i = k + 1; i < k1; i++) {
                    final double s = u[rowK + i];
                    if (s == 0) continue;
                    final int rowI = i * m;
                    for (int j = i; j < m; j++) {
                        u[rowI + j] -= s * u[rowK + j];
                    }
                }
            }
            // The rows below: row i −= Σ_k U_ki · row k over the panel, four rows k per pass. Each
            // row on its own, so a large remainder is split between two threads (equal work: a
            // row's cost falls with its index), with the same sums.
            final int rows = m - k1;
            if (rows >= PARALLEL_ROWS) {
                final int mid = m - (int) (rows / Math.sqrt(2));
                final int from = k0, to = k1;
                TwoWay.run(() -> updateRows(u, m, from, to, k1, mid), () -> updateRows(u, m, from, to, mid, m));
            } else {
                updateRows(u, m, k0, k1, k1, m);
            }
        }
        return true;
    }

    /** Rows [i0, i1) −= the panel [k0, k1)'s rows times their multipliers U_ki, four k per pass. */
    private static void updateRows(double[] u, int m, int k0, int k1, int i0, int i1) {
        for (int i = i0; i < i1; i++) {
            final int rowI = i * m;
            int k = k0;
            for (; k + 3 < k1; k += 4) {
                final int r0 = k * m, r1 = r0 + m, r2 = r1 + m, r3 = r2 + m;
                final double s0 = u[r0 + i], s1 = u[r1 + i], s2 = u[r2 + i], s3 = u[r3 + i];
                if (s0 == 0 && s1 == 0 && s2 == 0 && s3 == 0) continue;
                for (int j = i; j < m; j++) {
                    u[rowI + j] -= s0 * u[r0 + j] + s1 * u[r1 + j] + s2 * u[r2 + j] + s3 * u[r3 + j];
                }
            }
            for (; k < k1; k++) {
                final int rowK = k * m;
                final double s = u[rowK + i];
                if (s == 0) continue;
                for (int j = i; j < m; j++) {
                    u[rowI + j] -= s * u[rowK + j];
                }
            }
        }
    }

    @Override
    public void solve(double[] rhs, double[] solution) {
        requireFactor();
        Checks.vectorArgument(rhs, size, "rhs");
        Checks.vectorArgument(solution, size, "solution");
        final int m = size;
        if (solution != rhs) System.arraycopy(rhs, 0, solution, 0, m);
        // Forward: Uᵀ y = b, along the rows of U.
        for (int k = 0; k < m; k++) {
            final int rowK = k * m;
            final double yk = solution[k] * inverseDiagonal[k];
            solution[k] = yk;
            if (yk == 0) continue;
            for (int i = k + 1; i < m; i++) {
                solution[i] -= factor[rowK + i] * yk;
            }
        }
        // Backward: U x = y.
        for (int i = m - 1; i >= 0; i--) {
            final int rowI = i * m;
            double sum = solution[i];
            for (int j = i + 1; j < m; j++) {
                sum -= factor[rowI + j] * solution[j];
            }
            solution[i] = sum * inverseDiagonal[i];
        }
    }

    @Override
    public void invert(double[] inverse) {
        requireFactor();
        final int m = size;
        Checks.vectorArgument(inverse, m * m, "inverse");
        lowerInverse(factor, m, inverseDiagonal, work);
        // A⁻¹ = UᵀU inverted = XᵀX with X = (Uᵀ)⁻¹: the Gram matrix of X's rows, upper triangle,
        // then mirrored (exactly symmetric).
        java.util.Arrays.fill(inverse, 0, m * m, 0);
        if (m >= PARALLEL_ROWS) {
            // columns of the Gram matrix split in two of equal work: column j costs ≈ j·(m − j)
            final int split = tileSplit(m, WeightedGram.TILE_COLUMNS, j -> (double) j * (m - j));
            TwoWay.run(() -> WeightedGram.addUpperOfTriangularRows(work, m, ones, m, m, inverse, 0, split),
                    () -> WeightedGram.addUpperOfTriangularRows(work, m, ones, m, m, inverse, split, m));
        } else {
            WeightedGram.addUpperOfTriangularRows(work, m, ones, m, m, inverse);
        }
        for (int i = 0; i < m; i++) {
            final int rowI = i * m;
            for (int j = i + 1; j < m; j++) inverse[j * m + i] = inverse[rowI + j];
        }
    }

    /** Rows of X finished together in {@link #lowerInverse}, and the width of its column tiles. */
    private static final int BLOCK_ROWS = 16, BLOCK_COLUMNS = 128;

    /**
     * X = (Uᵀ)⁻¹, lower triangular, into x (row-major, stride m, zeros above the diagonal), from
     * X_i = (e_i − Σ_{k<i} U_ki X_k) / U_ii. Blocked: for a block of {@link #BLOCK_ROWS} rows, the
     * sum over the rows above the block is taken tile by tile of {@link #BLOCK_COLUMNS} columns,
     * four rows k per pass, so each finished row passes through the cache once per block rather
     * than once per row; then the rows within the block, one after the other.
     */
    static void lowerInverse(double[] u, int m, double[] invDiag, double[] x) {
        java.util.Arrays.fill(x, 0, m * m, 0);
        for (int i0 = 0; i0 < m; i0 += BLOCK_ROWS) {
            final int i1 = Math.min(m, i0 + BLOCK_ROWS);
            // rows k < i0 are zero beyond column k: a tile from j0 on needs the rows k ≥ j0. Tiles
            // are independent: many of them are split between two threads (column j costs i0 − j).
            if (i0 >= PARALLEL_ROWS) {
                final int from = i0, to = i1;
                final int split = tileSplit(i0, BLOCK_COLUMNS, j -> from - j);
                TwoWay.run(() -> aboveBlock(u, m, x, from, to, 0, split), () -> aboveBlock(u, m, x, from, to, split, from));
            } else {
                aboveBlock(u, m, x, i0, i1, 0, i0);
            }
            for (int i = i0; i < i1; i++) {
                final int rowI = i * m;
                for (int k = i0; k < i; k++) {
                    final double s = u[k * m + i];
                    if (s == 0) continue;
                    final int rowK = k * m;
                    for (int j = 0; j <= k; j++) x[rowI + j] += s * x[rowK + j];
                }
                final double inv = invDiag[i];
                for (int j = 0; j < i; j++) x[rowI + j] *= -inv;
                x[rowI + i] = inv;
            }
        }
    }

    /**
     * Rows [i0, i1) of X += Σ_{k<i0} U_ki · row k of X, over the column tiles from {@code jFrom}
     * (a tile start) to {@code jTo}.
     */
    private static void aboveBlock(double[] u, int m, double[] x, int i0, int i1, int jFrom, int jTo) {
        for (int j0 = jFrom; j0 < jTo; j0 += BLOCK_COLUMNS) {
            final int j1 = Math.min(jTo, j0 + BLOCK_COLUMNS);
            int k = j0;
            for (; k + 3 < i0; k += 4) {
                final int r0 = k * m, r1 = r0 + m, r2 = r1 + m, r3 = r2 + m;
                for (int i = i0; i < i1; i++) {
                    final double s0 = u[r0 + i], s1 = u[r1 + i], s2 = u[r2 + i], s3 = u[r3 + i];
                    if (s0 == 0 && s1 == 0 && s2 == 0 && s3 == 0) continue;
                    final int rowI = i * m;
                    for (int j = j0; j < j1; j++) {
                        x[rowI + j] += s0 * x[r0 + j] + s1 * x[r1 + j] + s2 * x[r2 + j] + s3 * x[r3 + j];
                    }
                }
            }
            for (; k < i0; k++) {
                final int rowK = k * m;
                for (int i = i0; i < i1; i++) {
                    final double s = u[rowK + i];
                    if (s == 0) continue;
                    final int rowI = i * m;
                    for (int j = j0; j < j1; j++) x[rowI + j] += s * x[rowK + j];
                }
            }
        }
    }

    /**
     * The multiple of {@code tile} in [0, n] that splits columns [0, n) into two parts of about
     * equal total cost, column j costing {@code cost(j)}.
     */
    static int tileSplit(int n, int tile, java.util.function.IntToDoubleFunction cost) {
        double total = 0;
        for (int j = 0; j < n; j++) total += cost.applyAsDouble(j);
        double sum = 0;
        for (int j0 = 0; j0 < n; j0 += tile) {
            for (int j = j0; j < Math.min(n, j0 + tile); j++) sum += cost.applyAsDouble(j);
            if (sum >= total / 2) return Math.min(n, j0 + tile);
        }
        return n;
    }

    private void requireFactor() {
        if (!factored) {
            throw new IllegalStateException("no successful decomposition to use");
        }
    }
}
