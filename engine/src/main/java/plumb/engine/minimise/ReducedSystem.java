package plumb.engine.minimise;

import plumb.engine.linalg.CholeskySolver;
import plumb.engine.linalg.FillOrder;

import java.util.Arrays;

/**
 * The Hessian restricted to a set of variables, factored by Cholesky, with work arrays sized once
 * for n so that building, factoring and solving allocate nothing. Kernel class: checks nothing.
 */
final class ReducedSystem {

    private final int n;
    /** Positions in the full problem of the variables of the current system. */
    final int[] index;
    int size;
    private final double[] matrix;
    private final double[] rhs;
    /** Solution of the last {@link #solve}: H_FF⁻¹ v_F, in system order. */
    final double[] solution;
    private final CholeskySolver cholesky;

    /**
     * Fewest variables for which the system is factored in a fill-reducing order
     * ({@link FillOrder}): below it the order costs more than it saves, and the systems of small
     * models are factored exactly as before.
     */
    static final int ORDERED_FROM = 400;
    /** Whether the current factor is in {@link #order}; else in system order. */
    private boolean ordered;
    /** order[p]: the system position factored p-th; pattern and index set it was made for. */
    private int[] order;
    private long[] orderPattern;
    private int[] orderIndex;
    private final double[] permuted;

    ReducedSystem(int n) {
        this.n = n;
        this.index = new int[n];
        this.matrix = new double[n * n];
        this.rhs = new double[n];
        this.solution = new double[n];
        this.permuted = new double[n];
        this.cholesky = CholeskySolver.create(n);
    }

    /** Selects the variables free to move from x: not held and not pressed against a bound. */
    int selectFree(Box box, double[] x, double[] g) {
        int k = 0;
        for (int i = 0; i < n; i++) {
            if (!box.stays(i, x[i], g[i])) {
                index[k++] = i;
            }
        }
        size = k;
        return k;
    }

    /** Selects every variable that is not held (those at bounds included). */
    int selectNotHeld(Box box) {
        int k = 0;
        for (int i = 0; i < n; i++) {
            if (!box.held[i]) {
                index[k++] = i;
            }
        }
        size = k;
        return k;
    }

    /**
     * Factors H_FF + λ·D, D = diag(max(|H_ii|, 1e-10·max_j |H_jj|)) (Levenberg's scaling, floored
     * so a zero or negative diagonal still gets damped; 1 if the whole diagonal is zero).
     *
     * @return false if not positive definite
     */
    boolean factor(double[] h, double lambda) {
        final int k = size;
        double maxDiagonal = 0;
        if (lambda > 0) {
            for (int a = 0; a < k; a++) {
                final int i = index[a];
                maxDiagonal = Math.max(maxDiagonal, Math.abs(h[i * n + i]));
            }
        }
        final double floor = maxDiagonal > 0 ? 1e-10 * maxDiagonal : 1;
        for (int a = 0; a < k; a++) {
            final int row = index[a] * n;
            final int out = a * k;
            for (int b = 0; b <= a; b++) {
                matrix[out + b] = h[row + index[b]];
            }
            if (lambda > 0) {
                final double d = matrix[out + a];
                matrix[out + a] = d + lambda * Math.max(Math.abs(d), floor);
            }
        }
        ordered = k >= ORDERED_FROM;
        if (ordered) permute(k);
        return cholesky.decompose(matrix, k);
    }

    /**
     * Rewrites the lower triangle of {@code matrix} (system order) in the fill-reducing order, made
     * anew only when the non-zero pattern or the variables changed since the last one.
     */
    private void permute(int k) {
        long[] pattern = FillOrder.pattern(matrix, k);
        if (order == null || order.length != k || !Arrays.equals(pattern, orderPattern)
                || !Arrays.equals(index, 0, k, orderIndex, 0, k)) {
            order = FillOrder.minimumDegree(pattern, k);
            orderPattern = pattern;
            orderIndex = Arrays.copyOf(index, k);
        }
        // both triangles in a work array, then the permuted matrix's row p, column q (q ≤ p) is
        // the system's (order[p], order[q])
        double[] full = fullWork(k);
        for (int a = 0; a < k; a++) {
            final int row = a * k;
            for (int b = 0; b <= a; b++) {
                full[row + b] = matrix[row + b];
                full[b * k + a] = matrix[row + b];
            }
        }
        for (int p = 0; p < k; p++) {
            final int row = order[p] * k, out = p * k;
            for (int q = 0; q <= p; q++) matrix[out + q] = full[row + order[q]];
        }
    }

    /** k² work array of the ordered case (the symmetric matrix, then the inverse), made on first use. */
    private double[] full;

    private double[] fullWork(int k) {
        if (full == null || full.length < k * k) full = new double[n * n];
        return full;
    }

    /** Solves the factored system for v_F into {@link #solution}; returns v_Fᵀ H_FF⁻¹ v_F. */
    double solve(double[] v) {
        final int k = size;
        if (ordered) {
            for (int p = 0; p < k; p++) rhs[p] = v[index[order[p]]];
            cholesky.solve(rhs, permuted);
            for (int p = 0; p < k; p++) solution[order[p]] = permuted[p];
            double sum = 0;
            for (int p = 0; p < k; p++) sum += rhs[p] * permuted[p];
            return sum;
        }
        for (int a = 0; a < k; a++) {
            rhs[a] = v[index[a]];
        }
        cholesky.solve(rhs, solution);
        double sum = 0;
        for (int a = 0; a < k; a++) {
            sum += rhs[a] * solution[a];
        }
        return sum;
    }

    /** Writes the inverse of the factored matrix (k·k, stride k) into out. */
    void invert(double[] out) {
        if (!ordered) {
            cholesky.invert(out);
            return;
        }
        final int k = size;
        double[] inverse = fullWork(k);
        cholesky.invert(inverse);
        for (int p = 0; p < k; p++) {
            final int row = order[p] * k, in = p * k;
            for (int q = 0; q < k; q++) out[row + order[q]] = inverse[in + q];
        }
    }

    /**
     * Drops from the system the variables sitting on a bound whose step −solution points out of
     * the box (the face the step stays on). Returns whether any was dropped.
     */
    boolean dropOutward(Box box, double[] x) {
        int kept = 0;
        for (int a = 0; a < size; a++) {
            final int i = index[a];
            final double stepI = -solution[a];
            final boolean outward = (x[i] <= box.lower[i] && stepI < 0) || (x[i] >= box.upper[i] && stepI > 0);
            if (!outward) {
                index[kept++] = i;
            }
        }
        final boolean dropped = kept < size;
        size = kept;
        return dropped;
    }
}
