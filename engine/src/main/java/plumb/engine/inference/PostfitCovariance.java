package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.linalg.CholeskySolver;

import java.util.Arrays;

/**
 * The post-fit covariance over all parameters, MC-statistics γ included, held in block form so
 * that a model with tens of thousands of γ never needs its nAll² matrix.
 *
 * <p>The full Hessian at the best fit is [[A, B], [Bᵀ, D]] over (θ, γ): A the model parameters'
 * block, D diagonal (each γ sits in one bin) and column g of B, h_g, non-zero only on the
 * parameters of γ_g's channel. Its inverse by blocks (the Schur complement of D):
 * <pre>
 *   Σ_θθ = S = (A − B D⁻¹ Bᵀ)⁻¹
 *   Σ_θγ = −S h_g / d_g
 *   Σ_γγ = δ_gg' / d_g + h_gᵀ S h_g' / (d_g d_g')
 * </pre>
 * so the whole covariance is S (nParams²) plus d_g and the short vectors h_g. Parameters held in
 * the fit have zero rows and columns, as in the dense form. Both layouts of the likelihood give
 * the same blocks (the explicit one at the fitted γ, the profiled one at the solved γ).
 *
 * <p>Immutable after construction, serializable (refits on a cluster carry it).
 */
public final class PostfitCovariance implements java.io.Serializable {

    private static final long serialVersionUID = 1L;

    private final int nP;
    private final int nAll;
    private final boolean[] held;
    /** Σ_θθ (nParams², held rows zero). */
    private final double[] s;
    /** Hessian over θ with γ held (nParams²): conditional variances with γ held need it. */
    private final double[] a;
    private final double[] d;
    private final double[] mixed;
    private final int stride;
    /** Parameters (model indices) of each γ's channel, the index set of its row of {@link #mixed}. */
    private final int[][] gammaParams;

    private PostfitCovariance(int nP, int nAll, boolean[] held, double[] s, double[] a, double[] d, double[] mixed,
                              int stride, int[][] gammaParams) {
        this.nP = nP;
        this.nAll = nAll;
        this.held = held;
        this.s = s;
        this.a = a;
        this.d = d;
        this.mixed = mixed;
        this.stride = stride;
        this.gammaParams = gammaParams;
    }

    /**
     * The post-fit covariance at the best fit.
     *
     * @param nll  a likelihood on the data fitted, with the fit's held γ held (a {@link Fitter}'s)
     * @param best the best fit
     * @return the covariance, or null when the full Hessian is not positive definite over the
     *     parameters not held
     */
    public static PostfitCovariance of(BinnedNll nll, FitResult best) {
        CompiledModel m = nll.model();
        boolean[] held = best.held().clone();
        int nP = m.nParams(), nG = m.nGamma(), stride = nll.localStride();
        MemoryBudget.requireSquares(nP, 4, "the post-fit covariance of " + nP + " parameters");
        double[] x = Arrays.copyOf(best.values(), nll.dimension());
        double[] a = new double[nP * nP];
        double[] d = new double[nG];
        double[] mixed = new double[nG * stride];
        nll.gammaBlocks(x, a, d, mixed);
        int[][] gammaParams = new int[nG][];
        for (int c = 0; c < m.nChannels(); c++) {
            int[] params = m.channelParams(c); // one copy per channel, shared by its bins' γ
            for (int b = m.channelBinStart(c); b < m.channelBinStart(c + 1); b++) {
                if (m.binGamma(b) >= 0) gammaParams[m.binGamma(b)] = params;
            }
        }
        boolean[] freeGamma = new boolean[nG];
        for (int g = 0; g < nG; g++) {
            freeGamma[g] = !held[nP + g];
            // a free γ without curvature: the full Hessian is not positive definite
            if (freeGamma[g] && !(d[g] > 0)) return null;
        }
        double[] s = fitCovarianceIsS(m, best, nll.explicitGamma(), freeGamma) ? best.covariance()
                : profiledInverse(a, nP, held, d, mixed, stride, gammaParams, freeGamma);
        if (s == null) return null;
        return new PostfitCovariance(nP, m.nAll(), held, s, a, d, mixed, stride, gammaParams);
    }

    /**
     * Whether the fit's own covariance already is S, which saves an nParams³ inversion: with the
     * explicit layout it is the θ block of the full inverse; with the profiled one the fit's Hessian
     * is A minus the Schur terms of the γ inside their ranges, so S when every free γ is inside.
     */
    private static boolean fitCovarianceIsS(CompiledModel m, FitResult best, boolean explicit, boolean[] freeGamma) {
        double[] cov = best.covariance();
        if (cov == null || cov.length != m.nParams() * m.nParams()) return false;
        if (explicit) return true;
        for (int g = 0; g < freeGamma.length; g++) {
            int i = m.nParams() + g;
            double v = best.values()[i];
            if (freeGamma[g] && !(v > m.lower(i) && v < m.upper(i))) return false;
        }
        return true;
    }

