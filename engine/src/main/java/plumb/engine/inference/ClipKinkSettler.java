package plumb.engine.inference;

import plumb.engine.likelihood.BinnedNll;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.MinimumStatus;

import java.util.Arrays;

/**
 * Settles a fit that stopped on a clip kink: moves the point along the kink to its lowest value
 * and certifies it as a minimum there. Where a sample's unclipped yield in a bin
 * reaches zero, max(0, ·) (docs/model-format.md) makes −ln L non-differentiable; a Newton
 * minimiser that ends there finds no step that lowers f and reports a failed line search,
 * although the point is the minimum. This class takes such a point, finds the entries on the
 * kink (at most {@link #MAX_KINKS}), evaluates the gradient of each smooth piece that meets there
 * (a step of about 1e-9 events across each kink), and accepts the point when zero lies in the
 * convex hull of those gradients over the variables that are free and off their bounds —
 * Clarke stationarity — measured in the scale-free metric Σ r_i²/H_ii against the minimiser's
 * fallback tolerance. When the point is on the kink but not yet stationary along it, Newton
 * steps within the kink's tangent space (which the pieces share) move it along the kink first.
 * A point that cannot be certified is returned unchanged: still not converged.
 */
final class ClipKinkSettler {

    /** Kinks handled at one point: 2^k pieces meet there. */
    static final int MAX_KINKS = 3;
    /** An entry is on the kink when its unclipped yield is within this·(1 + n) of zero. */
    static final double ON_KINK = 1e-7;
    /** How far beyond the kink the pieces are probed, in events per (1 + n). */
    static final double PROBE = 1e-9;

    private ClipKinkSettler() {
    }

    static MinimumResult settle(BinnedNll nll, MinimumResult r, double[] lower, double[] upper, double tolerance) {
        if (r.converged() || r.status() == MinimumStatus.NON_FINITE) return r;
        final int n = r.dimension();
        double[] x = r.x().clone();
        double[] g = r.gradient().clone();
        double[] h = r.hessian().clone();
        double f = r.value();
        int evaluations = r.evaluations();
        for (int step = 0; step <= MAX_TANGENT_STEPS; step++) {
            Stationarity st = stationarity(nll, x, h, r.fixed(), lower, upper);
            if (st == null) {
                // The tangent steps curved off the kink: hand the lower point back for more Newton steps.
                return step == 0 ? r : new MinimumResult(r.status(), x, f, g, h, r.fixed(), Double.NaN,
                        r.iterations() + step, evaluations);
            }
            evaluations += st.evaluations;
            if (st.residual <= tolerance) {
                return new MinimumResult(MinimumStatus.CONVERGED_AT_KINK, x, f, g, h, r.fixed(), st.residual,
                        r.iterations() + step, evaluations);
            }
            if (step == MAX_TANGENT_STEPS) break;
            // Not stationary along the kink: a Newton step within the kink's tangent space.
            double[] d = tangentStep(st.normals, g, h, st.free, n);
            if (d == null) break;
            double alpha = 1;
            double[] trial = new double[n];
            boolean lowered = false;
            for (int halving = 0; halving < 30 && !lowered; halving++, alpha /= 2) {
                for (int i = 0; i < n; i++) trial[i] = Math.min(upper[i], Math.max(lower[i], x[i] + alpha * d[i]));
                double ft = nll.value(trial);
                evaluations++;
                lowered = ft < f;
            }
            if (!lowered) break;
            x = trial.clone();
            f = nll.valueGradientHessian(x, g, h);
            evaluations++;
        }
        return r;
    }

    /** Tangent Newton steps tried before giving up on a point near a kink. */
    static final int MAX_TANGENT_STEPS = 20;

    /** The smallest combination of the pieces' gradients at a kink point, and what it was built from. */
    private record Stationarity(double residual, double[][] normals, boolean[] free, int evaluations) { }

