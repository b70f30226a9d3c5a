package plumb.engine.model;

import static plumb.engine.model.JsonPaths.index;
import static plumb.engine.model.JsonPaths.key;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Pattern;

/**
 * The rules of docs/model-format.md that hold between values: names, bin counts, value ranges,
 * parameter entries, groups, the POI and the options. {@link ModelReader} calls it on every model
 * it reads; code that builds a {@link Model} itself (a generator, say) can call it too.
 *
 * <p>Checks run channel by channel in file order, then the parameter entries, groups, POI, labels;
 * the first broken rule is thrown with the JSON path of the offending value.
 */
public final class ModelValidator {

    /** Names of models, channels, samples, parameters and groups (docs/model-format.md, "Top level"). */
    public static final Pattern NAME = Pattern.compile("[A-Za-z0-9_.:+-]{1,128}");

    private final String source;

    private ModelValidator(String source) {
        this.source = source;
    }

    /**
     * Checks every rule of the format that a {@link Model} record can break.
     *
     * @param source names the model in error messages (a file name); may be null
     * @throws ModelException naming the JSON path of the first offending value
     */
    public static void validate(Model model, String source) {
        new ModelValidator(source).check(model);
    }

    private void check(Model m) {
        if (m.format() == null) throw error("format", "required key is missing");
        if (!Model.FORMAT.equals(m.format())) {
            throw error("format", "%s, expected \"%s\"", quote(m.format()), Model.FORMAT);
        }
        name(m.name(), "name");
        options(m.options());
        if (m.channels().isEmpty()) throw error("channels", "empty, expected at least one channel");
        Map<String, Integer> channelNames = new HashMap<>();
        for (int c = 0; c < m.channels().size(); c++) {
            String path = index("channels", c);
            Channel ch = m.channels().get(c);
            name(ch.name(), key(path, "name"));
            Integer before = channelNames.putIfAbsent(ch.name(), c);
            if (before != null) {
                throw error(key(path, "name"), "%s repeats channels[%d].name", quote(ch.name()), before);
            }
            channel(ch, path);
        }
        binFactorClashes(m);
        Map<String, ParameterKind> kinds = ParameterKind.of(m);
        parameters(m.parameters(), kinds);
        groups(m.groups(), kinds);
        if (m.poi() != null && !kinds.containsKey(m.poi())) throw notAParameter("poi", m.poi());
        labels(m.labels());
    }

    private void options(ModelOptions o) {
        nonNegative(o.mcStatThreshold(), "options.mcStatThreshold");
        nonNegative(o.pruneBelow(), "options.pruneBelow");
        if (o.mcStatConstraint() == null) throw error("options.mcStatConstraint", "expected \"gaussian\" or \"poisson\"");
    }

    private void channel(Channel ch, String path) {
        String samplesAt = key(path, "samples");
        if (ch.samples().isEmpty()) throw error(samplesAt, "empty, expected at least one sample");
        // the bin count is fixed by the first present of edges, observed, the samples' yields
        int bins;
        String binsFrom;
        if (ch.edges() != null) {
            binsFrom = key(path, "edges");
            if (ch.edges().length < 2) {
                throw error(binsFrom, "%d values, expected at least 2 (one bin needs two edges)", ch.edges().length);
            }
            bins = ch.edges().length - 1;
        } else if (ch.observed() != null) {
            binsFrom = key(path, "observed");
            bins = ch.observed().length;
        } else {
            binsFrom = key(index(samplesAt, 0), "yields");
            if (ch.samples().get(0).yields() == null) throw error(binsFrom, "required key is missing");
            bins = ch.samples().get(0).yields().length;
        }
        if (bins == 0) throw error(binsFrom, "0 values, expected at least 1 (a channel has at least one bin)");
        Counts counts = new Counts(bins, binsFrom);

        if (ch.edges() != null) {
            double[] e = ch.edges();
            for (int i = 0; i < e.length; i++) {
                if (!Double.isFinite(e[i])) throw error(index(binsFrom, i), "%s, must be finite", e[i]);
                if (i > 0 && !(e[i] > e[i - 1])) {
                    throw error(index(binsFrom, i), "%s, must be > %s (edges[%d]): edges strictly increase",
                            e[i], e[i - 1], i - 1);
                }
            }
        }
        if (ch.observed() != null) nonNegative(ch.observed(), key(path, "observed"), counts);

        Map<String, Integer> sampleNames = new HashMap<>();
        for (int s = 0; s < ch.samples().size(); s++) {
            String at = index(samplesAt, s);
            Sample sample = ch.samples().get(s);
            name(sample.name(), key(at, "name"));
            Integer before = sampleNames.putIfAbsent(sample.name(), s);
            if (before != null) {
                throw error(key(at, "name"), "%s repeats %s.name", quote(sample.name()), index(samplesAt, before));
            }
            sample(sample, at, counts);
        }
    }

