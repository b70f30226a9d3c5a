package plumb.engine.inference;

import plumb.engine.likelihood.BinnedNll;
import plumb.engine.linalg.CholeskySolver;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.MinimumStatus;

/**
 * Where a refit with one more parameter held starts when it follows a fit of the same data (a
 * toy's conditional fit after its best fit): near the conditional minimum, found from the Hessian
 * H the best fit's minimiser left with its result. With k the newly held parameter and F the free
 * ones, the start is first the minimum of the best fit's quadratic model with θ_k at its value,
 * x_F = x̂_F − H_FF⁻¹ (g_F + H_Fk (v − x̂_k)), then chord steps x_F ← x_F − H_FF⁻¹ ∇_F f(x), Newton's
 * method with H frozen (docs/engine.md section 5): one value and gradient and one solve each,
 * where a Newton iteration pays a Hessian and a factorisation. The Newton fit that follows
 * usually meets its stopping test at the start; it decides convergence as from any start.
 *
 * <p>The start stays the plain one (x̂ with θ_k moved) when the best fit ended on a kink or on a
 * bound, when H_FF is not positive definite, or when the model's point is not lower than the
 * plain start. The steps stop at a chord decrement of {@link #GOAL}, after {@link #MAX_STEPS},
 * when a step does not lower −ln L enough (Armijo), keeps more than half the decrement, or presses
 * a free parameter on a bound. Work arrays are sized once; one instance per fitter (one thread).
 */
final class ConditionalStart {

    /** Chord steps at most. */
    static final int MAX_STEPS = 12;
    /**
     * Chord decrement at which the start is handed over: a hundredth of the fit's tolerance (1e-8),
     * so that the fit's stopping test passes at the start (the exact decrement there agrees with
     * the chord one to a few per cent) and −ln L lies within 5e-11 of the minimum.
     */
    static final double GOAL = 1e-10;
    /** A step that keeps more than this share of the decrement ends the steps. */
    private static final double SLOW = 0.5;

    private final BinnedNll nll;
    private final double[] lower;
    private final double[] upper;
    private final int n;
    private final int[] free;
    private final double[] reduced;
    private final CholeskySolver cholesky;
    private final double[] u;
    private final double[] g;
    private final double[] gt;
    private final double[] xt;

    ConditionalStart(BinnedNll nll, double[] lower, double[] upper) {
        this.nll = nll;
        this.lower = lower;
        this.upper = upper;
        this.n = nll.dimension();
        this.free = new int[n];
        this.reduced = new double[n * n];
        this.cholesky = CholeskySolver.create(n);
        this.u = new double[n];
        this.g = new double[n];
        this.gt = new double[n];
        this.xt = new double[n];
    }

    /**
     * Moves {@code x}, the plain start (the minimum {@code best} with x[k] = {@code value} and the
     * fit's held values), toward the minimum with θ_k held; leaves it as it is where the steps do
     * not apply. {@code best} must be the minimum of the likelihood's current data.
     */
    void improve(MinimumResult best, int k, double value, double[] x) {
        if (best.status() != MinimumStatus.CONVERGED) return;
        final double[] xh = best.x(), h = best.hessian(), gh = best.gradient();
        final boolean[] held = best.fixed();
        int m = 0;
        for (int i = 0; i < n; i++) {
            if (held[i] || i == k) continue;
            if (xh[i] <= lower[i] || xh[i] >= upper[i]) return; // a bound: the free set would change
            free[m++] = i;
        }
        if (m == 0) return;
        for (int a = 0; a < m; a++) {
            final int row = free[a] * n;
            for (int b = 0; b < m; b++) reduced[a * m + b] = h[row + free[b]];
        }
        if (!cholesky.decompose(reduced, m)) return;
        final double delta = value - xh[k];
        for (int a = 0; a < m; a++) u[a] = gh[free[a]] + h[free[a] * n + k] * delta;
        cholesky.solve(u, u);
        System.arraycopy(x, 0, xt, 0, n);
        for (int a = 0; a < m; a++) xt[free[a]] = clip(free[a], xh[free[a]] - u[a]);
        final double plain = nll.value(x);
        double f = nll.valueAndGradient(xt, g);
        if (!(f <= plain)) return;
        System.arraycopy(xt, 0, x, 0, n);
        double previous = Double.POSITIVE_INFINITY;
        for (int step = 0; step < MAX_STEPS; step++) {
            double decrement = 0;
            for (int a = 0; a < m; a++) {
                final int i = free[a];
                if ((x[i] <= lower[i] && g[i] > 0) || (x[i] >= upper[i] && g[i] < 0)) return;
                u[a] = g[i];
            }
            cholesky.solve(u, u);
            for (int a = 0; a < m; a++) decrement += g[free[a]] * u[a];
            if (!(decrement > GOAL) || decrement > SLOW * previous) return;
            System.arraycopy(x, 0, xt, 0, n);
            for (int a = 0; a < m; a++) xt[free[a]] = clip(free[a], x[free[a]] - u[a]);
            final double ft = nll.valueAndGradient(xt, gt);
            // Armijo's test with the decrease the quadratic model promises (decrement / 2)
            if (!(ft <= f - 1e-4 * 0.5 * decrement)) return;
            System.arraycopy(xt, 0, x, 0, n);
            System.arraycopy(gt, 0, g, 0, n);
            f = ft;
            previous = decrement;
        }
    }

    private double clip(int i, double v) {
        return Math.max(lower[i], Math.min(upper[i], v));
    }
}
