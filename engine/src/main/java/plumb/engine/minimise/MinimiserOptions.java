package plumb.engine.minimise;

import java.util.Locale;

/**
 * Settings of the minimisers. Immutable; {@code withX(..)} returns a copy with one change.
 *
 * @param tolerance stop when the Newton decrement gᵀH⁻¹g over the free variables is below this
 *     (scale-free: twice the predicted decrease of f to the minimum of the local quadratic)
 * @param fallbackTolerance accept a point as converged when f no longer changes at machine
 *     precision and the decrement is below this (rounding can keep the decrement above a tight
 *     tolerance); must be at least {@code tolerance}
 * @param maxIterations accepted steps allowed per attempt
 * @param maxEvaluations calls to the objective allowed in total (all attempts, line searches and
 *     the final Hessian included)
 * @param restart restart once from a perturbed point when the first attempt fails
 */
public record MinimiserOptions(double tolerance, double fallbackTolerance, int maxIterations,
        int maxEvaluations, boolean restart) implements java.io.Serializable {

    /** Default decrement tolerance: docs/engine.md section 4. */
    public static final double DEFAULT_TOLERANCE = 1e-8;

    /** Validates: tolerances positive and finite and ordered, limits at least 1. */
    public MinimiserOptions {
        if (!(tolerance > 0 && tolerance < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException(
                    String.format(Locale.ROOT, "tolerance %s is not positive and finite", tolerance));
        }
        if (!(fallbackTolerance >= tolerance && fallbackTolerance < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "fallbackTolerance %s is not finite and >= tolerance %s", fallbackTolerance, tolerance));
        }
        if (maxIterations < 1) {
            throw new IllegalArgumentException("maxIterations " + maxIterations + " is not >= 1");
        }
        if (maxEvaluations < 1) {
            throw new IllegalArgumentException("maxEvaluations " + maxEvaluations + " is not >= 1");
        }
    }

    /** Tolerance 1e-8, fallback 1e-6, 200 iterations, 2000 evaluations, restart on. */
    public static MinimiserOptions defaults() {
        return new MinimiserOptions(DEFAULT_TOLERANCE, 1e-6, 200, 2000, true);
    }

    /** Copy with another decrement tolerance (the fallback tolerance is raised to it if lower). */
    public MinimiserOptions withTolerance(double value) {
        return new MinimiserOptions(value, Math.max(value, fallbackTolerance), maxIterations,
                maxEvaluations, restart);
    }

    /** Copy with another fallback tolerance. */
    public MinimiserOptions withFallbackTolerance(double value) {
        return new MinimiserOptions(tolerance, value, maxIterations, maxEvaluations, restart);
    }

    /** Copy with another iteration limit per attempt. */
    public MinimiserOptions withMaxIterations(int value) {
        return new MinimiserOptions(tolerance, fallbackTolerance, value, maxEvaluations, restart);
    }

    /** Copy with another total evaluation limit. */
    public MinimiserOptions withMaxEvaluations(int value) {
        return new MinimiserOptions(tolerance, fallbackTolerance, maxIterations, value, restart);
    }

    /** Copy with the restart after a failed attempt switched on or off. */
    public MinimiserOptions withRestart(boolean value) {
        return new MinimiserOptions(tolerance, fallbackTolerance, maxIterations, maxEvaluations, value);
    }
}
