package plumb.engine.api;

import plumb.engine.inference.FitResult;

import java.util.List;
import java.util.NoSuchElementException;

/**
 * A maximum-likelihood fit, parameters by name.
 *
 * @param status     how the minimisation ended (a {@link plumb.engine.minimise.MinimumStatus} name)
 * @param converged  whether the fit found a minimum
 * @param nll        −ln L at the minimum, constants included
 * @param parameters every parameter of the model (MC-statistics γ last), in model order
 * @param fit        the engine's own result (indices, covariance), for callers that go further
 */
public record FitOutcome(String status, boolean converged, double nll, List<Estimate> parameters, FitResult fit) {

    public FitOutcome {
        parameters = List.copyOf(parameters);
    }

    /**
     * One parameter after the fit.
     *
     * @param pull       (value − pre-fit value)/pre-fit width; NaN for a free parameter
     * @param constraint error/pre-fit width; NaN for a free parameter
     * @param held       held during the fit (by the model or the problem): error 0
     */
    public record Estimate(String name, double value, double error, double pull, double constraint, boolean held) { }

    /** The named parameter's estimate. */
    public Estimate parameter(String name) {
        for (Estimate e : parameters) if (e.name().equals(name)) return e;
        throw new NoSuchElementException("the fit has no parameter '" + name + "'");
    }

    /** The named parameter's best-fit value. */
    public double value(String name) {
        return parameter(name).value();
    }

    /** The named parameter's symmetric error. */
    public double error(String name) {
        return parameter(name).error();
    }
}
