package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

/**
 * One inference problem: a compiled model, the data set it is fitted to, how fits are made, and
 * the parameters held at given values (by name, beyond those the model fixes itself). Immutable:
 * the {@code with…} methods return a changed copy, so one problem can be shared by threads and
 * varied without surprises (a refit on other data, a fit with one more parameter held).
 *
 * <p>Every inference entry point of the engine takes a problem. The index arrays
 * {@link #heldIndices()} and {@link #heldValues()} are the form the hot code uses; they are
 * computed once here.
 */
public final class Problem {

    private final CompiledModel model;
    private final DataSet data;
    private final FitSettings settings;
    private final Map<String, Double> held;
    private final int[] heldIndices;
    private final double[] heldValues;

    private Problem(CompiledModel model, DataSet data, FitSettings settings, Map<String, Double> held) {
        this.model = model;
        this.data = data;
        this.settings = settings;
        this.held = Collections.unmodifiableMap(new LinkedHashMap<>(held));
        this.heldIndices = new int[held.size()];
        this.heldValues = new double[held.size()];
        int k = 0;
        for (Map.Entry<String, Double> e : held.entrySet()) {
            heldIndices[k] = model.indexOf(e.getKey());
            heldValues[k++] = e.getValue();
        }
    }

    /**
     * A validated problem.
     *
     * @param held parameter name to value, in the order given; each name must be a parameter of the
     *             model and each value lie in its range
     * @throws IllegalArgumentException when the data set does not fit the model (sizes, no channel
     *                                  included) or a held parameter is unknown or out of range
     */
    public static Problem of(CompiledModel model, DataSet data, FitSettings settings, Map<String, Double> held) {
        if (model == null || data == null || settings == null || held == null) {
            throw new IllegalArgumentException("a problem needs a model, a data set, fit settings and held values (maybe empty)");
        }
        checkData(model, data);
        for (Map.Entry<String, Double> e : held.entrySet()) checkHeld(model, e.getKey(), e.getValue());
        return new Problem(model, data, settings, held);
    }

    /** The model fitted to its observed data with default settings and nothing held. */
    public static Problem observed(CompiledModel model) {
        return of(model, DataSet.observed(model), FitSettings.defaults(), Map.of());
    }

    private static void checkData(CompiledModel m, DataSet d) {
        if (d.counts().length != m.nBins() || d.channelIncluded().length != m.nChannels() || d.aux().length != m.nAll()) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "the %s data set has %d bins, %d channels and %d auxiliary values; model '%s' has %d, %d and %d",
                    d.kind(), d.counts().length, d.channelIncluded().length, d.aux().length, m.name(), m.nBins(),
                    m.nChannels(), m.nAll()));
        }
        if (!d.anyChannel()) {
            throw new IllegalArgumentException("the " + d.kind() + " data set includes no channel (every channel blinded?)");
        }
    }

    private static void checkHeld(CompiledModel m, String name, Double value) {
        int i = name == null ? -1 : m.indexOf(name);
        if (i < 0) throw new IllegalArgumentException("model '" + m.name() + "' has no parameter '" + name + "' to hold");
        if (value == null || !(value >= m.lower(i) && value <= m.upper(i))) {
            throw new IllegalArgumentException(String.format(Locale.ROOT, "%s = %s is outside the range [%s, %s] of %s",
                    name, value, m.lower(i), m.upper(i), name));
        }
    }

    public CompiledModel model() {
        return model;
    }

    public DataSet data() {
        return data;
    }

    public FitSettings settings() {
        return settings;
    }

    /** Parameters held beyond the model's fixed ones: name to value, in the order given. */
    public Map<String, Double> held() {
        return held;
    }

    /** Indices of the held parameters, in the order of {@link #held()} (a copy). */
    public int[] heldIndices() {
        return heldIndices.clone();
    }

    /** Values of the held parameters, in the order of {@link #held()} (a copy). */
    public double[] heldValues() {
        return heldValues.clone();
    }

    /** Whether the named parameter is held by this problem (the model's own fixed ones not counted). */
    public boolean holds(String name) {
        return held.containsKey(name);
    }

    /** The parameter values a fit starts from: the model's nominal values with the held values applied (nAll). */
    public double[] startValues() {
        double[] v = model.nominal();
        for (int k = 0; k < heldIndices.length; k++) v[heldIndices[k]] = heldValues[k];
        return v;
    }

    /** The same problem on other data. */
    public Problem withData(DataSet other) {
        checkData(model, other);
        return new Problem(model, other, settings, held);
    }

    /** The same problem with other fit settings. */
    public Problem withSettings(FitSettings other) {
        if (other == null) throw new IllegalArgumentException("fit settings must not be null");
        return new Problem(model, data, other, held);
    }

    /** The same problem with exactly these parameters held (replacing the held set). */
    public Problem withHeld(Map<String, Double> other) {
        return of(model, data, settings, other);
    }

    /** The same problem with one more parameter held (or its held value changed). */
    public Problem holding(String name, double value) {
        checkHeld(model, name, value);
        Map<String, Double> h = new LinkedHashMap<>(held);
        h.put(name, value);
        return new Problem(model, data, settings, h);
    }

    /** The same problem with the named parameter no longer held by it. */
    public Problem releasing(String name) {
        Map<String, Double> h = new LinkedHashMap<>(held);
        h.remove(name);
        return new Problem(model, data, settings, h);
    }

    @Override
    public String toString() {
        return "Problem[model=" + model.name() + ", data=" + data.kind() + ", held=" + held + ", settings=" + settings + "]";
    }
}
