package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.io.Serializable;
import java.util.List;

/**
 * The asymptotic limits of several models, one model per thread or cluster task
 * ({@link WorkRunner#runEach}): each model's data sets and settings as plain values. A limit that
 * cannot be computed is an outcome with its error, so one model's failure leaves the others.
 */
public record AsymptoticLimitWork(List<Inputs> inputs, double cl) implements WorkRunner.ModelWork<AsymptoticLimitWork.Limit> {

    /** What one model's limit needs besides the model. */
    public record Inputs(DataSet data, DataSet expected, FitSettings settings, int[] held, double[] heldValues)
            implements Serializable { }

    /** A model's limit, or why it has none. */
    public record Limit(LimitResult result, String error) implements Serializable { }

    @Override
    public Limit run(CompiledModel m, int index) {
        Inputs in = inputs.get(index);
        try {
            return new Limit(AsymptoticUpperLimit.compute(m, in.data(), in.expected(), in.settings(), in.held(),
                    in.heldValues(), cl), null);
        } catch (InferenceException e) {
            return new Limit(null, e.getMessage());
        }
    }
}
