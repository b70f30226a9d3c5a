package plumb.engine.inference;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.linalg.CholeskySolver;

import java.util.Arrays;

/**
 * The Fisher information of an Asimov data set at its generating point, and the POI's variance
 * when constraints change: the fast path of {@link Sensitivity}. On an Asimov data set the
 * minimum of −ln L is the generating point and the Hessian there is the expected Fisher
 * information (Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554, section 3.2), so
 * σ_μ² = (H⁻¹)_μμ. A constraint term enters H only through its curvature c on the diagonal
 * (1/w² for a Gaussian); scaling its width by k changes that entry by Δ = c(1/k² − 1), which is a
 * rank-one change of H, and holding the parameter removes its row and column (references.md
 * item 17). With C = H⁻¹ both follow from C without a new inversion (Sherman–Morrison):
 * <pre>
 *   scaled:  σ'² = C_μμ − Δ C_μi² / (1 + Δ C_ii)
 *   held:    σ'² = C_μμ − C_μi² / C_ii                     (Δ → ∞)
 * </pre>
 * and for a group G the Woodbury form with D = diag(Δ_g): σ'² = C_μμ − C_μG D (1 + C_GG D)⁻¹ C_Gμ,
 * held: C_μμ − C_μG C_GG⁻¹ C_Gμ (the Schur complement). The MC-statistics parameters are solved
 * inside the likelihood; their changes go through the full Hessian: H_θθ − Σ_b h_b h_bᵀ/(H_bb + Δ_b).
 */
public final class AsimovFisher {

    private final CompiledModel m;
    private final int nP;
    /** Model parameters that are free in the fit (not fixed, not held). */
    private final boolean[] free;
    /** Constraint curvature of every parameter at the generating point (nAll; 0 for free ones). */
    private final double[] curvature;
    /** C = H⁻¹ over the model parameters (nP², zero rows for held ones), or null when H is not positive definite. */
    private final double[] cov;
    private final BinnedNll nll;
    private final double[] x;
    private double[] full;

