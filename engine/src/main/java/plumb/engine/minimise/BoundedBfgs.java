package plumb.engine.minimise;

import java.util.Arrays;

/**
 * Quasi-Newton (BFGS) minimiser with bounds handled by projection, for objectives whose Hessian is
 * too expensive to evaluate every iteration: iterations call only
 * {@link Objective#valueAndGradient}.
 *
 * <p>An approximation B of the inverse Hessian over the free variables (those not held and not
 * pressed against a bound by the gradient) gives the step d = −B·g; components that would leave
 * the box through the face a variable sits on are zeroed, and an Armijo backtracking search runs
 * along the projected path. B receives the BFGS update after each step with positive curvature
 * sᵀy, and restarts as the scaled identity (sᵀy / yᵀy) whenever the free set changes.
 *
 * <p>B is only an estimate, so convergence is confirmed with the exact Hessian: when the estimated
 * decrement gᵀBg falls below the tolerance, one {@link Objective#valueGradientHessian} call
 * computes the exact decrement gᵀH⁻¹g; if that is still too large, B is replaced by H⁻¹ over the
 * free set and the iterations go on. The result therefore carries the exact Hessian and its
 * covariance, at the cost of at least one Hessian evaluation per fit.
 */
public final class BoundedBfgs extends BoxMinimiser {

    /** Armijo's sufficient-decrease fraction (common practice: 1e-4, Nocedal and Wright). */
    private static final double ARMIJO = 1e-4;
    private static final int MAX_BACKTRACKS = 20;

    /** Inverse-Hessian estimate, full n×n storage; only the free-set block is meaningful. */
    private final double[] inverse;
    private final double[] step;
    private final double[] s;
    private final double[] y;
    private final double[] by;
    private final boolean[] free;
    private final double[] exactInverse;
    private double scale;
    private int updates;
    private boolean hessianCurrent;

    /** A minimiser for objectives of the given dimension with {@link MinimiserOptions#defaults()}. */
    public BoundedBfgs(int dimension) {
        this(dimension, MinimiserOptions.defaults());
    }

    /**
     * @param dimension number of variables n ≥ 0; work arrays of size n² are allocated here
     * @param options settings (the decrement tolerance applies to the exact decrement)
     */
    public BoundedBfgs(int dimension, MinimiserOptions options) {
        super(dimension, options);
        this.inverse = new double[dimension * dimension];
        this.step = new double[dimension];
        this.s = new double[dimension];
        this.y = new double[dimension];
        this.by = new double[dimension];
        this.free = new boolean[dimension];
        this.exactInverse = new double[dimension * dimension];
    }

    @Override
    MinimumStatus attempt() {
        final int iterationLimit = iterations + options.maxIterations();
        if (outOfBudget()) {
            return MinimumStatus.MAX_EVALUATIONS;
        }
        // The start is evaluated with its Hessian: a warm start near the minimum then stops, or
        // takes a Newton step, at once; a cold start gets a well-scaled first estimate.
        f = evaluateAll(x, g, h);
        hessianCurrent = true;
        if (!finitePoint(f, g, h)) {
            decrement = Double.NaN;
            return MinimumStatus.NON_FINITE;
        }
        double gMax = 0;
        for (int i = 0; i < n; i++) {
            gMax = Math.max(gMax, Math.abs(g[i]));
        }
        // Without a usable Hessian: first step of length at most 1 in the largest component.
        scale = 1 / Math.max(1, gMax);
        Arrays.fill(free, false);
        updates = 0;
        boolean first = true;
        while (true) {
            final int k = system.selectFree(box, x, g);
            if (freeSetChanged(k)) {
                resetInverse();
            }
            double estimate = direction();
            if (first || k == 0 || (updates > 0 && estimate < options.tolerance())) {
                first = false;
                final MinimumStatus status = confirm(options.tolerance());
                if (status != null) {
                    return status;
                }
                estimate = direction();
            }
            if (iterations >= iterationLimit) {
                return withHessian(MinimumStatus.MAX_ITERATIONS);
            }
            if (!feasibleDescent()) {
                resetInverse();
                direction();
                feasibleDescent();
            }
            final double previous = f;
            final int outcome = lineSearch();
            if (outcome == BUDGET) {
                return MinimumStatus.MAX_EVALUATIONS;
            }
            if (outcome == FAILED) {
                if (updates > 0) {
                    resetInverse(); // a stale estimate; retry as scaled steepest descent
                    continue;
                }
                final MinimumStatus status = confirm(options.fallbackTolerance());
                return status != null ? status : MinimumStatus.LINE_SEARCH_FAILED;
            }
            iterations++;
            update();
            if (previous - f <= 4 * Math.ulp(Math.max(1.0, Math.abs(f)))
                    && estimate <= options.fallbackTolerance()) {
                final MinimumStatus status = confirm(options.fallbackTolerance());
                if (status != null) {
                    return status;
                }
            }
        }
    }

    @Override
    boolean hessianAtX() {
        return hessianCurrent;
    }

    private boolean freeSetChanged(int k) {
        boolean changed = false;
        int a = 0;
        for (int i = 0; i < n; i++) {
            final boolean isFree = a < k && system.index[a] == i;
            if (isFree) {
                a++;
            }
            if (isFree != free[i]) {
                changed = true;
                free[i] = isFree;
            }
        }
        return changed;
    }

    private void resetInverse() {
        Arrays.fill(inverse, 0);
        for (int i = 0; i < n; i++) {
            inverse[i * n + i] = scale;
        }
        updates = 0;
    }

