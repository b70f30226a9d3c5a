package plumb.engine.minimise;

import java.util.Objects;
import plumb.engine.linalg.CholeskySolver;

/**
 * Outcome of a minimisation. The arrays are the result's own copies; treat them as read-only.
 *
 * @param status how the minimisation ended; only {@link MinimumStatus#CONVERGED} is a minimum
 * @param x the final point (the best point found when not converged), length n
 * @param value f(x)
 * @param gradient ∇f(x), length n (NaN-filled if never evaluated finitely)
 * @param hessian ∇²f(x), n·n row-major, both triangles (NaN-filled if never evaluated finitely)
 * @param fixed the variables held during the fit: those flagged fixed and those with equal bounds
 * @param decrement Newton decrement gᵀH⁻¹g over the free variables at x (variables at a bound
 *     with the gradient pointing outward excluded); NaN when that Hessian is not positive definite
 * @param iterations accepted steps over all attempts
 * @param evaluations calls to the objective, of any of its three methods
 */
public record MinimumResult(MinimumStatus status, double[] x, double value, double[] gradient,
        double[] hessian, boolean[] fixed, double decrement, int iterations, int evaluations) {

    /** Checks presence and consistent lengths. */
    public MinimumResult {
        Objects.requireNonNull(status, "status");
        final int n = x.length;
        if (gradient.length != n || hessian.length != n * n || fixed.length != n) {
            throw new IllegalArgumentException("x has length " + n + " but gradient " + gradient.length
                    + ", hessian " + hessian.length + " and fixed " + fixed.length);
        }
    }

    /** Whether the result is a minimum ({@link MinimumStatus#isMinimum()}). */
    public boolean converged() {
        return status.isMinimum();
    }

    /** Number of variables n. */
    public int dimension() {
        return x.length;
    }

    /**
     * Covariance estimate: the inverse of the Hessian restricted to the non-fixed variables
     * (variables sitting at a bound included), scattered into an n·n row-major matrix whose rows
     * and columns of fixed variables are zero. Computed on each call.
     *
     * @return the covariance, or {@code null} if that restricted Hessian is not positive definite
     *     (or not finite)
     */
    public double[] covariance() {
        final int n = x.length;
        final int[] index = new int[n];
        int k = 0;
        for (int i = 0; i < n; i++) {
            if (!fixed[i]) {
                index[k++] = i;
            }
        }
        final double[] reduced = new double[k * k];
        for (int a = 0; a < k; a++) {
            final int row = index[a] * n;
            for (int b = 0; b < k; b++) {
                reduced[a * k + b] = hessian[row + index[b]];
            }
        }
        final CholeskySolver cholesky = CholeskySolver.create(k);
        if (!cholesky.decompose(reduced, k)) {
            return null;
        }
        final double[] inverse = new double[k * k];
        cholesky.invert(inverse);
        return scattered(inverse, index, k, n);
    }

    /** The k·k inverse over the variables {@code index[0..k)} as an n·n matrix, zero elsewhere. */
    static double[] scattered(double[] inverse, int[] index, int k, int n) {
        final double[] covariance = new double[n * n];
        for (int a = 0; a < k; a++) {
            final int row = index[a] * n;
            for (int b = 0; b < k; b++) {
                covariance[row + index[b]] = inverse[a * k + b];
            }
        }
        return covariance;
    }

    /**
     * Square roots of the diagonal of {@link #covariance()} (0 for fixed variables), or
     * {@code null} when there is no covariance.
     */
    public double[] errors() {
        final double[] covariance = covariance();
        if (covariance == null) {
            return null;
        }
        final int n = x.length;
        final double[] errors = new double[n];
        for (int i = 0; i < n; i++) {
            errors[i] = Math.sqrt(covariance[i * n + i]);
        }
        return errors;
    }
}
