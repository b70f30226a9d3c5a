package plumb.engine.minimise;

import plumb.engine.linalg.CholeskySolver;

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

    ReducedSystem(int n) {
        this.n = n;
        this.index = new int[n];
        this.matrix = new double[n * n];
        this.rhs = new double[n];
        this.solution = new double[n];
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
        return cholesky.decompose(matrix, k);
    }

    /** Solves the factored system for v_F into {@link #solution}; returns v_Fᵀ H_FF⁻¹ v_F. */
    double solve(double[] v) {
        final int k = size;
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
        cholesky.invert(out);
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
