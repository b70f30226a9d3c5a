package plumb.engine.tooling;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelValidator;
import plumb.engine.model.ParameterKind;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Combines models into one (docs/model-tooling.md, "Combination"). Parameters with the same name
 * are one parameter: that is the correlation model; renaming first decorrelates or aligns names.
 * Channels are joined in input order; groups and labels merge. Refused, naming both sources: a
 * channel name twice, one parameter given different settings (or used as a free factor in one and
 * as a constrained parameter in another), different POIs, different options, one label with two
 * values.
 */
public final class Combination {

    /** One input: the model, the name used in messages, and its renames (old name to new). */
    public record Part(Model model, String source, Map<String, String> renames) {
        public Part {
            renames = renames == null ? Map.of() : Map.copyOf(renames);
        }
    }

    private Combination() {
    }

    /**
     * @param name the combined model's name, or null for the parts' names joined by {@code +}
     *             (or {@code combined} when that is too long)
     */
    public static Model combine(List<Part> parts, String name) {
        List<Part> renamed = new ArrayList<>();
        for (Part p : parts) renamed.add(new Part(rename(p), p.source(), Map.of()));
        Map<String, String> channelSource = new LinkedHashMap<>();
        List<Channel> channels = new ArrayList<>();
        Map<String, ParameterSpec> specs = new LinkedHashMap<>();
        Map<String, String> specSource = new LinkedHashMap<>();
        Map<String, ParameterKind> kinds = new LinkedHashMap<>();
        Map<String, String> kindSource = new LinkedHashMap<>();
        Map<String, LinkedHashSet<String>> groups = new LinkedHashMap<>();
        Map<String, Object> labels = new LinkedHashMap<>();
        Map<String, String> labelSource = new LinkedHashMap<>();
        String poi = null, poiSource = null;
        Model first = renamed.get(0).model();
        for (Part p : renamed) {
            Model m = p.model();
            String src = p.source();
            for (Channel ch : m.channels()) {
                String before = channelSource.putIfAbsent(ch.name(), src);
                if (before != null) {
                    throw refused("channel \"%s\" is in both %s and %s (rename it in one of them)", ch.name(), before, src);
                }
                channels.add(ch);
            }
            for (Map.Entry<String, ParameterKind> k : ParameterKind.of(m).entrySet()) {
                ParameterKind kind = k.getValue();
                if (kind == ParameterKind.MC_STATISTICS) continue;
                ParameterKind earlier = kinds.putIfAbsent(k.getKey(), kind);
                if (earlier != null && earlier != kind) {
                    throw refused("parameter \"%s\" is a %s in %s but a %s in %s", k.getKey(), describe(earlier),
                            kindSource.get(k.getKey()), describe(kind), src);
                }
                kindSource.putIfAbsent(k.getKey(), src);
            }
            for (ParameterSpec s : m.parameters()) {
                ParameterSpec earlier = specs.putIfAbsent(s.name(), s);
                if (earlier != null && !same(earlier, s)) {
                    throw refused("parameter \"%s\" has different settings in %s and %s", s.name(), specSource.get(s.name()), src);
                }
                specSource.putIfAbsent(s.name(), src);
            }
            if (m.poi() != null) {
                if (poi != null && !poi.equals(m.poi())) {
                    throw refused("different POIs: \"%s\" in %s, \"%s\" in %s (rename one)", poi, poiSource, m.poi(), src);
                }
                if (poi == null) {
                    poi = m.poi();
                    poiSource = src;
                }
            }
            if (!m.options().equals(first.options())) {
                throw refused("different options in %s and %s: %s vs %s", renamed.get(0).source(), src, first.options(), m.options());
            }
            m.groups().forEach((g, members) -> groups.computeIfAbsent(g, x -> new LinkedHashSet<>()).addAll(members));
            for (Map.Entry<String, Object> l : m.labels().entrySet()) {
                Object earlier = labels.putIfAbsent(l.getKey(), l.getValue());
                if (earlier != null && !earlier.equals(l.getValue())) {
                    throw refused("label \"%s\" is %s in %s but %s in %s", l.getKey(), earlier, labelSource.get(l.getKey()),
                            l.getValue(), src);
                }
                labelSource.putIfAbsent(l.getKey(), src);
            }
        }
        Map<String, List<String>> mergedGroups = new LinkedHashMap<>();
        groups.forEach((g, members) -> mergedGroups.put(g, List.copyOf(members)));
        Model combined = new Model(Model.FORMAT, name == null ? joinedName(renamed) : name, null, poi, channels,
                new ArrayList<>(specs.values()), mergedGroups, labels, first.options());
        ModelValidator.validate(combined, "combined model");
        return combined;
    }

