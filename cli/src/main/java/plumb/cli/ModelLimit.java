package plumb.cli;

import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsymptoticLimitWork;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.WorkRunner;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * One model's limit, or why it has none.
 *
 * @param x      the model's value of the label the limits are ordered by (NaN: none)
 * @param result the limit, or null when it could not be computed
 * @param error  why there is no limit, or null
 */
record ModelLimit(ModelInput.Loaded model, double x, PoiData data, LimitResult result, String error) {

    /** The errors of the outcomes without a limit, each naming its model when there are several. */
    static List<String> errors(List<ModelLimit> outcomes) {
        List<String> errors = new ArrayList<>();
        for (ModelLimit o : outcomes) {
            if (o.error() != null) errors.add(outcomes.size() == 1 ? o.error() : o.model().file() + ": " + o.error());
        }
        return errors;
    }

    /**
     * The asymptotic limits of the models (the engine's {@link AsymptoticLimitWork}, one model per
     * thread or task), ordered by x: {@code plumb limit} without toys and the report.
     */
    static List<ModelLimit> asymptotic(List<ModelInput.Loaded> loaded, double[] xs, List<PoiData> data, double cl,
                                       WorkRunner runner) {
        List<CompiledModel> compiled = new ArrayList<>();
        List<AsymptoticLimitWork.Inputs> inputs = new ArrayList<>();
        for (int i = 0; i < loaded.size(); i++) {
            compiled.add(loaded.get(i).compiled());
            inputs.add(AsymptoticLimitWork.Inputs.of(data.get(i).sets()));
        }
        List<AsymptoticLimitWork.Limit> limits = AsymptoticLimitWork.compute(compiled, inputs, cl, runner);
        List<ModelLimit> outcomes = new ArrayList<>();
        for (int i = 0; i < loaded.size(); i++) {
            outcomes.add(new ModelLimit(loaded.get(i), xs[i], data.get(i), limits.get(i).result(), limits.get(i).error()));
        }
        outcomes.sort(Comparator.comparingDouble(ModelLimit::x));
        return outcomes;
    }
}