    private void sample(Sample s, String path, Counts counts) {
        if (s.yields() == null) throw error(key(path, "yields"), "required key is missing");
        nonNegative(s.yields(), key(path, "yields"), counts);
        if (s.mcError() != null) nonNegative(s.mcError(), key(path, "mcError"), counts);
        for (int f = 0; f < s.factors().size(); f++) parameterName(s.factors().get(f), index(key(path, "factors"), f));
        if (s.binFactors() != null) {
            String at = key(path, "binFactors");
            parameterName(s.binFactors(), at);
            String longest = BinFactors.name(s.binFactors(), s.yields().length - 1);
            if (!NAME.matcher(longest).matches()) {
                throw error(at, "%s, the generated name %s must match %s", quote(s.binFactors()), quote(longest), NAME.pattern());
            }
            for (int v = 0; v < s.variations().size(); v++) {
                if (s.variations().get(v).shape() != null) {
                    throw error(key(index(key(path, "variations"), v), "shape"),
                            "a sample with binFactors takes norm variations only (its per-bin factors multiply the yields)");
                }
            }
        }
        for (int v = 0; v < s.variations().size(); v++) {
            variation(s.variations().get(v), index(key(path, "variations"), v), counts);
        }
    }

    private void variation(Variation v, String path, Counts counts) {
        if (v.parameter() == null) throw error(key(path, "parameter"), "required key is missing");
        parameterName(v.parameter(), key(path, "parameter"));
        if (v.norm() == null && v.shape() == null) throw error(path, "a variation needs \"norm\" or \"shape\" (or both)");
        if (v.norm() != null) {
            positive(v.norm().down(), key(path, "norm.down"));
            positive(v.norm().up(), key(path, "norm.up"));
        }
        if (v.shape() != null) {
            if (v.shape().down() == null) throw error(key(path, "shape.down"), "required key is missing");
            if (v.shape().up() == null) throw error(key(path, "shape.up"), "required key is missing");
            nonNegative(v.shape().down(), key(path, "shape.down"), counts);
            nonNegative(v.shape().up(), key(path, "shape.up"), counts);
        }
        if (v.shapeInterpolation() == Interpolation.EXPONENTIAL) {
            throw error(key(path, "shapeInterpolation"), "\"exponential\", expected \"smooth\" or \"linear\"");
        }
    }

    /** A parameter name written in a sample; γ names are generated, never written there. */
    private void parameterName(String name, String path) {
        name(name, path);
        if (name.startsWith(McStatBins.PREFIX)) {
            throw error(path, "%s, names starting with \"%s\" are reserved for the generated MC-statistics parameters",
                    quote(name), McStatBins.PREFIX);
        }
    }

    /** A generated per-bin factor name may not be written as a factor or a variation's parameter. */
    private void binFactorClashes(Model m) {
        java.util.Set<String> generated = BinFactors.names(m);
        if (generated.isEmpty()) return;
        for (int c = 0; c < m.channels().size(); c++) {
            List<Sample> samples = m.channels().get(c).samples();
            for (int s = 0; s < samples.size(); s++) {
                String path = index(key(index("channels", c), "samples"), s);
                Sample sample = samples.get(s);
                for (int f = 0; f < sample.factors().size(); f++) {
                    if (generated.contains(sample.factors().get(f))) {
                        throw clash(index(key(path, "factors"), f), sample.factors().get(f));
                    }
                }
                for (int v = 0; v < sample.variations().size(); v++) {
                    String p = sample.variations().get(v).parameter();
                    if (generated.contains(p)) throw clash(key(index(key(path, "variations"), v), "parameter"), p);
                }
            }
        }
    }

    private ModelException clash(String path, String name) {
        return error(path, "%s is the name of a generated per-bin factor (binFactors); choose another name", quote(name));
    }

    private void parameters(List<ParameterSpec> specs, Map<String, ParameterKind> kinds) {
        Map<String, Integer> seen = new HashMap<>();
        for (int i = 0; i < specs.size(); i++) {
            String path = index("parameters", i);
            ParameterSpec spec = specs.get(i);
            String nameAt = key(path, "name");
            if (spec.name() == null) throw error(nameAt, "required key is missing");
            name(spec.name(), nameAt);
            Integer before = seen.putIfAbsent(spec.name(), i);
            if (before != null) {
                throw error(nameAt, "%s repeats parameters[%d].name: one entry per parameter", quote(spec.name()), before);
            }
            ParameterKind kind = kinds.get(spec.name());
            if (kind == null) {
                if (spec.name().startsWith(McStatBins.PREFIX)) throw notAParameter(nameAt, spec.name());
                throw error(nameAt, "%s is used nowhere: in no sample's factors and no variation", quote(spec.name()));
            }
            parameterEntry(spec, kind, path);
        }
    }

