package plumb.engine.minimise;

/**
 * Projected Newton minimiser with an active set for bound constraints, using the objective's exact
 * Hessian (docs/engine.md section 4).
 *
 * <p>Each iteration: variables held fixed, or sitting on a bound with the gradient pointing out of
 * the box, stay put; the Newton system over the others is solved by Cholesky. The iteration stops
 * when the Newton decrement gᵀH⁻¹g of that free set is below {@link MinimiserOptions#tolerance()}.
 * Otherwise the step is taken on the face it can follow (free variables on a bound whose step
 * points outward are dropped and the system re-solved). Where the Hessian is not positive definite,
 * the objective's positive semidefinite curvature form ({@link Objective#valueGradientCurvature},
 * the Gauss–Newton form of a likelihood) takes its place at that point and at the following ones,
 * until its Newton decrement falls below {@link #SWITCH_TO_EXACT}; the exact Hessian is then asked
 * for again, and always decides convergence. Where the matrix used is still not positive definite,
 * Levenberg damping λ·diag(H) is added and λ raised tenfold until Cholesky succeeds. A backtracking
 * line search along the projected path x(α) = clip(x + α·d) accepts the first α meeting Armijo's
 * condition; if none does, λ is raised a hundredfold and the search repeated. λ falls tenfold after
 * each full step. The first trial of a search asks for f, gradient and Hessian together when the
 * previous full step was accepted (then that call serves the next iteration), f alone otherwise.
 *
 * <p>A failed attempt is followed by one restart from a deterministic perturbation of its best
 * point. Work arrays are sized at construction; one instance serves many fits by one thread.
 */
public final class BoundedNewton extends BoxMinimiser {

    /** Armijo's sufficient-decrease fraction (common practice: 1e-4, Nocedal and Wright). */
    private static final double ARMIJO = 1e-4;
    private static final int MAX_BACKTRACKS = 12;
    private static final double LAMBDA_START = 1e-3;
    private static final double LAMBDA_MAX = 1e12;

    /**
     * In the curvature form, the Newton decrement below which the next point gets the exact
     * Hessian again.
     */
    static final double SWITCH_TO_EXACT = 1;

    private final double[] step;
    private double alphaAccepted;
    /** The step that sees the hinges it crosses, for a {@link HingedObjective}; null for others. */
    private HingeStep hingeStep;
    /** Whether h holds the objective's curvature form (not its Hessian), and whether the next evaluations ask for it. */
    private boolean hIsCurvature;
    private boolean useCurvature;

    /** A minimiser for objectives of the given dimension with {@link MinimiserOptions#defaults()}. */
    public BoundedNewton(int dimension) {
        this(dimension, MinimiserOptions.defaults());
    }

    /**
     * @param dimension number of variables n ≥ 0; work arrays of size n² are allocated here
     * @param options settings
     */
    public BoundedNewton(int dimension, MinimiserOptions options) {
        super(dimension, options);
        this.step = new double[dimension];
    }