    /**
     * (A − Σ_{free g} h_g h_gᵀ / d_g)⁻¹ over the θ not held, zero rows for the held ones; null when
     * not positive definite.
     */
    private static double[] profiledInverse(double[] a, int nP, boolean[] heldTheta, double[] d, double[] mixed,
                                            int stride, int[][] gammaParams, boolean[] freeGamma) {
        double[] h = schur(a, nP, d, mixed, stride, gammaParams, freeGamma);
        int[] free = new int[nP];
        int k = 0;
        for (int i = 0; i < nP; i++) if (!heldTheta[i]) free[k++] = i;
        double[] reduced = new double[k * k];
        for (int r = 0; r < k; r++) {
            int row = free[r] * nP;
            for (int c = 0; c <= r; c++) reduced[r * k + c] = h[row + free[c]];
        }
        CholeskySolver chol = CholeskySolver.create(k);
        if (!chol.decompose(reduced, k)) return null;
        double[] inv = new double[k * k];
        chol.invert(inv);
        Arrays.fill(h, 0);
        for (int r = 0; r < k; r++) {
            int row = free[r] * nP;
            for (int c = 0; c < k; c++) h[row + free[c]] = inv[r * k + c];
        }
        return h;
    }

    /** A − Σ_{g: include[g]} h_g h_gᵀ / d_g (a new nP² array; both triangles). */
    private static double[] schur(double[] a, int nP, double[] d, double[] mixed, int stride, int[][] gammaParams,
                                  boolean[] include) {
        double[] h = a.clone();
        for (int g = 0; g < include.length; g++) {
            if (!include[g] || gammaParams[g] == null) continue;
            int[] local = gammaParams[g];
            int off = g * stride;
            double inv = 1 / d[g];
            for (int i = 0; i < local.length; i++) {
                double vi = mixed[off + i] * inv;
                if (vi == 0) continue;
                int row = local[i] * nP;
                for (int j = 0; j < local.length; j++) h[row + local[j]] -= vi * mixed[off + j];
            }
        }
        return h;
    }

    /** Number of parameters, γ included. */
    public int size() {
        return nAll;
    }

    /** Σ_θθ over the model parameters (nParams², row-major, held rows zero); do not modify. */
    double[] thetaBlock() {
        return s;
    }

    /** Whether parameter i was held in the fit (no row in the covariance). */
    boolean held(int i) {
        return held[i];
    }

    /** d_g: the curvature of −ln L in γ_g at the best fit. */
    double gammaCurvature(int g) {
        return d[g];
    }

    /** Covariance of parameters i and j (indices below nAll). */
    public double covariance(int i, int j) {
        if (held[i] || held[j]) return 0;
        if (i < nP && j < nP) return s[i * nP + j];
        if (i >= nP && j < nP) return covariance(j, i);
        int g = j - nP;
        if (i < nP) return -rowTimesMixed(i, g) / d[g];
        // both γ: δ/d_g + h_iᵀ S h_g / (d_i d_g)
        int gi = i - nP;
        int[] local = gammaParams[gi];
        double q = 0;
        int off = gi * stride;
        for (int a = 0; a < local.length; a++) {
            double v = mixed[off + a];
            if (v != 0) q += v * rowTimesMixed(local[a], g);
        }
        return (gi == g ? 1 / d[g] : 0) + q / (d[gi] * d[g]);
    }

    /** (S h_g)_i over the parameters of γ_g's channel. */
    private double rowTimesMixed(int i, int g) {
        int[] local = gammaParams[g];
        if (local == null) return 0;
        int row = i * nP, off = g * stride;
        double sum = 0;
        for (int a = 0; a < local.length; a++) sum += s[row + local[a]] * mixed[off + a];
        return sum;
    }

    /** Variance of parameter i. */
    public double variance(int i) {
        return covariance(i, i);
    }

    /**
     * Variance of model parameter {@code target} when the parameters in {@code fixedSet} are held at
     * their best-fit values and the others re-profiled ({@link Covariances#conditionalVariance}).
     * A set of model parameters only is conditioned on within Σ_θθ; a set with γ in it by the
     * Hessian over the parameters left free, (H_FF⁻¹)_tt, the same number by the block inverse,
     * with the free γ profiled by a Schur complement.
     *
     * @return the variance, or NaN when the matrix needed is not positive definite
     */
    public double conditionalVariance(int target, int[] fixedSet) {
        if (target >= nP) throw new IllegalArgumentException("conditional variances are of model parameters");
        boolean anyGamma = false;
        for (int i : fixedSet) anyGamma |= i >= nP;
        if (!anyGamma) return Covariances.conditionalVariance(s, nP, target, fixedSet);
        boolean[] fixedHere = held.clone();
        for (int i : fixedSet) fixedHere[i] = true;
        if (fixedHere[target]) return 0;
        boolean[] freeGamma = new boolean[nAll - nP];
        for (int g = 0; g < freeGamma.length; g++) freeGamma[g] = !fixedHere[nP + g];
        double[] h = schur(a, nP, d, mixed, stride, gammaParams, freeGamma);
        int[] free = new int[nP];
        int k = 0, t = -1;
        for (int i = 0; i < nP; i++) {
            if (fixedHere[i]) continue;
            if (i == target) t = k;
            free[k++] = i;
        }
        double[] reduced = new double[k * k];
        for (int r = 0; r < k; r++) {
            int row = free[r] * nP;
            for (int c = 0; c <= r; c++) reduced[r * k + c] = h[row + free[c]];
        }
        CholeskySolver chol = CholeskySolver.create(k);
        if (!chol.decompose(reduced, k)) return Double.NaN;
        double[] e = new double[k];
        e[t] = 1;
        chol.solve(e, e);
        return e[t];
    }
}
