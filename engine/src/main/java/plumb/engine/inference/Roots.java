package plumb.engine.inference;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.exception.TooManyEvaluationsException;

import java.util.Locale;

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
