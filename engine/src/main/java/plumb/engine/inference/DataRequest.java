package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.util.Locale;
import java.util.Map;

/**
 * Which data a computation runs on, as asked for: the observed data, or the Asimov data set at a
 * POI value with nuisance values after a fit to the observed data ({@code postfit}) or at their
 * nominal values. {@link #forFit} and {@link #forPoiTest} resolve it on a model with the
 * blinding rules of docs/model-format.md ("Generated data sets"): a blinded channel has no
 * observed counts, so it is left out of fits to observed data, a model with any blinded channel
 * has no observed POI test, and its post-fit Asimov nuisances come from the unblinded channels.
 * One implementation for the commands, the report and the facade.
 *
 * @param asimov    the Asimov data set instead of the observed data
 * @param asimovPoi POI value of the Asimov data set, or null for the caller's default
 * @param postfit   nuisance values of Asimov data sets from a fit to the observed data (when the
 *                  model has observed data in some channel), else the nominal values
 */
public record DataRequest(boolean asimov, Double asimovPoi, boolean postfit) {

    /** The observed data (Asimov data sets the computation makes for itself are post-fit). */
    public static DataRequest observed() {
        return new DataRequest(false, null, true);
    }

    /** Why a request does not fit a model: a bad request, not a failed computation. */
    public enum Reason {
        /** Observed data asked for, but every channel is blinded. */
        ALL_BLINDED,
        /** A POI value or test asked for, but the model names no parameter of interest. */
        NO_POI,
        /** The Asimov POI value lies outside the POI's range ({@link Refused#value()}). */
        POI_OUT_OF_RANGE,
        /** A POI test with the POI among the held parameters. */
        POI_HELD
    }

    /** A request refused on a model, with why (the command line words it per option). */
    public static final class Refused extends IllegalArgumentException {
        private static final long serialVersionUID = 1L;
        private final Reason reason;
        private final double value;

        Refused(Reason reason, double value, String message) {
            super(message);
            this.reason = reason;
            this.value = value;
        }

        public Reason reason() {
            return reason;
        }

        /** The POI value refused ({@link Reason#POI_OUT_OF_RANGE}), else NaN. */
        public double value() {
            return value;
        }
    }

    /**
     * The data of a fit, as a problem.
     *
     * @param problem              the model, the data, the settings and the held parameters
     * @param asimovConditionalFit the fit to the observed data that set a post-fit Asimov data set
     *                             (null otherwise); it may not have converged
     * @param asimovPoi            POI value of the Asimov data set, null for observed data
     */
    public record FitData(Problem problem, FitResult asimovConditionalFit, Double asimovPoi) {
        public String kind() {
            return problem.data().kind();
        }
    }

    /**
     * Resolves the request for a fit: the observed data (every channel blinded: refused), or the
     * Asimov data set at {@code asimovPoi}, default {@code defaultAsimovPoi}.
     *
     * @param held parameters held, name to value (validated as {@link Problem#of} does)
     * @throws Refused when the request does not fit the model
     */
    public FitData forFit(CompiledModel m, Map<String, Double> held, FitSettings settings, double defaultAsimovPoi) {
        if (!asimov) {
            DataSet observed = DataSet.observed(m);
            if (!observed.anyChannel()) {
                throw new Refused(Reason.ALL_BLINDED, Double.NaN, "every channel of model '" + m.name()
                        + "' is blinded: it has no observed data to fit; ask for the Asimov data set");
            }
            return new FitData(Problem.of(m, observed, settings, held), null, null);
        }
        if (m.poi() < 0) throw noPoi(m);
        double mu = asimovPoi == null ? defaultAsimovPoi : asimovPoi;
        requireInRange(m, mu);
        Problem nothing = Problem.of(m, DataSet.observed(m).anyChannel() ? DataSet.observed(m) : DataSets.asimov(m, m.nominal()),
                settings, held);
        DataSets.Generated g = DataSets.asimovAt(m, mu, nothing.heldIndices(), nothing.heldValues(), postfit, settings);
        return new FitData(nothing.withData(g.data()), g.conditionalFit(), mu);
    }

