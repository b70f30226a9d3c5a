package plumb.cli;

import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsymptoticUpperLimit;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.WorkRunner;
import plumb.engine.likelihood.DataSet;

import java.io.Serializable;
import java.util.List;

/**
 * The asymptotic limits of several models, one model per thread or cluster task
 * ({@link WorkRunner#runEach}): each model's data sets and settings as plain values.
 */
record AsymptoticWork(List<Inputs> inputs, double cl) implements WorkRunner.ModelWork<AsymptoticWork.Limit> {

    /** What one model's limit needs besides the model. */
    record Inputs(DataSet data, DataSet expected, FitSettings settings, int[] held, double[] heldValues)
            implements Serializable { }

    /** A model's limit, or why it has none. */
    record Limit(LimitResult result, String error) implements Serializable { }

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
