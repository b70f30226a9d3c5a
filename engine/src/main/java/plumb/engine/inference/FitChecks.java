package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

import java.util.ArrayList;
import java.util.List;

/**
 * Signs that a converged fit is still suspicious, found where the fit result is built and cheap
 * next to the fit itself (a few dozen n² products on a Hessian already at hand).
 *
 * <p>A near-singular Hessian: the smallest eigenvalue of the parameters' correlation matrix is
 * the reciprocal of the largest eigenvalue of the Hessian scaled by the errors, S·H·S, which a
 * power iteration finds quickly exactly when it stands out. Below {@link #SINGULAR_EIGENVALUE} the
 * data do not constrain one combination of the parameters (two free factors multiplying one
 * sample, say); the parameters that make up that direction are named. A parameter at a bound of
 * its range is flagged: there the minimum is not a stationary point and the curvature is no error.
 *
 * @param smallestEigenvalue smallest eigenvalue of the correlation matrix of the fitted parameters
 *     (1 for uncorrelated ones, 0 for a singular matrix); NaN when not computed (no errors)
 * @param degenerate model parameters of the degenerate direction, largest share first; empty when
 *     the Hessian is not near-singular
 * @param bound per parameter (nAll): −1 at its lower bound, +1 at its upper bound, 0 inside
 */
public record FitChecks(double smallestEigenvalue, int[] degenerate, byte[] bound) implements java.io.Serializable {

    /**
     * Below this smallest correlation eigenvalue the Hessian counts as near-singular (two parameters:
     * |ρ| &gt; 1 − 1e-4). Not smaller: along an exactly flat direction the fit stops where the Newton
     * decrement meets its tolerance, and the gradient left there (of order √tolerance) gives the flat
     * direction a curvature of its own; two factors of one 33-event sample then show 1.4e-5.
     */
    public static final double SINGULAR_EIGENVALUE = 1e-4;
    /** A parameter whose share of the degenerate direction is at least this (of the largest) is named. */
    static final double SHARE = 0.1;
    /** Power-iteration steps: plenty when the largest eigenvalue stands out, which is the case flagged. */
    static final int ITERATIONS = 60;

    /** No check made. */
    public static FitChecks none(int nAll) {
        return new FitChecks(Double.NaN, new int[0], new byte[nAll]);
    }

    public boolean nearSingular() {
        return smallestEigenvalue < SINGULAR_EIGENVALUE;
    }

    public boolean anyAtBound() {
        for (byte b : bound) if (b != 0) return true;
        return false;
    }

    /**
     * @param hessian  ∇²(−ln L) at the minimum, dim² row-major
     * @param errors   the fit's errors (NaN when the Hessian is not positive definite)
     * @param held     held parameters (length ≥ dim)
     * @param values   every parameter's value (nAll)
     */
    static FitChecks of(CompiledModel m, int dim, double[] hessian, double[] errors, boolean[] held, double[] values) {
        byte[] bound = new byte[m.nAll()];
        for (int i = 0; i < m.nAll(); i++) {
            if (held[i]) continue;
            double lo = m.lower(i), hi = m.upper(i), x = values[i];
            if (Double.isFinite(lo) && x <= lo + tolerance(lo, hi)) bound[i] = -1;
            else if (Double.isFinite(hi) && x >= hi - tolerance(lo, hi)) bound[i] = 1;
        }
        // no Hessian given: it was not positive definite, singular in some direction not found here
        if (hessian == null) return new FitChecks(0, new int[0], bound);
        int[] free = new int[dim];
        int k = 0;
        for (int i = 0; i < dim; i++) {
            if (!held[i] && errors[i] > 0 && Double.isFinite(errors[i]) && bound[i] == 0) free[k++] = i;
        }
        if (k == 0) return new FitChecks(Double.NaN, new int[0], bound);
        // H over the free set with each column scaled by its error, stored contiguously so the
        // 60 products below run over plain rows (same products, same order, as H[i][j]·e_j·v_j)
        double[] scaled = new double[k * k];
        for (int a = 0; a < k; a++) {
            int row = free[a] * dim;
            for (int b = 0; b < k; b++) scaled[a * k + b] = hessian[row + free[b]] * errors[free[b]];
        }
        double[] v = new double[k], w = new double[k];
        java.util.Arrays.fill(v, 1 / Math.sqrt(k));
        for (int a = 0; a < k; a++) v[a] += 1e-3 * ((a * 7919) % 13 - 6) / Math.sqrt(k);   // no accidental orthogonality
        double lambda = 0;
        for (int it = 0; it < ITERATIONS; it++) {
            double norm = 0;
            for (int a = 0; a < k; a++) norm += v[a] * v[a];
            norm = Math.sqrt(norm);
            for (int a = 0; a < k; a++) v[a] /= norm;
            lambda = 0;
            for (int a = 0; a < k; a++) {
                int row = a * k;
                double s = 0;
                for (int b = 0; b < k; b++) s += scaled[row + b] * v[b];
                w[a] = errors[free[a]] * s;
                lambda += v[a] * w[a];
            }
            double[] t = v;
            v = w;
            w = t;
        }
        double smallest = lambda > 0 && Double.isFinite(lambda) ? 1 / lambda : Double.NaN;
        if (!(smallest < SINGULAR_EIGENVALUE)) return new FitChecks(smallest, new int[0], bound);
        // v (last product) is the degenerate direction in units of each parameter's error
        double max = 0;
        for (double x : v) max = Math.max(max, Math.abs(x));
        List<Integer> named = new ArrayList<>();
        for (int a = 0; a < k; a++) if (Math.abs(v[a]) >= SHARE * max && free[a] < m.nParams()) named.add(a);
        final double[] dir = v;
        named.sort((a, b) -> Double.compare(Math.abs(dir[b]), Math.abs(dir[a])));
        int[] degenerate = named.stream().mapToInt(a -> free[a]).toArray();
        return new FitChecks(smallest, degenerate, bound);
    }

    /** How close to a bound counts as on it: the minimiser stops on the bound itself, up to rounding. */
    private static double tolerance(double lo, double hi) {
        double scale = Double.isFinite(hi - lo) ? Math.max(hi - lo, 1e-300) : Math.max(1, Math.max(Math.abs(lo), Math.abs(hi)));
        return 1e-9 * (Double.isFinite(scale) ? scale : 1);
    }
}
