package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.minimise.MinimumStatus;

import java.util.List;

/**
 * One maximum-likelihood fit. Arrays are the result's own; treat them as read-only.
 *
 * @param status how the minimisation ended
 * @param nll −ln L at the minimum, constants included
 * @param values every parameter (nAll: model parameters, then γ), at the minimum
 * @param errors symmetric errors from the inverse Hessian (0 for held parameters, NaN when the
 *     Hessian is not positive definite)
 * @param covariance covariance of the model parameters, nParams² row-major (rows and columns of
 *     held parameters are 0), or null when the Hessian is not positive definite
 * @param held parameters held during the fit (nAll)
 * @param evaluations likelihood evaluations made
 * @param seconds wall time of the minimisation and the errors
 * @param otherMinima the other minima the fit met (higher than this one), lowest first; empty when
 *     it met none or the model cannot have several ({@link OtherSideSearch})
 * @param atKink parameters (nAll) whose value ends on the kink of a linear or exponential
 *     interpolation at θ = 0: their error is the curvature of one side only
 * @param checks signs of a suspicious fit: a near-singular Hessian and its degenerate direction,
 *     parameters at a bound ({@link FitChecks}); unchecked ({@link FitChecks#none}) for fits
 *     without errors
 */
public record FitResult(MinimumStatus status, double nll, double[] values, double[] errors,
                        double[] covariance, boolean[] held, int evaluations, int iterations, double seconds,
                        List<OtherMinimum> otherMinima, boolean[] atKink, FitChecks checks)
        implements java.io.Serializable {

    /** A fit without the checks of {@link FitChecks}. */
    public FitResult(MinimumStatus status, double nll, double[] values, double[] errors, double[] covariance,
                     boolean[] held, int evaluations, int iterations, double seconds, List<OtherMinimum> otherMinima,
                     boolean[] atKink) {
        this(status, nll, values, errors, covariance, held, evaluations, iterations, seconds, otherMinima, atKink,
                FitChecks.none(values.length));
    }

    /** A fit that met no other minimum and has no parameter on a kink. */
    public FitResult(MinimumStatus status, double nll, double[] values, double[] errors, double[] covariance,
                     boolean[] held, int evaluations, int iterations, double seconds) {
        this(status, nll, values, errors, covariance, held, evaluations, iterations, seconds, List.of(),
                new boolean[values.length]);
    }

    /**
     * A minimum other than the reported one.
     *
     * @param nllAboveBest its −ln L minus the reported fit's (&gt; 0)
     * @param values every parameter (nAll) there
     */
    public record OtherMinimum(double nllAboveBest, double[] values) implements java.io.Serializable {

        /**
         * The {@code count} parameters whose values differ most from {@code best}'s, largest first:
         * the difference in pre-fit widths for constrained parameters, in the best fit's errors for
         * free ones (in units when there is no error).
         */
        public int[] mostDifferent(CompiledModel m, FitResult best, int count) {
            Integer[] order = new Integer[values.length];
            double[] size = new double[values.length];
            for (int i = 0; i < values.length; i++) {
                order[i] = i;
                double w = m.constrained(i) ? m.prefitWidth(i) : best.errors()[i];
                double scale = w > 0 && Double.isFinite(w) ? w : 1;
                size[i] = best.held()[i] ? 0 : Math.abs(values[i] - best.values()[i]) / scale;
            }
            java.util.Arrays.sort(order, (a, b) -> Double.compare(size[b], size[a]));
            int n = 0;
            while (n < Math.min(count, order.length) && size[order[n]] > 0) n++;
            int[] out = new int[n];
            for (int k = 0; k < n; k++) out[k] = order[k];
            return out;
        }
    }

    public boolean converged() {
        return status.isMinimum();
    }

    /** Whether the fit met another, higher minimum: the model has several. */
    public boolean severalMinima() {
        return !otherMinima.isEmpty();
    }

    /** Whether any parameter ends on a kink of its interpolation. */
    public boolean anyAtKink() {
        for (boolean b : atKink) if (b) return true;
        return false;
    }

    /** Correlation of model parameters i and j, NaN when unavailable. */
    public double correlation(int i, int j, int nParams) {
        if (covariance == null) return Double.NaN;
        double den = Math.sqrt(covariance[i * nParams + i] * covariance[j * nParams + j]);
        return den > 0 ? covariance[i * nParams + j] / den : Double.NaN;
    }
}
