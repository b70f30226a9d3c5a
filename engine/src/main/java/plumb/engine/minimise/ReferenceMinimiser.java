package plumb.engine.minimise;

import org.apache.commons.math3.analysis.MultivariateFunction;
import org.apache.commons.math3.exception.TooManyEvaluationsException;
import org.apache.commons.math3.optim.InitialGuess;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.SimpleBounds;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.nonlinear.scalar.ObjectiveFunction;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.BOBYQAOptimizer;

/**
 * Independent, derivative-free cross-check of the minimisers (references.md item 11): Powell's
 * BOBYQA from commons-math 3.6.1, run on the same objective, bounds and fixed mask, over the free
 * variables only. It uses {@link Objective#value} alone; the exact Hessian is evaluated once at
 * its minimum so that errors and the status can be compared with the other minimisers. Slow
 * (hundreds to thousands of evaluations): meant for validation, not production fits.
 *
 * <p>BOBYQA needs at least two variables, so a single free variable is paired with a dummy z in
 * [−1, 1] contributing z² (minimum at z = 0, adding nothing there). Infinite bounds are replaced by
 * the start ± 1e6·max(1, |start|), far beyond any sensible likelihood region. The trust region
 * starts at min(1, ¼ of the narrowest free range) and stops at {@code relativeStoppingRadius} times
 * that, with 2m + 1 interpolation points for m variables (Powell's recommendation).
 */
public final class ReferenceMinimiser extends BoxMinimiser {

    /** Default stopping radius relative to the initial radius: reaches f to ~1e-12 on our tests. */
    public static final double DEFAULT_RELATIVE_STOPPING_RADIUS = 1e-10;
    /** Values standing in for NaN or infinite f, so that BOBYQA's model stays finite. */
    private static final double NON_FINITE_PENALTY = 1e100;
    private static final double UNBOUNDED_REACH = 1e6;

    private final double relativeStoppingRadius;
    private final int[] index;
    private final double[] point;
    private double bestValue;

    /**
     * A reference minimiser with a budget of 100 000 evaluations, restart on failure, and the
     * default stopping radius.
     */
    public ReferenceMinimiser(int dimension) {
        this(dimension, MinimiserOptions.defaults().withMaxEvaluations(100_000), DEFAULT_RELATIVE_STOPPING_RADIUS);
    }

    /**
     * @param dimension number of variables n ≥ 0
     * @param options only {@code maxEvaluations} and {@code restart} are used
     * @param relativeStoppingRadius final trust-region radius over the initial one, in (0, 1)
     */
    public ReferenceMinimiser(int dimension, MinimiserOptions options, double relativeStoppingRadius) {
        super(dimension, options);
        if (!(relativeStoppingRadius > 0 && relativeStoppingRadius < 1)) {
            throw new IllegalArgumentException(
                    "relativeStoppingRadius " + relativeStoppingRadius + " is not in (0, 1)");
        }
        this.relativeStoppingRadius = relativeStoppingRadius;
        this.index = new int[dimension];
        this.point = new double[dimension];
    }

    @Override
    MinimumStatus attempt() {
        int k = 0;
        for (int i = 0; i < n; i++) {
            if (!box.held[i]) {
                index[k++] = i;
            }
        }
        final int m = Math.max(k, 2);
        final double[] start = new double[m];
        final double[] lower = new double[m];
        final double[] upper = new double[m];
        double narrowest = Double.POSITIVE_INFINITY;
        for (int a = 0; a < k; a++) {
            final int i = index[a];
            start[a] = x[i];
            final double reach = UNBOUNDED_REACH * Math.max(1, Math.abs(x[i]));
            lower[a] = Double.isInfinite(box.lower[i]) ? x[i] - reach : box.lower[i];
            upper[a] = Double.isInfinite(box.upper[i]) ? x[i] + reach : box.upper[i];
            narrowest = Math.min(narrowest, upper[a] - lower[a]);
        }
        for (int a = k; a < m; a++) {
            lower[a] = -1; // the dummy variable z
            upper[a] = 1;
            narrowest = Math.min(narrowest, 2);
        }
        bestValue = Double.POSITIVE_INFINITY;
        System.arraycopy(x, 0, point, 0, n);
        final int free = k;
        final MultivariateFunction function = u -> {
            for (int a = 0; a < free; a++) {
                point[index[a]] = u[a];
            }
            final double value = evaluateValue(point);
            if (value < bestValue) {
                bestValue = value;
                System.arraycopy(point, 0, x, 0, n);
            }
            final double dummy = free == 1 ? u[1] : 0;
            return (Double.isFinite(value) ? value : NON_FINITE_PENALTY) + dummy * dummy;
        };
        MinimumStatus status = null;
        if (k > 0) {
            final double initialRadius = Math.min(1, 0.25 * narrowest);
            final int budget = options.maxEvaluations() - evaluations - 1;
            if (budget < 2 * m + 2) {
                java.util.Arrays.fill(h, Double.NaN);
                return MinimumStatus.MAX_EVALUATIONS;
            }
            try {
                new BOBYQAOptimizer(2 * m + 1, initialRadius, relativeStoppingRadius * initialRadius)
                        .optimize(new MaxEval(budget), new ObjectiveFunction(function), GoalType.MINIMIZE,
                                new InitialGuess(start), new SimpleBounds(lower, upper));
            } catch (TooManyEvaluationsException e) {
                status = MinimumStatus.MAX_EVALUATIONS;
            }
        }
        f = evaluateAll(x, g, h);
        if (!finitePoint(f, g, h)) {
            decrement = Double.NaN;
            return MinimumStatus.NON_FINITE;
        }
        if (status != null) {
            return status;
        }
        return finish();
    }
}