    /** step = −B_FF g_F over the selected free set; returns the estimated decrement gᵀBg. */
    private double direction() {
        Arrays.fill(step, 0);
        final int k = system.size;
        double estimate = 0;
        for (int a = 0; a < k; a++) {
            final int i = system.index[a];
            final int row = i * n;
            double sum = 0;
            for (int b = 0; b < k; b++) {
                final int j = system.index[b];
                sum += inverse[row + j] * g[j];
            }
            step[i] = -sum;
            estimate += g[i] * sum;
        }
        return estimate;
    }

    /** Zeroes step components leaving the box at a bound; false if what remains is not descent. */
    private boolean feasibleDescent() {
        double slope = 0;
        for (int i = 0; i < n; i++) {
            if ((x[i] <= box.lower[i] && step[i] < 0) || (x[i] >= box.upper[i] && step[i] > 0)) {
                step[i] = 0;
            }
            slope += g[i] * step[i];
        }
        return slope < 0;
    }

    /**
     * Evaluates the exact Hessian at x and stops if the exact decrement is below the given
     * tolerance (returning the final status); otherwise installs H_FF⁻¹ as the estimate when it is
     * positive definite and returns null to continue.
     */
    private MinimumStatus confirm(double tolerance) {
        if (!hessianCurrent) {
            if (outOfBudget()) {
                return MinimumStatus.MAX_EVALUATIONS;
            }
            final double value = evaluateAll(x, g, h);
            if (!finitePoint(value, g, h)) {
                return MinimumStatus.NON_FINITE;
            }
            f = value;
            hessianCurrent = true;
        }
        final int k = system.selectFree(box, x, g);
        freeSetChanged(k);
        if (k == 0) {
            return finish();
        }
        if (!system.factor(h, 0)) {
            decrement = Double.NaN;
            return null;
        }
        final double exact = system.solve(g);
        decrement = exact;
        if (exact < tolerance) {
            return finish();
        }
        system.invert(exactInverse);
        Arrays.fill(inverse, 0);
        for (int a = 0; a < k; a++) {
            final int row = system.index[a] * n;
            for (int b = 0; b < k; b++) {
                inverse[row + system.index[b]] = exactInverse[a * k + b];
            }
        }
        updates = 1;
        return null;
    }

    /** Status for a stop without convergence, with the Hessian at x in the result if affordable. */
    private MinimumStatus withHessian(MinimumStatus status) {
        decrement = Double.NaN;
        if (!hessianCurrent && !outOfBudget()) {
            evaluateAll(x, g, h);
            hessianCurrent = true;
        }
        if (hessianCurrent) {
            final int k = system.selectFree(box, x, g);
            decrement = k == 0 ? 0 : system.factor(h, 0) ? system.solve(g) : Double.NaN;
        }
        return status;
    }

    private static final int ACCEPTED = 1;
    private static final int FAILED = 0;
    private static final int BUDGET = -1;

    private int lineSearch() {
        double slope0 = 0;
        for (int i = 0; i < n; i++) {
            slope0 += g[i] * step[i];
        }
        double alpha = 1;
        for (int trial = 0; trial < MAX_BACKTRACKS; trial++) {
            final double slope = trialPoint(step, alpha);
            if (Double.isNaN(slope)) {
                return FAILED;
            }
            if (outOfBudget()) {
                return BUDGET;
            }
            final double ft = evaluateGradient(xt, gt);
            if (ft < f && ft <= f + ARMIJO * slope && finitePoint(ft, gt, null)) {
                for (int i = 0; i < n; i++) {
                    s[i] = xt[i] - x[i];
                    y[i] = gt[i] - g[i];
                }
                acceptTrial(ft, false);
                hessianCurrent = false;
                return ACCEPTED;
            }
            if (!Double.isFinite(ft)) {
                alpha *= 0.25;
            } else {
                final double curvature = ft - f - slope0 * alpha;
                alpha = slope0 < 0 && curvature > 0
                        ? Math.min(0.5 * alpha, Math.max(0.1 * alpha, -slope0 * alpha * alpha / (2 * curvature)))
                        : 0.5 * alpha;
            }
        }
        return FAILED;
    }

    /** BFGS update of the inverse estimate on the free set (Nocedal and Wright, eq. 6.17). */
    private void update() {
        final int k = system.size;
        double sy = 0;
        double yy = 0;
        double ss = 0;
        for (int a = 0; a < k; a++) {
            final int i = system.index[a];
            sy += s[i] * y[i];
            yy += y[i] * y[i];
            ss += s[i] * s[i];
        }
        // Skip steps without clear positive curvature: the update would lose positive definiteness.
        if (!(sy > 1e-12 * Math.sqrt(ss * yy))) {
            return;
        }
        scale = sy / yy;
        if (updates == 0) {
            resetInverse(); // scaled identity before the first update (Nocedal and Wright, eq. 6.20)
        }
        final double rho = 1 / sy;
        double yby = 0;
        for (int a = 0; a < k; a++) {
            final int row = system.index[a] * n;
            double sum = 0;
            for (int b = 0; b < k; b++) {
                final int j = system.index[b];
                sum += inverse[row + j] * y[j];
            }
            by[a] = sum;
            yby += y[system.index[a]] * sum;
        }
        final double c = rho * rho * yby + rho;
        for (int a = 0; a < k; a++) {
            final int i = system.index[a];
            final int row = i * n;
            final double si = s[i];
            final double byi = by[a];
            for (int b = 0; b < k; b++) {
                final int j = system.index[b];
                inverse[row + j] += c * si * s[j] - rho * (si * by[b] + byi * s[j]);
            }
        }
        updates++;
    }
}
