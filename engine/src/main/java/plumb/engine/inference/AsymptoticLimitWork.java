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
            implements Serializable {
        /** The data sets of a POI test as resolved ({@link DataRequest#forPoiTest} with expected POI 0). */
        public static Inputs of(DataRequest.PoiTestData d) {
            Problem p = d.problem();
            return new Inputs(d.data(), d.expected(), p.settings(), p.heldIndices(), p.heldValues());
        }
    }

    /**
     * The asymptotic limits of several models at confidence level {@code cl}, one model per
     * thread or task of {@code runner}, in the models' order.
     */
    public static List<Limit> compute(List<CompiledModel> models, List<Inputs> inputs, double cl, WorkRunner runner) {
        return runner.runEach(models, new AsymptoticLimitWork(inputs, cl), null);
    }

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