    @Override
    MinimumStatus attempt() {
        final int iterationLimit = iterations + options.maxIterations();
        if (outOfBudget()) {
            return MinimumStatus.MAX_EVALUATIONS;
        }
        f = evaluateAll(x, g, h);
        if (!finitePoint(f, g, h)) {
            decrement = Double.NaN;
            return MinimumStatus.NON_FINITE;
        }
        hIsCurvature = false;
        useCurvature = false;
        final HingedObjective hinged = objective instanceof HingedObjective o ? o : null;
        if (hinged != null && hingeStep == null) {
            hingeStep = new HingeStep(n);
        }
        boolean curvatureAllowed = true;
        // Once a step has met hinges, the next ones look for them before their first trial.
        boolean hingesSeen = false;
        double lambda = 0;
        boolean hessianFirst = true;
        iteration:
        while (true) {
            int k = system.selectFree(box, x, g);
            boolean newtonDefinite = k == 0 || system.factor(h, 0);
            if (!newtonDefinite && !hIsCurvature && curvatureAllowed) {
                // Indefinite Hessian: the objective's positive semidefinite curvature form at the
                // same point instead of damping (same f and g).
                if (outOfBudget()) {
                    return MinimumStatus.MAX_EVALUATIONS;
                }
                f = evaluateCurvature(x, g, h);
                hIsCurvature = true;
                k = system.selectFree(box, x, g);
                newtonDefinite = k == 0 || system.factor(h, 0);
            }
            decrement = k == 0 ? 0 : newtonDefinite ? system.solve(g) : Double.NaN;
            if (newtonDefinite && decrement < options.tolerance()) {
                if (!hIsCurvature) {
                    return finishFactored(true);
                }
                // Converged on the curvature form: the exact Hessian has the last word here.
                if (!exactAtX()) {
                    return MinimumStatus.MAX_EVALUATIONS;
                }
                curvatureAllowed = false;
                continue;
            }
            if (iterations >= iterationLimit) {
                return exactAtX() ? MinimumStatus.MAX_ITERATIONS : MinimumStatus.MAX_EVALUATIONS;
            }
            // Near the minimum the exact Hessian converges faster: ask for it at the next point.
            useCurvature = hIsCurvature && !(newtonDefinite && decrement < SWITCH_TO_EXACT);
            final double previous = f;
            double lam = newtonDefinite ? 0 : Math.max(lambda, LAMBDA_START);
            boolean reuseFactor = newtonDefinite;
            boolean accepted = false;
            boolean onHinges = false;
            while (lam <= LAMBDA_MAX) {
                if (!reuseFactor) {
                    system.selectFree(box, x, g);
                }
                lam = direction(lam, reuseFactor);
                reuseFactor = false;
                if (lam < 0) {
                    break;
                }
                // An undamped step whose full length is refused may have crossed into hinge valleys.
                final boolean hingesMayMatter = hinged != null && lam == 0;
                final boolean hingesFirst = hingesMayMatter && hingesSeen;
                int outcome = hingesFirst ? FIRST_REFUSED : lineSearch(hessianFirst, hingesMayMatter);
                if (outcome == FIRST_REFUSED) {
                    if (hingeStep.apply(hinged, system, x, g, step)) {
                        onHinges = true;
                        hingesSeen = true;
                        decrement = hingeStep.decrement;
                        if (decrement < options.tolerance()) {
                            // A minimum on the kinks of the hinges the step would cross.
                            if (!hIsCurvature) {
                                return finishOnHinges(k);
                            }
                            if (!exactAtX()) {
                                return MinimumStatus.MAX_EVALUATIONS;
                            }
                            curvatureAllowed = false;
                            continue iteration;
                        }
                        outcome = lineSearch(hessianFirst, false);
                    } else {
                        outcome = hingesFirst ? lineSearch(hessianFirst, false) : lineSearchOn();
                    }
                }
                if (outcome == BUDGET) {
                    return MinimumStatus.MAX_EVALUATIONS;
                }
                if (outcome == ACCEPTED) {
                    accepted = true;
                    break;
                }
                if (newtonDefinite && decrement <= options.fallbackTolerance() && !hIsCurvature) {
                    // f cannot be lowered at machine precision and the point is within the
                    // fallback tolerance of the minimum of its quadratic model.
                    return onHinges ? finishOnHinges(-1) : finish();
                }
                lam = lam == 0 ? LAMBDA_START : lam * 100;
            }
            if (!accepted) {
                return exactAtX() ? MinimumStatus.LINE_SEARCH_FAILED : MinimumStatus.MAX_EVALUATIONS;
            }
            iterations++;
            hIsCurvature = useCurvature;
            curvatureAllowed = true;
            final boolean fullStep = alphaAccepted == 1;
            // Among kinks a full step is often refused: a value first costs less than a Hessian.
            hessianFirst = fullStep && !hingesSeen;
            lambda = fullStep ? (lam < 1e-8 ? 0 : lam * 0.1) : lam;
            if (previous - f <= 4 * Math.ulp(Math.max(1.0, Math.abs(f)))
                    && newtonDefinite && decrement <= options.fallbackTolerance() && !hIsCurvature) {
                return onHinges ? finishOnHinges(-1) : finish();
            }
        }
    }

    /**
     * {@link #finish()} for a point stopped on hinge kinks, keeping the hinge model's decrement:
     * {@link MinimumStatus#CONVERGED_AT_KINK} when the Hessian checks pass. {@code free} is the size
     * of the free set selected at x when the system still holds its undamped factor, else −1.
     */
    private MinimumStatus finishOnHinges(int free) {
        final double hingeDecrement = decrement;
        final MinimumStatus status = free >= 0 && system.size == free ? finishFactored(true) : finish();
        decrement = hingeDecrement;
        return status == MinimumStatus.CONVERGED ? MinimumStatus.CONVERGED_AT_KINK : status;
    }

    /** Puts the exact Hessian at x into h if it holds the curvature form; false when out of evaluations. */
    private boolean exactAtX() {
        if (!hIsCurvature) {
            return true;
        }
        if (outOfBudget()) {
            return false;
        }
        f = evaluateAll(x, g, h);
        hIsCurvature = false;
        useCurvature = false;
        return true;
    }