    /**
     * @param data   an Asimov data set
     * @param values its generating values (nAll)
     * @param held   parameters held besides the model's fixed ones (indices &lt; nAll)
     */
    AsimovFisher(CompiledModel m, DataSet data, double[] values, int[] held) {
        this.m = m;
        this.nP = m.nParams();
        nll = new BinnedNll(m, data, false);
        free = new boolean[m.nAll()];
        for (int i = 0; i < m.nAll(); i++) free[i] = !m.fixed(i);
        for (int i : held) {
            free[i] = false;
            if (i >= nP) nll.holdGamma(i - nP, values[i]);
        }
        curvature = new double[m.nAll()];
        for (int i = 0; i < m.nAll(); i++) {
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) curvature[i] = 1 / (m.width(i) * m.width(i));
            else if (m.constraintType(i) == ConstraintType.POISSON) curvature[i] = data.aux()[i] / (values[i] * values[i]);
        }
        x = Arrays.copyOf(values, nP);
        double[] h = new double[nP * nP];
        nll.valueGradientHessian(x, new double[nP], h);
        cov = inverse(h);
    }

    /** Whether H is positive definite over the free parameters (else every variance is NaN). */
    boolean valid() {
        return cov != null && m.poi() >= 0 && free[m.poi()];
    }

    boolean free(int i) {
        return free[i];
    }

    /** σ_μ² as the model is. */
    double variance() {
        return valid() ? cov[m.poi() * nP + m.poi()] : Double.NaN;
    }

    /** Δ of parameter i's curvature when its width is scaled by k; +∞ for k = 0 (held). */
    private double delta(int i, double k) {
        return k == 0 ? Double.POSITIVE_INFINITY : curvature[i] * (1 / (k * k) - 1);
    }

    /** σ_μ² with model parameter i held (k = 0) or its pre-fit width scaled by k. */
    double variance(int i, double k) {
        if (!valid()) return Double.NaN;
        int p = m.poi();
        double cpp = cov[p * nP + p], cpi = cov[p * nP + i], cii = cov[i * nP + i];
        if (!free[i] || curvature[i] == 0) return cpp;
        if (k == 0) return cpp - cpi * cpi / cii;
        double d = delta(i, k);
        return cpp - d * cpi * cpi / (1 + d * cii);
    }

    /** σ_μ² with the model parameters of {@code group} held (k = 0) or their widths scaled by k. */
    double variance(int[] group, double k) {
        if (!valid()) return Double.NaN;
        int p = m.poi();
        int[] g = Arrays.stream(group).filter(i -> i < nP && free[i] && curvature[i] > 0).toArray();
        int n = g.length;
        double cpp = cov[p * nP + p];
        if (n == 0) return cpp;
        double[] cpg = new double[n];
        for (int a = 0; a < n; a++) cpg[a] = cov[p * nP + g[a]];
        if (k == 0) return cpp - quadraticHeld(g, cpg);
        // Woodbury: C_μG D (1 + C_GG D)⁻¹ C_Gμ; 1 + C_GG D may be indefinite when widths grow, so LU.
        double[][] a = new double[n][n];
        double[] d = new double[n];
        for (int r = 0; r < n; r++) d[r] = delta(g[r], k);
        for (int r = 0; r < n; r++) {
            for (int c = 0; c < n; c++) a[r][c] = (r == c ? 1 : 0) + cov[g[r] * nP + g[c]] * d[c];
        }
        RealMatrix lhs = new Array2DRowRealMatrix(a, false);
        double[] y = new LUDecomposition(lhs).getSolver().solve(new org.apache.commons.math3.linear.ArrayRealVector(cpg))
                .toArray();
        double s = 0;
        for (int r = 0; r < n; r++) s += cpg[r] * d[r] * y[r];
        return cpp - s;
    }

    /** C_μG C_GG⁻¹ C_Gμ: the variance explained by holding G (Schur complement). */
    private double quadraticHeld(int[] g, double[] cpg) {
        int n = g.length;
        double[] sub = new double[n * n];
        for (int a = 0; a < n; a++) for (int b = 0; b < n; b++) sub[a * n + b] = cov[g[a] * nP + g[b]];
        CholeskySolver chol = CholeskySolver.create(n);
        if (!chol.decompose(sub, n)) return Double.NaN;
        double[] sol = new double[n];
        chol.solve(cpg, sol);
        double s = 0;
        for (int a = 0; a < n; a++) s += cpg[a] * sol[a];
        return s;
    }

    /**
     * σ_μ² with the constraints of the model parameters {@code params} and, if {@code gammas}, of
     * every free MC-statistics parameter held (k = 0) or scaled by k, from a new Hessian and one
     * inversion (what the MC-statistics group needs; also the direct check of the updates above).
     */
    double varianceRebuilt(int[] params, boolean gammas, double k) {
        if (!valid()) return Double.NaN;
        int nAll = m.nAll();
        if (full == null) {
            full = new double[nAll * nAll];
            nll.fullHessian(x, full);
        }
        double[] h = new double[nP * nP];
        for (int i = 0; i < nP; i++) System.arraycopy(full, i * nAll, h, i * nP, nP);
        boolean[] held = new boolean[nAll];
        int[] nz = new int[nP];
        for (int b = nP; b < nAll; b++) {
            if (!free[b]) continue;
            double hbb = full[b * nAll + b];
            if (gammas) {
                if (k == 0) continue;                 // γ held: no Schur term
                hbb += delta(b, k);
            }
            // The γ of one bin couples only to the θ acting on that bin: walk its row's non-zeros.
            int row = b * nAll, n = 0;
            for (int i = 0; i < nP; i++) if (full[row + i] != 0) nz[n++] = i;
            for (int a = 0; a < n; a++) {
                double f = full[row + nz[a]] / hbb;
                for (int c = 0; c < n; c++) h[nz[a] * nP + nz[c]] -= f * full[row + nz[c]];
            }
        }
        for (int i : params) {
            if (i >= nP || !free[i] || curvature[i] == 0) continue;
            if (k == 0) held[i] = true;
            else h[i * nP + i] += delta(i, k);
        }
        return poiVariance(h, held);
    }

    /**
     * (H⁻¹)_μμ over the free parameters not in {@code alsoHeld}: one Cholesky factorisation and one
     * solve with the POI's unit vector, a third of the work of the full inverse.
     */
    private double poiVariance(double[] h, boolean[] alsoHeld) {
        int[] idx = new int[nP];
        int k = 0, p = -1;
        for (int i = 0; i < nP; i++) {
            if (!free[i] || alsoHeld[i]) continue;
            if (i == m.poi()) p = k;
            idx[k++] = i;
        }
        double[] sub = new double[k * k];
        for (int a = 0; a < k; a++) for (int b = 0; b < k; b++) sub[a * k + b] = h[idx[a] * nP + idx[b]];
        CholeskySolver chol = CholeskySolver.create(k);
        if (p < 0 || !chol.decompose(sub, k)) return Double.NaN;
        double[] e = new double[k];
        e[p] = 1;
        chol.solve(e, e);
        return e[p];
    }

    /**
     * The point a conditional fit with the POI held at {@code mu} would reach, to first order: the
     * generating point moved along the linear response Δθ = C_θμ/C_μμ·(μ − μ̂) (the first Newton
     * step from the minimum), clipped to the parameters' ranges; γ as at the generating point.
     */
    double[] conditionalPoint(double[] values, double mu) {
        double[] out = values.clone();
        if (!valid()) return out;
        int p = m.poi();
        double f = (mu - values[p]) / cov[p * nP + p];
        for (int i = 0; i < nP; i++) {
            if (!free[i]) continue;
            out[i] = Math.max(m.lower(i), Math.min(m.upper(i), values[i] + cov[i * nP + p] * f));
        }
        out[p] = mu;
        return out;
    }

    private double[] inverse(double[] h) {
        return inverse(h, new boolean[nP]);
    }

    /** (H restricted to the free parameters not in {@code alsoHeld})⁻¹, embedded in nP² with zero rows; null if not positive definite. */
    private double[] inverse(double[] h, boolean[] alsoHeld) {
        int[] idx = new int[nP];
        int k = 0;
        for (int i = 0; i < nP; i++) if (free[i] && !alsoHeld[i]) idx[k++] = i;
        double[] sub = new double[k * k];
        for (int a = 0; a < k; a++) for (int b = 0; b < k; b++) sub[a * k + b] = h[idx[a] * nP + idx[b]];
        CholeskySolver chol = CholeskySolver.create(k);
        if (!chol.decompose(sub, k)) return null;
        double[] inv = new double[k * k];
        chol.invert(inv);
        double[] out = new double[nP * nP];
        for (int a = 0; a < k; a++) for (int b = 0; b < k; b++) out[idx[a] * nP + idx[b]] = inv[a * k + b];
        return out;
    }
}