    /**
     * The data sets of a POI test (limit, discovery).
     *
     * @param data        the data of the observed result, or null for a blinded model fitted to
     *                    observed data (no observed result)
     * @param kind        "observed" or "asimov": the data set the result is computed on
     * @param expected    the Asimov data set at {@code expectedPoi}, the expected results' data
     * @param expectedPoi POI value of {@code expected}
     * @param generation  data the toys' nuisance parameters are fitted to, or null for their
     *                    nominal values
     * @param asimovPoi   POI value of {@code data} when it is an Asimov data set, else null
     * @param problem     the model, settings and held parameters, on {@code expected}
     */
    public record PoiTestData(DataSet data, String kind, DataSet expected, double expectedPoi, DataSet generation,
                              Double asimovPoi, Problem problem) {
        /** No observed result: the model is blinded and observed data were asked for. */
        public boolean blinded() {
            return data == null;
        }
    }

    /**
     * Resolves the request for a POI test: the expected results on the Asimov data set at
     * {@code expectedPoi}; the observed result on the Asimov data set at {@code asimovPoi}
     * (default {@code defaultAsimovPoi}) when asked for, else on the observed data unless a
     * channel is blinded.
     *
     * @throws Refused          when the request does not fit the model
     * @throws InferenceException when the fit to the observed data that sets an Asimov data set
     *                          does not converge
     */
    public PoiTestData forPoiTest(CompiledModel m, Map<String, Double> held, FitSettings settings, double expectedPoi,
                                  double defaultAsimovPoi) {
        if (m.poi() < 0) throw noPoi(m);
        if (held.containsKey(m.parameterNames(m.poi()))) {
            throw new Refused(Reason.POI_HELD, Double.NaN, "the POI " + m.parameterNames(m.poi()) + " cannot be held in a POI test");
        }
        DataSet observed = DataSet.observed(m);
        Problem base = Problem.of(m, observed.anyChannel() ? observed : DataSets.asimov(m, m.nominal()), settings, held);
        int[] h = base.heldIndices();
        double[] hv = base.heldValues();
        if (asimov) {
            double mu = asimovPoi == null ? defaultAsimovPoi : asimovPoi;
            requireInRange(m, mu);
            DataSet expected = asimovAt(m, expectedPoi, h, hv, postfit, settings);
            DataSet data = mu == expectedPoi ? expected : asimovAt(m, mu, h, hv, postfit, settings);
            return new PoiTestData(data, "asimov", expected, expectedPoi, data, mu, base.withData(expected));
        }
        DataSet expected = asimovAt(m, expectedPoi, h, hv, postfit, settings);
        if (m.anyBlinded()) {
            // Blinded: no observed result; the toys' nuisances come from the unblinded channels, if any.
            DataSet generation = postfit && observed.anyChannel() ? observed : null;
            return new PoiTestData(null, "asimov", expected, expectedPoi, generation, null, base.withData(expected));
        }
        return new PoiTestData(observed, "observed", expected, expectedPoi, observed, null, base.withData(expected));
    }

    /**
     * The Asimov data set at POI value {@code mu} (nuisances post-fit or nominal, the {@code held}
     * parameters held), requiring the fit that sets it to converge.
     *
     * @throws InferenceException when that fit does not converge
     */
    public static DataSet asimovAt(CompiledModel m, double mu, int[] held, double[] heldValues, boolean postfit,
                                   FitSettings settings) {
        DataSets.Generated g = DataSets.asimovAt(m, mu, held, heldValues, postfit, settings);
        FitResult c = g.conditionalFit();
        if (c != null && !c.converged()) {
            throw new InferenceException(String.format(Locale.ROOT,
                    "the fit to the observed data with %s = %s that sets the Asimov data set did not converge (%s)",
                    m.parameterNames(m.poi()), mu, c.status()));
        }
        return g.data();
    }

    /** The POI value {@code mu} inside the POI's range, else refused. */
    public static void requireInRange(CompiledModel m, double mu) {
        if (m.poi() < 0) throw noPoi(m);
        if (!(mu >= m.lower(m.poi()) && mu <= m.upper(m.poi()))) {
            throw new Refused(Reason.POI_OUT_OF_RANGE, mu, String.format(Locale.ROOT,
                    "POI value %s is outside the range [%s, %s]", mu, m.lower(m.poi()), m.upper(m.poi())));
        }
    }

    private static Refused noPoi(CompiledModel m) {
        return new Refused(Reason.NO_POI, Double.NaN, "model '" + m.name() + "' names no parameter of interest");
    }
}