    /** f, gradient and the matrix the next steps use: the curvature form or the exact Hessian. */
    private double evaluateMatrix(double[] at, double[] gradient, double[] matrix) {
        return useCurvature ? evaluateCurvature(at, gradient, matrix) : evaluateAll(at, gradient, matrix);
    }

    /**
     * Fills {@link #step} with the (damped) Newton step over the selected free set, raising λ until
     * the damped Hessian factors. Returns the λ used, or −1 if none up to {@link #LAMBDA_MAX} works.
     */
    private double direction(double lambda, boolean factored) {
        double lam = lambda;
        while (true) {
            if (!factored) {
                while (!system.factor(h, lam)) {
                    lam = lam == 0 ? LAMBDA_START : lam * 10;
                    if (lam > LAMBDA_MAX) {
                        return -1;
                    }
                }
                system.solve(g);
            }
            factored = false;
            if (!system.dropOutward(box, x)) {
                break;
            }
            if (system.size == 0) {
                scaledSteepestDescent();
                return lam;
            }
        }
        java.util.Arrays.fill(step, 0);
        for (int a = 0; a < system.size; a++) {
            step[system.index[a]] = -system.solution[a];
        }
        return lam;
    }

    /**
     * Fallback when every Newton component would leave the box through the face the variable sits
     * on: −g_i / |H_ii| on the free set, which moves each variable into the box.
     */
    private void scaledSteepestDescent() {
        java.util.Arrays.fill(step, 0);
        final int k = system.selectFree(box, x, g);
        for (int a = 0; a < k; a++) {
            final int i = system.index[a];
            final double d = Math.abs(h[i * n + i]);
            step[i] = -g[i] / (d > 0 ? d : 1);
        }
    }

    private static final int ACCEPTED = 1;
    private static final int FAILED = 0;
    private static final int BUDGET = -1;
    /** The full step was refused and the search paused there ({@link #lineSearchOn()} goes on). */
    private static final int FIRST_REFUSED = 2;

    /** Where a paused line search stands: the next trial and its α. */
    private int searchTrial;
    private double searchAlpha;

    /**
     * Backtracks along x(α) = clip(x + α·step) from α = 1 until f(x(α)) ≤ f + c·gᵀ(x(α) − x) and
     * f(x(α)) < f. Steps are shortened by safeguarded quadratic interpolation (factor in
     * [0.1, 0.5]), or by 4 after a non-finite value.
     */
    private int lineSearch(boolean hessianFirst, boolean pauseAfterFirst) {
        searchTrial = 0;
        searchAlpha = 1;
        return search(hessianFirst, pauseAfterFirst);
    }

    /** Goes on with a line search paused after its first trial. */
    private int lineSearchOn() {
        return search(false, false);
    }

    private int search(boolean hessianFirst, boolean pauseAfterFirst) {
        double slope0 = 0;
        for (int i = 0; i < n; i++) {
            slope0 += g[i] * step[i];
        }
        for (; searchTrial < MAX_BACKTRACKS; searchTrial++) {
            final int trial = searchTrial;
            final double alpha = searchAlpha;
            final double slope = trialPoint(step, alpha);
            if (Double.isNaN(slope)) {
                return FAILED;
            }
            if (outOfBudget()) {
                return BUDGET;
            }
            final boolean full = hessianFirst && trial == 0;
            double ft = full ? evaluateMatrix(xt, gt, ht) : evaluateValue(xt);
            boolean ok = ft < f && ft <= f + ARMIJO * slope && (!full || finitePoint(ft, gt, ht));
            if (ok && !full) {
                if (outOfBudget()) {
                    return BUDGET;
                }
                ft = evaluateMatrix(xt, gt, ht);
                ok = ft < f && finitePoint(ft, gt, ht);
            }
            if (ok) {
                acceptTrial(ft, true);
                alphaAccepted = alpha;
                return ACCEPTED;
            }
            searchAlpha = nextAlpha(alpha, ft, slope0);
            if (pauseAfterFirst && trial == 0) {
                searchTrial = 1;
                return FIRST_REFUSED;
            }
        }
        return FAILED;
    }

    private double nextAlpha(double alpha, double ft, double slope0) {
        if (!Double.isFinite(ft)) {
            return alpha * 0.25;
        }
        final double curvature = ft - f - slope0 * alpha;
        if (slope0 < 0 && curvature > 0) {
            final double minimum = -slope0 * alpha * alpha / (2 * curvature);
            return Math.min(0.5 * alpha, Math.max(0.1 * alpha, minimum));
        }
        return 0.5 * alpha;
    }
}