    /**
     * Minimises gᵀd + ½dᵀHd over the free variables subject to n_eᵀd = 0 for every kink normal:
     * d = −H⁻¹g + H⁻¹N (NᵀH⁻¹N)⁻¹ NᵀH⁻¹g. Null when H is not positive definite there.
     */
    private static double[] tangentStep(double[][] normals, double[] g, double[] h, boolean[] free, int n) {
        int[] idx = new int[n];
        int k = 0;
        for (int i = 0; i < n; i++) if (free[i]) idx[k++] = i;
        if (k == 0) return null;
        double[] hr = new double[k * k];
        for (int a = 0; a < k; a++) for (int b = 0; b < k; b++) hr[a * k + b] = h[idx[a] * n + idx[b]];
        plumb.engine.linalg.CholeskySolver chol = plumb.engine.linalg.CholeskySolver.create(k);
        if (!chol.decompose(hr, k)) return null;
        double[] hg = new double[k];
        for (int a = 0; a < k; a++) hg[a] = g[idx[a]];
        chol.solve(hg, hg);
        int m = normals.length;
        double[][] hn = new double[m][k];
        for (int e = 0; e < m; e++) {
            for (int a = 0; a < k; a++) hn[e][a] = normals[e][idx[a]];
            chol.solve(hn[e], hn[e]);
        }
        double[] gram = new double[m * m];
        double[] rhs = new double[m];
        for (int e = 0; e < m; e++) {
            for (int f = 0; f < m; f++) {
                double s = 0;
                for (int a = 0; a < k; a++) s += normals[e][idx[a]] * hn[f][a];
                gram[e * m + f] = s;
            }
            double s = 0;
            for (int a = 0; a < k; a++) s += normals[e][idx[a]] * hg[a];
            rhs[e] = s;
        }
        double[] lambda = solve(gram, rhs, m);
        if (lambda == null) return null;
        double[] d = new double[n];
        for (int a = 0; a < k; a++) {
            double v = -hg[a];
            for (int e = 0; e < m; e++) v += hn[e][a] * lambda[e];
            d[idx[a]] = v;
        }
        return d;
    }

