package plumb.cli.report;

import java.util.List;
import plumb.cli.plot.CorrelationMatrix;
import plumb.cli.plot.PullMarks;

/**
 * A maximum-likelihood fit as shown in the report. Numbers that could not be computed are NaN.
 *
 * @param converged   whether the minimiser converged
 * @param nll         −ln L at the minimum
 * @param parameters  every parameter, in model order
 * @param correlation correlation matrix of the fitted parameters, or null
 * @param seconds     wall time of the minimisation (NaN: unknown)
 * @param evaluations number of likelihood evaluations (negative: unknown)
 * @param poi         name of the parameter of interest (always kept in the correlation figure), or null
 */
public record FitSection(boolean converged, double nll, List<Parameter> parameters, CorrelationMatrix correlation,
                        double seconds, long evaluations, String poi) {

    /** A fit without a named parameter of interest. */
    public FitSection(boolean converged, double nll, List<Parameter> parameters, CorrelationMatrix correlation,
                      double seconds, long evaluations) {
        this(converged, nll, parameters, correlation, seconds, evaluations, null);
    }

    /**
     * One fitted parameter; see cli-contract.md, {@code plumb fit}.
     *
     * @param pull       (value − prefitValue)/prefitWidth; NaN for a free parameter
     * @param constraint error/prefitWidth; NaN for a free parameter
     */
    public record Parameter(String name, double value, double error, double prefitValue, double prefitWidth,
                            double pull, double constraint) {
        public Parameter {
            if (name == null) throw new IllegalArgumentException("fitted parameter without a name");
        }

        /** True for a parameter with a constraint term (it has a pull). */
        public boolean constrained() {
            return !Double.isNaN(pull);
        }
    }

    public FitSection {
        parameters = List.copyOf(parameters);
    }

    /** Pulls of the constrained parameters, in model order; null when there are none. */
    public PullMarks pulls() {
        List<PullMarks.Mark> entries = new java.util.ArrayList<>();
        for (Parameter p : parameters) if (p.constrained()) entries.add(new PullMarks.Mark(p.name(), p.pull(), p.constraint()));
        return entries.isEmpty() ? null : new PullMarks(null, entries);
    }
}