    private void parameterEntry(ParameterSpec spec, ParameterKind kind, String path) {
        double lo = kind.defaultLow(), hi = kind.defaultHigh();
        String rangeAt = key(path, "range");
        if (spec.range() != null) {
            if (spec.range().length != 2) throw error(rangeAt, "%d values, expected 2 ([lo, hi])", spec.range().length);
            lo = spec.range()[0];
            hi = spec.range()[1];
            if (!Double.isFinite(lo)) throw error(index(rangeAt, 0), "%s, must be finite", lo);
            if (!Double.isFinite(hi)) throw error(index(rangeAt, 1), "%s, must be finite", hi);
            if (!(lo < hi)) throw error(rangeAt, "[%s, %s], lo must be < hi", lo, hi);
        }
        double value = kind.defaultValue();
        if (spec.value() != null) {
            value = spec.value();
            if (!Double.isFinite(value)) throw error(key(path, "value"), "%s, must be finite", value);
            if (!(value >= lo && value <= hi)) {
                throw error(key(path, "value"), "%s, outside the range [%s, %s]", value, lo, hi);
            }
        } else if (!(value >= lo && value <= hi)) {
            throw error(rangeAt, "[%s, %s] does not contain the default value %s of the parameter; give a value",
                    lo, hi, value);
        }
        String at = key(path, "constraint");
        if (spec.constraint() instanceof ParameterSpec.Gaussian g) {
            if (g.center() != null && !Double.isFinite(g.center())) {
                throw error(key(at, "center"), "%s, must be finite", g.center());
            }
            if (g.width() != null) positive(g.width(), key(at, "width"));
        } else if (spec.constraint() instanceof ParameterSpec.Poisson poisson) {
            positive(poisson.relative(), key(at, "relative"));
            // the Poisson term τγ − m ln(τγ) needs a multiplicative parameter that stays positive
            if (!(value > 0)) throw error(at, "a poisson constraint needs a value > 0, the value is %s", value);
            if (lo < 0) throw error(at, "a poisson constraint needs a range within [0, +inf), the range starts at %s", lo);
        }
    }

    private void groups(Map<String, List<String>> groups, Map<String, ParameterKind> kinds) {
        for (Map.Entry<String, List<String>> g : groups.entrySet()) {
            String path = key("groups", g.getKey());
            name(g.getKey(), path);
            List<String> members = g.getValue();
            if (members == null) throw error(path, "expected an array of parameter names");
            for (int j = 0; j < members.size(); j++) {
                if (!kinds.containsKey(members.get(j))) throw notAParameter(index(path, j), members.get(j));
            }
        }
    }

    private void labels(Map<String, Object> labels) {
        for (Map.Entry<String, Object> l : labels.entrySet()) {
            String at = key("labels", String.valueOf(l.getKey()));
            Object v = l.getValue();
            if (v instanceof Double d) {
                if (!Double.isFinite(d)) throw error(at, "%s, must be finite", d);
            } else if (!(v instanceof String)) {
                throw error(at, "expected a number or a string");
            }
        }
    }

    // ---- value rules; the valid case is tested first so that NaN lands in the error branch ----

    private void name(String name, String path) {
        if (name == null) throw error(path, "required key is missing");
        if (!NAME.matcher(name).matches()) {
            throw error(path, "%s, a name must match %s", quote(name), NAME.pattern());
        }
    }

    private void nonNegative(double v, String path) {
        if (v >= 0 && v < Double.POSITIVE_INFINITY) return;
        throw error(path, v < 0 ? "%s, must be >= 0" : "%s, must be finite and >= 0", v);
    }

    private void positive(double v, String path) {
        if (v > 0 && v < Double.POSITIVE_INFINITY) return;
        throw error(path, v <= 0 ? "%s, must be > 0" : "%s, must be finite and > 0", v);
    }

    private void nonNegative(double[] values, String path, Counts counts) {
        counts.check(values, path);
        for (int b = 0; b < values.length; b++) {
            double v = values[b];
            if (!(v >= 0 && v < Double.POSITIVE_INFINITY)) nonNegative(v, index(path, b));  // path only for an error
        }
    }

    private ModelException notAParameter(String path, String name) {
        if (name.startsWith(McStatBins.PREFIX)) {
            return error(path, "%s is not one of the generated MC-statistics parameters (no such channel and bin with a γ)",
                    quote(name));
        }
        return error(path, "%s is not a parameter of the model (in no sample's factors and no variation)", quote(name));
    }

    private ModelException error(String path, String format, Object... args) {
        return new ModelException(source, path, format, args);
    }

    /** A name in quotes for a message; very long ones shortened so the message stays readable. */
    private static String quote(String s) {
        if (s.length() <= 80) return '"' + s + '"';
        return '"' + s.substring(0, 60) + "...\" (" + s.length() + " characters)";
    }

    /** The bin count of a channel and the array that fixed it. */
    private final class Counts {
        private final int bins;
        private final String from;

        Counts(int bins, String from) {
            this.bins = bins;
            this.from = from;
        }

        void check(double[] values, String path) {
            if (values.length != bins) {
                throw error(path, "%d values, expected %d (the bin count set by %s)", values.length, bins, from);
            }
        }
    }
}
