package plumb.engine.minimise;

/**
 * What the bounded minimisers share: work arrays for the current and trial points, evaluation
 * counting, the restart after a failed attempt, and the final check of the Hessian. Subclasses
 * implement one attempt from {@link #x}.
 */
abstract class BoxMinimiser implements Minimiser {

    final int n;
    final MinimiserOptions options;
    final ReducedSystem system;
    /** Current point and its derivatives; swapped with the trial arrays on acceptance. */
    double[] x;
    double[] g;
    double[] h;
    double[] xt;
    double[] gt;
    double[] ht;
    double f;
    double decrement;
    Objective objective;
    Box box;
    int evaluations;
    int iterations;
    /** Whether the current attempt ended with the not-held Hessian at x factored in the system. */
    private boolean covarianceFactored;
    /** The last result returned and whether {@link #covarianceFactored} held for it. */
    private MinimumResult lastResult;
    private boolean lastFactored;

    BoxMinimiser(int dimension, MinimiserOptions options) {
        if (dimension < 0) {
            throw new IllegalArgumentException("dimension " + dimension + " is negative");
        }
        this.n = dimension;
        this.options = java.util.Objects.requireNonNull(options, "options");
        this.system = new ReducedSystem(n);
        this.x = new double[n];
        this.g = new double[n];
        this.h = new double[n * n];
        this.xt = new double[n];
        this.gt = new double[n];
        this.ht = new double[n * n];
    }

    /** The settings this minimiser was built with. */
    public final MinimiserOptions options() {
        return options;
    }

    /** Number of variables this minimiser was built for. */
    public final int dimension() {
        return n;
    }

    /** One attempt from {@link #x}; leaves the best point found in x, g, h, f. */
    abstract MinimumStatus attempt();

    @Override
    public final MinimumResult minimise(Objective objective, double[] start, double[] lower,
            double[] upper, boolean[] fixed) {
        this.box = Box.of(n, objective, start, lower, upper, fixed);
        this.objective = objective;
        evaluations = 0;
        iterations = 0;
        box.startPoint(start, x);
        f = Double.NaN;
        decrement = Double.NaN;
        java.util.Arrays.fill(g, Double.NaN);
        java.util.Arrays.fill(h, Double.NaN);
        lastResult = null;
        try {
            covarianceFactored = false;
            MinimumStatus status = attempt();
            if (status.isMinimum() || status == MinimumStatus.MAX_EVALUATIONS
                    || !options.restart()) {
                return returned(result(status));
            }
            final MinimumResult first = result(status);
            // Restart once from a deterministic nearby point: the best point so far (or the start)
            // moved a little, which gets out of a stalled line search or a saddle.
            box.perturb(first.x(), x);
            f = Double.NaN;
            covarianceFactored = false;
            status = attempt();
            final MinimumResult second = result(status);
            if (second.converged() || !(first.value() <= second.value())) {
                return returned(second);
            }
            covarianceFactored = false;
            return returned(new MinimumResult(first.status(), first.x(), first.value(), first.gradient(),
                    first.hessian(), first.fixed(), first.decrement(), iterations, evaluations));
        } finally {
            this.objective = null;
        }
    }

    private MinimumResult returned(MinimumResult r) {
        lastResult = r;
        lastFactored = covarianceFactored && r.status().isMinimum();
        return r;
    }

    /**
     * Writes the trial point xt = clip(x + α·step) into the box and returns the predicted change
     * gᵀ(xt − x), or NaN when clipping leaves no variable moved. Shared by the line searches.
     */
    final double trialPoint(double[] step, double alpha) {
        double slope = 0;
        double moved = 0;
        for (int i = 0; i < n; i++) {
            final double si = step[i];
            if (si == 0) {
                xt[i] = x[i];
            } else {
                final double v = box.clip(i, x[i] + alpha * si);
                xt[i] = v;
                final double dx = v - x[i];
                slope += g[i] * dx;
                moved = Math.max(moved, Math.abs(dx));
            }
        }
        return moved == 0 ? Double.NaN : slope;
    }

