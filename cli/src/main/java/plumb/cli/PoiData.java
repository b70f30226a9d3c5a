package plumb.cli;

import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.likelihood.DataSet;

import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;

/**
 * The data sets of the POI tests (limit, discovery) resolved from the shared options:
 * the data tested (null for a blinded model fitted to "observed" data: no observed result),
 * the Asimov data set the expected results come from, and the held parameters.
 *
 * @param data       the data of the observed result, or null
 * @param kind       "observed" or "asimov": the data set the result is computed on
 * @param expected   the Asimov data set at {@code expectedPoi} (post-fit nuisances unless --asimov-from prefit)
 * @param generation data the toys' nuisance parameters are fitted to, or null for the nominal values
 */
record PoiData(DataSet data, String kind, DataSet expected, double expectedPoi, DataSet generation, int[] held,
               double[] heldValues, FitSettings settings, Double asimovPoi) {

    /**
     * @param expectedPoi POI of the Asimov set of the expected result (0 for limits, 1 for discovery)
     * @param defaultAsimovPoi POI of --data asimov when --asimov-poi is not given
     */
    static PoiData resolve(Path file, CompiledModel m, FitOptions o, double expectedPoi, double defaultAsimovPoi) {
        if (m.poi < 0) throw new InputException(file + ": the model names no parameter of interest (poi)");
        Map<Integer, Double> f = o.fixes(m);
        if (f.containsKey(m.poi)) throw new InputException("--fix: the POI " + m.parameterNames[m.poi] + " cannot be held");
        int[] held = f.keySet().stream().mapToInt(Integer::intValue).toArray();
        double[] values = f.values().stream().mapToDouble(Double::doubleValue).toArray();
        FitSettings settings = o.settings();
        boolean postfit = o.asimovFrom != FitOptions.AsimovFrom.prefit;
        DataSet expected = asimov(m, expectedPoi, held, values, postfit, settings);
        DataSet observed = DataSet.observed(m);
        if (o.data == FitOptions.DataChoice.asimov) {
            double mu = o.asimovPoi == null ? defaultAsimovPoi : o.asimovPoi;
            if (!(mu >= m.lower[m.poi] && mu <= m.upper[m.poi])) {
                throw new InputException(String.format(Locale.ROOT, "--asimov-poi %s is outside the POI range [%s, %s]",
                        mu, m.lower[m.poi], m.upper[m.poi]));
            }
            DataSet data = mu == expectedPoi ? expected : asimov(m, mu, held, values, postfit, settings);
            return new PoiData(data, "asimov", expected, expectedPoi, data, held, values, settings, mu);
        }
        if (m.anyBlinded()) {
            // Blinded: no observed result; the toys' nuisances come from the unblinded channels, if any.
            DataSet generation = postfit && observed.anyChannel() ? observed : null;
            return new PoiData(null, "asimov", expected, expectedPoi, generation, held, values, settings, null);
        }
        return new PoiData(observed, "observed", expected, expectedPoi, observed, held, values, settings, null);
    }

    private static DataSet asimov(CompiledModel m, double mu, int[] held, double[] values, boolean postfit,
                                  FitSettings settings) {
        DataSets.Generated g = DataSets.asimovAt(m, mu, held, values, postfit, settings);
        FitResult c = g.conditionalFit();
        if (c != null && !c.converged()) {
            throw new ComputationException(String.format(Locale.ROOT,
                    "the fit to the observed data with %s = %s that sets the Asimov data set did not converge (%s)",
                    m.parameterNames[m.poi], mu, c.status()));
        }
        return g.data();
    }

    boolean blinded() {
        return data == null;
    }
}
