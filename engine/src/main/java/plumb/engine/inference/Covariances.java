package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.linalg.CholeskySolver;

/** Post-fit covariances beyond the one a fit reports. */
public final class Covariances {

    private Covariances() {
    }

    /**
     * The full post-fit covariance over all nAll parameters, MC-statistics γ included: the
     * inverse of {@link BinnedNll#fullHessian} at the best fit, restricted to the parameters not
     * held in it. Rows and columns of held parameters are 0.
     *
     * @param nll  a likelihood on the data fitted, with the fit's held γ held (a {@link Fitter}'s)
     * @param best the best fit
     * @return nAll² row-major, or null when that Hessian is not positive definite
     */
    public static double[] full(BinnedNll nll, FitResult best) {
        CompiledModel m = nll.model();
        int nAll = m.nAll();
        // the Hessian, its reduced copy, the inverse and the result, all nAll² at most
        MemoryBudget.requireSquares(nAll, 4, "the covariance of all " + nAll + " parameters (MC statistics included)");
        double[] x = java.util.Arrays.copyOf(best.values(), nll.dimension());
        double[] h = new double[nAll * nAll];
        nll.fullHessian(x, h);
        int[] free = new int[nAll];
        int k = 0;
        for (int i = 0; i < nAll; i++) if (!best.held()[i]) free[k++] = i;
        double[] reduced = new double[k * k];
        for (int a = 0; a < k; a++) {
            int row = free[a] * nAll;
            for (int b = 0; b < k; b++) reduced[a * k + b] = h[row + free[b]];
        }
        CholeskySolver chol = CholeskySolver.create(k);
        if (!chol.decompose(reduced, k)) return null;
        double[] inv = new double[k * k];
        chol.invert(inv);
        double[] cov = new double[nAll * nAll];
        for (int a = 0; a < k; a++) {
            int row = free[a] * nAll;
            for (int b = 0; b < k; b++) cov[row + free[b]] = inv[a * k + b];
        }
        return cov;
    }

    /**
     * Variance of parameter {@code target} when the parameters in {@code fixedSet} are held at
     * their best-fit values and the rest re-profiled, from a joint Gaussian covariance: the
     * conditional variance Σ_tt − Σ_tG Σ_GG⁻¹ Σ_Gt (exact for a quadratic −ln L, and equal to the
     * inverse-Hessian error of a refit with the set held, since holding parameters at their
     * best-fit values leaves the minimum where it is).
     *
     * @param cov  n² row-major covariance (held parameters have zero rows; leave them out of the set)
     * @return the variance, or NaN when Σ_GG is not positive definite
     */
    public static double conditionalVariance(double[] cov, int n, int target, int[] fixedSet) {
        int k = fixedSet.length;
        double total = cov[target * n + target];
        if (k == 0) return total;
        double[] sub = new double[k * k];
        double[] rhs = new double[k];
        for (int a = 0; a < k; a++) {
            int row = fixedSet[a] * n;
            for (int b = 0; b < k; b++) sub[a * k + b] = cov[row + fixedSet[b]];
            rhs[a] = cov[row + target];
        }
        CholeskySolver chol = CholeskySolver.create(k);
        if (!chol.decompose(sub, k)) return Double.NaN;
        double[] sol = new double[k];
        chol.solve(rhs, sol);
        double explained = 0;
        for (int a = 0; a < k; a++) explained += rhs[a] * sol[a];
        return total - explained;
    }
}
