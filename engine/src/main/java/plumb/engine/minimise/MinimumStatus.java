package plumb.engine.minimise;

/**
 * How a minimisation ended. {@link #CONVERGED} and {@link #CONVERGED_AT_KINK} are minima
 * ({@link #isMinimum()}); every other status is not.
 */
public enum MinimumStatus {
    /**
     * The stopping test passed (Newton decrement of the free variables below the tolerance, or f
     * stopped changing at machine precision with a decrement below the fallback tolerance), no
     * bound is violated and the Hessian over the non-fixed variables is positive definite.
     */
    CONVERGED,
    /**
     * The minimum lies where −ln L is not differentiable: a sample's yield in some bin reaches
     * zero and is clipped there (docs/model-format.md). No step lowers f, and zero lies in the
     * convex hull of the one-sided gradients (a stationary point in Clarke's sense), checked by
     * the fitter; the covariance is that of the side the point was reached from.
     */
    CONVERGED_AT_KINK,
    /** The iteration limit was reached (after the restart). */
    MAX_ITERATIONS,
    /** The evaluation limit was reached. */
    MAX_EVALUATIONS,
    /** No step decreased f even with heavy damping, and the point is not a minimum. */
    LINE_SEARCH_FAILED,
    /**
     * The stopping test passed but the Hessian over the non-fixed variables is not positive
     * definite there (a saddle, a flat direction, or a bound minimum with negative curvature):
     * no covariance.
     */
    NOT_POSITIVE_DEFINITE_AT_MINIMUM,
    /** f, its gradient or Hessian was NaN or infinite at the starting point of every attempt. */
    NON_FINITE;

    /** Whether the result is a minimum: {@link #CONVERGED} or {@link #CONVERGED_AT_KINK}. */
    public boolean isMinimum() {
        return this == CONVERGED || this == CONVERGED_AT_KINK;
    }
}
