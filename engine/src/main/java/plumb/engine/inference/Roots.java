package plumb.engine.inference;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.exception.TooManyEvaluationsException;

import java.util.Locale;
import java.util.function.DoubleUnaryOperator;

/** Root-finding in the POI for limits: automatic bracketing, then Brent's method. */
final class Roots {

    /**
     * Relative accuracy of every limit: ten times finer than the 1e-4 a limit is quoted to, so the
     * stopping rule of the solver never decides the quoted digits.
     */
    static final double RELATIVE_ACCURACY = 1e-5;
    /** Expansion steps before a bracket search gives up (the factor squares at each step). */
    private static final int MAX_EXPANSIONS = 60;
    private static final int MAX_EVALUATIONS = 100;

    private Roots() {
    }

    /** Secant steps before {@link #decreasingRoot(UnivariateFunction, double, DoubleUnaryOperator, double, double, String)} falls back to a bracket. */
    private static final int MAX_SECANT_STEPS = 8;

    /**
     * The root of {@code h} (decreasing through 0 in (lo, hi]) by secant steps, for a function
     * whose every value is a fit: from the guess, a second point from {@code next} (a model of h
     * that the caller knows, e.g. the Gaussian limit with σ measured at the first point), then
     * secant steps until one moves less than {@link #RELATIVE_ACCURACY} of μ (the secant
     * converges superlinearly, so the point it gives then is well inside that accuracy). A good
     * model needs three values of h where a bracket and Brent's method need five or six. Whenever
     * a step is not usable (h not decreasing between the points, a step leaving (lo, hi] or the
     * bracket the values have shown, no convergence) it falls back to
     * {@link #decreasingRoot(UnivariateFunction, double, double, double, String)} from the best
     * point so far.
     *
     * @param next the second point, from the first; NaN for none
     */
    static double decreasingRoot(UnivariateFunction h, double guess, DoubleUnaryOperator next, double lo, double hi,
                                 String what) {
        double floor = lo + 1e-9 * (hi - lo);
        double x0 = Math.min(hi, Math.max(guess, floor));
        double f0 = h.value(x0);
        if (f0 == 0) return x0;
        // the root lies above every point where h > 0 and below every point where h < 0
        double rootAbove = f0 > 0 ? x0 : Double.NaN, rootBelow = f0 < 0 ? x0 : Double.NaN;
        double x1 = next.applyAsDouble(x0);
        if (!(x1 > floor && x1 <= hi) || x1 == x0) return decreasingRoot(h, x0, lo, hi, what);
        double f1 = h.value(x1);
        for (int k = 0; k < MAX_SECANT_STEPS; k++) {
            if (f1 == 0) return x1;
            if (f1 > 0 && !(x1 <= rootAbove)) rootAbove = x1;
            if (f1 < 0 && !(x1 >= rootBelow)) rootBelow = x1;
            double slope = (f1 - f0) / (x1 - x0);
            double x2 = x1 - f1 / slope;
            boolean inside = x2 > floor && x2 <= hi && !(x2 <= rootAbove) && !(x2 >= rootBelow);
            if (!(slope < 0) || !inside) break;
            if (Math.abs(x2 - x1) <= RELATIVE_ACCURACY * Math.abs(x2)) return x2;
            x0 = x1;
            f0 = f1;
            x1 = x2;
            f1 = h.value(x1);
        }
        return decreasingRoot(h, Math.abs(f1) < Math.abs(f0) ? x1 : x0, lo, hi, what);
    }

    /**
     * The root of {@code h}, a function of μ that decreases through 0, in (lo, hi]. The bracket
     * is found from {@code guess} by geometric steps whose factor starts at 1.1 and squares each
     * time (a good guess costs two evaluations, a poor one a few more); commons-math's
     * {@link BrentSolver} then refines it (well kept, superlinear, and it never leaves the bracket).
     *
     * @param what names the quantity in the failure message, e.g. "the observed limit"
     * @throws InferenceException when h does not change sign in (lo, hi]
     */
    static double decreasingRoot(UnivariateFunction h, double guess, double lo, double hi, String what) {
        double x = Math.min(hi, Math.max(guess, lo + 1e-9 * (hi - lo)));
        double fx = h.value(x);
        if (fx == 0) return x;
        double a, b;
        double factor = 1.1;
        if (fx > 0) {              // root above x
            double prev = x;
            double y = x;
            double fy = fx;
            for (int k = 0; fy > 0; k++) {
                if (y >= hi || k == MAX_EXPANSIONS) {
                    throw new InferenceException(String.format(Locale.ROOT,
                            "%s could not be bracketed: CLs stays above 1 - CL up to the POI's upper bound %s",
                            what, hi));
                }
                prev = y;
                y = Math.min(hi, y * factor);
                factor *= factor;
                fy = h.value(y);
            }
            a = prev;
            b = y;
        } else {                   // root below x
            double prev = x;
            double y = x;
            double fy = fx;
            double floor = lo + 1e-9 * (hi - lo);
            for (int k = 0; fy < 0; k++) {
                if (y <= floor || k == MAX_EXPANSIONS) {
                    throw new InferenceException(String.format(Locale.ROOT,
                            "%s could not be bracketed: CLs is below 1 - CL already at %s", what, y));
                }
                prev = y;
                y = Math.max(floor, lo + (y - lo) / factor);
                factor *= factor;
                fy = h.value(y);
            }
            a = y;
            b = prev;
        }
        BrentSolver solver = new BrentSolver(RELATIVE_ACCURACY, 1e-12 * (hi - lo), 1e-12);
        try {
            return solver.solve(MAX_EVALUATIONS, h, a, b);
        } catch (TooManyEvaluationsException e) {
            throw new InferenceException(what + ": root-finding did not converge in " + MAX_EVALUATIONS + " steps");
        }
    }
}