    private static String describe(ParameterKind k) {
        return switch (k) {
            case FACTOR -> "free factor";
            case BIN_FACTOR -> "per-bin free factor";
            case VARIATION -> "constrained (variation) parameter";
            case MC_STATISTICS -> "MC-statistics parameter";
        };
    }

    private static String joinedName(List<Part> parts) {
        String joined = String.join("+", parts.stream().map(p -> p.model().name()).toList());
        return ModelValidator.NAME.matcher(joined).matches() ? joined : "combined";
    }

    private static boolean same(ParameterSpec a, ParameterSpec b) {
        return Objects.equals(a.value(), b.value()) && Arrays.equals(a.range(), b.range())
                && Objects.equals(a.fixed(), b.fixed()) && a.constraintGiven() == b.constraintGiven()
                && Objects.equals(a.constraint(), b.constraint());
    }

    /** The part's model with its parameters renamed everywhere they appear. */
    static Model rename(Part p) {
        Model m = p.model();
        if (p.renames().isEmpty()) return m;
        var known = ParameterKind.of(m).keySet();
        for (String old : p.renames().keySet()) {
            boolean base = false;
            for (Channel ch : m.channels()) for (Sample s : ch.samples()) base |= old.equals(s.binFactors());
            if (!known.contains(old) && !base) throw refused("%s has no parameter \"%s\" to rename", p.source(), old);
        }
        Map<String, String> r = p.renames();
        List<Channel> channels = new ArrayList<>();
        for (Channel ch : m.channels()) {
            List<Sample> samples = new ArrayList<>();
            for (Sample s : ch.samples()) {
                List<Variation> vars = new ArrayList<>();
                for (Variation v : s.variations()) {
                    vars.add(new Variation(r.getOrDefault(v.parameter(), v.parameter()), v.norm(), v.shape(),
                            v.normInterpolation(), v.shapeInterpolation()));
                }
                List<String> factors = s.factors().stream().map(f -> r.getOrDefault(f, f)).toList();
                String bf = s.binFactors() == null ? null : r.getOrDefault(s.binFactors(), s.binFactors());
                samples.add(new Sample(s.name(), s.yields(), s.mcError(), factors, vars, bf));
            }
            channels.add(new Channel(ch.name(), ch.observable(), ch.edges(), ch.observed(), samples));
        }
        List<ParameterSpec> specs = new ArrayList<>();
        for (ParameterSpec s : m.parameters()) {
            specs.add(new ParameterSpec(r.getOrDefault(s.name(), s.name()), s.value(), s.range(), s.fixed(), s.constraint(),
                    s.constraintGiven()));
        }
        Map<String, List<String>> groups = new LinkedHashMap<>();
        m.groups().forEach((g, members) -> groups.put(g, members.stream().map(x -> r.getOrDefault(x, x)).toList()));
        String poi = m.poi() == null ? null : r.getOrDefault(m.poi(), m.poi());
        return new Model(m.format(), m.name(), m.description(), poi, channels, specs, groups, m.labels(), m.options());
    }

    private static ModelException refused(String format, Object... args) {
        return new ModelException(null, null, format, args);
    }
}
