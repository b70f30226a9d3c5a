package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;

/**
 * Cheap steps that bring the start of a refit near a best fit closer to the refit's minimum
 * (docs/engine.md section 5): x ← clip(x − Σ_c ∇f(x)) over the free parameters, where Σ_c is the
 * best fit's covariance conditional on the held parameter k, Σ_c = Σ − Σ_·k Σ_k·/Σ_kk, which is
 * the inverse of the best-fit Hessian over the free parameters. This is Newton's method with the
 * Hessian frozen at the best fit (the chord method): a step costs one value and gradient and a
 * matrix-vector product, where a Newton step costs a Hessian and a factorisation. Near the best
 * fit the Hessian changes little and the steps converge fast, so the Newton fit that follows
 * usually meets its stopping test at the start. They only move the start: that fit decides
 * convergence, from here as from any start, and every safeguard of the fit still applies.
 */
final class ChordSteps {

    /** Steps at most: near the best fit a few suffice, far from it the frozen Hessian is poor. */
    static final int MAX_STEPS = 12;
    /**
     * The chord decrement gᵀΣ_c g at which the start is handed over: far below the fit's stopping
     * tolerance (1e-8), so that the fit's own test passes and its result sits this close to the
     * minimum (parameters within √GOAL standard deviations).
     */
    static final double GOAL = 1e-14;
    /** A step that leaves more than this share of the decrement ends the steps: the chord is poor here. */
    private static final double SLOW = 0.5;

    private ChordSteps() {
    }

    /**
     * Whether the steps apply: a best fit with a covariance over the minimiser's variables (the
     * profiled layout, where that covariance is the inverse of the Hessian the minimiser uses) and
     * a held model parameter (k &lt; nParams) or none (k &lt; 0).
     */
    static boolean apply(CompiledModel m, BinnedNll nll, FitResult best, int k) {
        return best.covariance() != null && nll.dimension() == m.nParams() && k < m.nParams()
                && (k < 0 || best.covariance()[k * m.nParams() + k] > 0);
    }

    /**
     * Moves x (length nParams; held entries and x[k] already at their values) toward the minimum
     * with parameter k (−1 for none) and the best fit's held parameters held. Stops at
     * {@link #GOAL}, after {@link #MAX_STEPS}, when a step does not lower −ln L, when a step leaves
     * more than half the decrement, or when a free parameter is pressed against a bound (the
     * conditional covariance would be the wrong one). Returns the number of likelihood evaluations.
     */
    static int improve(CompiledModel m, BinnedNll nll, FitResult best, double[] x, int k) {
        final int n = m.nParams();
        final double[] cov = best.covariance();
        final boolean[] held = best.held();
        double[] g = new double[n], gt = new double[n], u = new double[n], xt = new double[n];
        double f = nll.valueAndGradient(x, g);
        int evaluations = 1;
        double previous = Double.POSITIVE_INFINITY;
        for (int step = 0; step < MAX_STEPS && Double.isFinite(f); step++) {
            for (int i = 0; i < n; i++) {
                if (held[i] || i == k) {
                    g[i] = 0;
                } else if ((x[i] <= m.lower(i) && g[i] > 0) || (x[i] >= m.upper(i) && g[i] < 0)) {
                    return evaluations;
                }
            }
            // u = Σ_c g over the free parameters: Σ g, less the part along the held parameter.
            for (int i = 0; i < n; i++) {
                double s = 0;
                final int row = i * n;
                for (int j = 0; j < n; j++) s += cov[row + j] * g[j];
                u[i] = s;
            }
            if (k >= 0) {
                final double c = u[k] / cov[k * n + k];
                for (int i = 0; i < n; i++) u[i] -= cov[i * n + k] * c;
            }
            double decrement = 0;
            for (int i = 0; i < n; i++) {
                if (held[i] || i == k) u[i] = 0;
                decrement += g[i] * u[i];
            }
            if (!(decrement > GOAL) || decrement > SLOW * previous) return evaluations;
            for (int i = 0; i < n; i++) xt[i] = Math.max(m.lower(i), Math.min(m.upper(i), x[i] - u[i]));
            final double ft = nll.valueAndGradient(xt, gt);
            evaluations++;
            // Armijo's test with the decrease the quadratic model promises (decrement / 2).
            if (!(ft <= f - 1e-4 * 0.5 * decrement)) return evaluations;
            System.arraycopy(xt, 0, x, 0, n);
            double[] t = g;
            g = gt;
            gt = t;
            f = ft;
            previous = decrement;
        }
        return evaluations;
    }
}