    /**
     * At a point near kinks: the pieces' gradients and the smallest weighted norm of their convex
     * combinations. Null when the point is on no kink, or on more than {@link #MAX_KINKS}, or
     * fewer than two pieces meet there.
     */
    private static Stationarity stationarity(BinnedNll nll, double[] x, double[] h, boolean[] held, double[] lower,
                                             double[] upper) {
        final int n = x.length;
        final int nP = nll.model().nParams();
        int[] entries = new int[4 * MAX_KINKS];
        int all = nll.entriesAtClip(x, ON_KINK, entries);
        if (all == 0 || all > entries.length) return null;
        // Entries of one sample moved by the same parameters often cross zero together, with
        // parallel normals: one kink. Keep a linearly independent set; a step across a kept one
        // crosses its parallel companions too, so every probe goes as far as the farthest needs.
        double[][] normals = new double[MAX_KINKS][];
        double[] raw = new double[MAX_KINKS];
        double[] tmp = new double[nP];
        double reach = 0;
        int k = 0;
        for (int j = 0; j < all; j++) {
            int s = nll.sampleOfEntry(entries[j]);
            int bin = entries[j] - nll.model().sampleEntryStart(s);
            double value = nll.unclippedBase(x, s, bin, tmp);
            double[] normal = Arrays.copyOf(tmp, n);
            if (!(dot(normal, normal) > 0)) continue; // touches zero without crossing: no kink
            reach = Math.max(reach, Math.max(Math.abs(value), PROBE * (1 + nll.model().nominalYield(entries[j])))
                    / Math.sqrt(dot(normal, normal)));
            if (independent(normal, normals, k)) {
                if (k == MAX_KINKS) return null;
                normals[k] = normal;
                raw[k] = value;
                k++;
            }
        }
        if (k == 0) return null;
        normals = Arrays.copyOf(normals, k);
        double[] scale = new double[k];
        for (int e = 0; e < k; e++) scale[e] = reach * Math.sqrt(dot(normals[e], normals[e]));
        // Gram matrix of the kink normals, to step across each kink by a chosen amount.
        double[] gram = new double[k * k];
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) gram[a * k + b] = dot(normals[a], normals[b]);
        }
        boolean[] free = new boolean[n];
        for (int i = 0; i < n; i++) free[i] = !held[i] && x[i] > lower[i] && x[i] < upper[i];
        int pieces = 1 << k;
        double[][] gradients = new double[pieces][];
        int found = 0;
        double[] probe = new double[n];
        double[] rhs = new double[k];
        for (int pattern = 0; pattern < pieces; pattern++) {
            for (int e = 0; e < k; e++) {
                double side = (pattern >> e & 1) == 1 ? 1 : -1;
                rhs[e] = 2 * side * scale[e] - raw[e];
            }
            double[] c = solve(gram, rhs, k);
            if (c == null) continue; // dependent kinks: this piece does not meet the point
            for (int i = 0; i < n; i++) {
                double v = 0;
                for (int e = 0; e < k; e++) v += c[e] * normals[e][i];
                probe[i] = Math.min(upper[i], Math.max(lower[i], x[i] + v));
            }
            double[] g = new double[n];
            if (!Double.isFinite(nll.valueAndGradient(probe, g))) return null;
            gradients[found++] = g;
        }
        if (found < 2) return null;
        double[] weight = new double[n];
        for (int i = 0; i < n; i++) weight[i] = free[i] && h[i * n + i] > 0 ? 1 / h[i * n + i] : 0;
        double residual = smallestCombination(Arrays.copyOf(gradients, found), weight);
        return new Stationarity(residual, normals, free, found);
    }

    /**
     * min over the simplex of Σ_i weight_i (Σ_j w_j g_j)_i², by Frank–Wolfe steps (a handful of
     * gradients: exact enough after a few hundred steps).
     */
    static double smallestCombination(double[][] g, double[] weight) {
        int m = g.length, n = weight.length;
        double[] w = new double[m];
        Arrays.fill(w, 1.0 / m);
        double[] r = new double[n];
        for (int iter = 0; iter < 500; iter++) {
            Arrays.fill(r, 0);
            for (int j = 0; j < m; j++) for (int i = 0; i < n; i++) r[i] += w[j] * g[j][i];
            int best = 0;
            double bestDot = Double.POSITIVE_INFINITY;
            for (int j = 0; j < m; j++) {
                double d = 0;
                for (int i = 0; i < n; i++) d += weight[i] * r[i] * g[j][i];
                if (d < bestDot) {
                    bestDot = d;
                    best = j;
                }
            }
            // exact line search between r and g[best] in the weighted norm
            double num = 0, den = 0;
            for (int i = 0; i < n; i++) {
                double diff = g[best][i] - r[i];
                num -= weight[i] * r[i] * diff;
                den += weight[i] * diff * diff;
            }
            double step = den > 0 ? Math.max(0, Math.min(1, num / den)) : 0;
            if (step == 0) break;
            for (int j = 0; j < m; j++) w[j] *= 1 - step;
            w[best] += step;
        }
        Arrays.fill(r, 0);
        for (int j = 0; j < m; j++) for (int i = 0; i < n; i++) r[i] += w[j] * g[j][i];
        double q = 0;
        for (int i = 0; i < n; i++) q += weight[i] * r[i] * r[i];
        return q;
    }

    /** Whether v is not (nearly) in the span of the first k vectors of {@code basis}. */
    private static boolean independent(double[] v, double[][] basis, int k) {
        double[] r = v.clone();
        for (int e = 0; e < k; e++) {
            double[] b = basis[e];
            double bb = dot(b, b);
            if (bb == 0) continue;
            double c = dot(r, b) / bb;
            for (int i = 0; i < r.length; i++) r[i] -= c * b[i];
        }
        return dot(r, r) > 1e-12 * dot(v, v);
    }

    private static double dot(double[] a, double[] b) {
        double s = 0;
        for (int i = 0; i < a.length; i++) s += a[i] * b[i];
        return s;
    }

    /** Solves the k×k system by Gaussian elimination with pivoting; null when singular. */
    private static double[] solve(double[] a0, double[] b0, int k) {
        double[] a = a0.clone(), b = b0.clone();
        for (int col = 0; col < k; col++) {
            int piv = col;
            for (int row = col + 1; row < k; row++) if (Math.abs(a[row * k + col]) > Math.abs(a[piv * k + col])) piv = row;
            double max = 0;
            for (int i = 0; i < k * k; i++) max = Math.max(max, Math.abs(a[i]));
            if (!(Math.abs(a[piv * k + col]) > 1e-12 * max)) return null;
            if (piv != col) {
                for (int j = 0; j < k; j++) {
                    double t = a[col * k + j];
                    a[col * k + j] = a[piv * k + j];
                    a[piv * k + j] = t;
                }
                double t = b[col];
                b[col] = b[piv];
                b[piv] = t;
            }
            for (int row = col + 1; row < k; row++) {
                double f = a[row * k + col] / a[col * k + col];
                for (int j = col; j < k; j++) a[row * k + j] -= f * a[col * k + j];
                b[row] -= f * b[col];
            }
        }
        double[] x = new double[k];
        for (int row = k - 1; row >= 0; row--) {
            double s = b[row];
            for (int j = row + 1; j < k; j++) s -= a[row * k + j] * x[j];
            x[row] = s / a[row * k + row];
        }
        return x;
    }
}