    boolean outOfBudget() {
        return evaluations >= options.maxEvaluations();
    }

    /**
     * Status of a point that passed the stopping test: recomputes the decrement reported and
     * checks that the Hessian over all non-held variables (those at bounds included) is positive
     * definite, as the covariance needs. Requires h to hold the Hessian at x.
     */
    MinimumStatus finish() {
        final int k = system.selectFree(box, x, g);
        final boolean definite = k == 0 || system.factor(h, 0);
        decrement = k == 0 ? 0 : definite ? system.solve(g) : Double.NaN;
        return finishFactored(definite);
    }

    /**
     * {@link #finish()} when the system already holds the free set selected at x, factored from h
     * without damping ({@code definite} whether that succeeded), and {@link #decrement} its
     * decrement: the caller's stopping test just did that work.
     */
    MinimumStatus finishFactored(boolean definite) {
        final int k = system.size;
        int notHeld = 0;
        for (int i = 0; i < n; i++) if (!box.held[i]) notHeld++;
        if (notHeld == k && definite) {
            // No variable sits on a bound: the set just factored is the covariance's set (saves
            // one n³/3 factorisation per fit, which adds up over thousands of refits).
            return notHeldFactored();
        }
        if (system.selectNotHeld(box) > 0 && !system.factor(h, 0)) {
            return MinimumStatus.NOT_POSITIVE_DEFINITE_AT_MINIMUM;
        }
        return notHeldFactored();
    }

    /** Records that the system holds the factor of the not-held Hessian at x; the fit converged. */
    private MinimumStatus notHeldFactored() {
        covarianceFactored = hessianAtX();
        return MinimumStatus.CONVERGED;
    }

    /**
     * The covariance of {@code r} (as {@link MinimumResult#covariance()}, the same numbers) from the
     * factor the convergence check left behind, saving a factorisation of the same matrix; null
     * when r is not the last result of this minimiser or that factor is gone.
     */
    @Override
    public double[] covariance(MinimumResult r) {
        if (lastResult == null || r.x() != lastResult.x() || !lastFactored) {
            return null;
        }
        final int k = system.size;
        final double[] inverse = new double[k * k];
        if (k > 0) {
            system.invert(inverse);
        }
        return MinimumResult.scattered(inverse, system.index, k, n);
    }

    /** Whether {@link #h} holds the Hessian at the current x (a quasi-Newton x may be ahead). */
    boolean hessianAtX() {
        return true;
    }

    MinimumResult result(MinimumStatus status) {
        final double[] hessian = h.clone();
        if (!hessianAtX()) {
            java.util.Arrays.fill(hessian, Double.NaN);
        }
        return new MinimumResult(status, x.clone(), f, g.clone(), hessian, box.held.clone(),
                decrement, iterations, evaluations);
    }

    double evaluateAll(double[] at, double[] gradient, double[] hessian) {
        evaluations++;
        return objective.valueGradientHessian(at, gradient, hessian);
    }

    /** f, gradient and the objective's positive semidefinite curvature form ({@link Objective#valueGradientCurvature}). */
    double evaluateCurvature(double[] at, double[] gradient, double[] curvature) {
        evaluations++;
        return objective.valueGradientCurvature(at, gradient, curvature);
    }

    double evaluateGradient(double[] at, double[] gradient) {
        evaluations++;
        return objective.valueAndGradient(at, gradient);
    }

    double evaluateValue(double[] at) {
        evaluations++;
        return objective.value(at);
    }

    void acceptTrial(double value, boolean withHessian) {
        double[] t = x;
        x = xt;
        xt = t;
        t = g;
        g = gt;
        gt = t;
        if (withHessian) {
            t = h;
            h = ht;
            ht = t;
        }
        f = value;
    }

    static boolean allFinite(double[] a, int length) {
        for (int i = 0; i < length; i++) {
            if (!Double.isFinite(a[i])) {
                return false;
            }
        }
        return true;
    }

    boolean finitePoint(double value, double[] gradient, double[] hessian) {
        return Double.isFinite(value) && allFinite(gradient, n) && (hessian == null || allFinite(hessian, n * n));
    }
}
