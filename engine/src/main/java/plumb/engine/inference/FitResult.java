package plumb.engine.inference;

import plumb.engine.minimise.MinimumStatus;

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
 */
public record FitResult(MinimumStatus status, double nll, double[] values, double[] errors,
                        double[] covariance, boolean[] held, int evaluations, int iterations, double seconds)
        implements java.io.Serializable {

    public boolean converged() {
        return status.isMinimum();
    }

    /** Correlation of model parameters i and j, NaN when unavailable. */
    public double correlation(int i, int j, int nParams) {
        if (covariance == null) return Double.NaN;
        double den = Math.sqrt(covariance[i * nParams + i] * covariance[j * nParams + j]);
        return den > 0 ? covariance[i * nParams + j] / den : Double.NaN;
    }
}
