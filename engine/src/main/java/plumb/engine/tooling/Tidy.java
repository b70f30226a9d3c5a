package plumb.engine.tooling;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelValidator;
import plumb.engine.model.ParameterKind;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Writes a tidier copy of a model and a log of every change. Per variation, in this order: smooth,
 * symmetrise, split pure normalisations into norm, prune, drop variations without effect (each only
 * when asked for in {@link TidyOptions}). Variations of the POI are left alone. A parameter that
 * loses its last variation loses its {@code parameters} entry and group memberships too (logged),
 * so the result is always a valid model.
 */
public final class Tidy {

    /** The tidied model and one line per change, in model order. */
    public record Result(Model model, List<String> changes) { }

    private Tidy() {
    }

    public static Result apply(Model model, TidyOptions options) {
        List<String> log = new ArrayList<>();
        List<Channel> channels = new ArrayList<>();
        for (Channel ch : model.channels()) {
            List<Sample> samples = new ArrayList<>();
            for (Sample s : ch.samples()) {
                List<Variation> kept = new ArrayList<>();
                for (Variation v : s.variations()) {
                    String where = ch.name() + "/" + s.name() + "/" + v.parameter() + ": ";
                    Variation out = v.parameter().equals(model.poi()) ? v : edit(v, s.yields(), options, where, log);
                    if (out != null) kept.add(out);
                }
                samples.add(s.withVariations(kept));
            }
            channels.add(new Channel(ch.name(), ch.observable(), ch.edges(), ch.observed(), samples));
        }
        Model draft = new Model(model.format(), model.name(), model.description(), model.poi(), channels,
                model.parameters(), model.groups(), model.labels(), model.options());
        Model tidied = withoutOrphans(draft, log);
        ModelValidator.validate(tidied, "tidied model");
        return new Result(tidied, List.copyOf(log));
    }

    private static Variation edit(Variation v, double[] nominal, TidyOptions o, String where, List<String> log) {
        if (o.smooth()) v = logged(VariationEdits.smooth(v, nominal), where, log);
        if (v != null && o.symmetrise() != null) v = logged(VariationEdits.symmetrise(v, nominal, o.symmetrise()), where, log);
        if (v != null && o.splitNormTolerance() != null) {
            v = logged(VariationEdits.splitNorm(v, nominal, o.splitNormTolerance()), where, log);
        }
        if (v != null && (o.pruneNormBelow() != null || o.pruneShapeBelow() != null)) {
            double normBelow = o.pruneNormBelow() == null ? 0 : o.pruneNormBelow();
            double shapeBelow = o.pruneShapeBelow() == null ? 0 : o.pruneShapeBelow();
            v = logged(VariationEdits.prune(v, nominal, normBelow, shapeBelow), where, log);
        }
        if (v != null && o.dropUnused() && !VariationEdits.hasEffect(v, nominal)) {
            log.add(where + "no effect on any yield; variation removed");
            return null;
        }
        return v;
    }

    private static Variation logged(VariationEdits.Edit e, String where, List<String> log) {
        if (e.changed()) log.add(where + e.change());
        return e.variation();
    }

    /** Drops {@code parameters} entries and group members naming parameters the model no longer has. */
    private static Model withoutOrphans(Model m, List<String> log) {
        Set<String> present = ParameterKind.of(m).keySet();
        List<ParameterSpec> specs = new ArrayList<>();
        for (ParameterSpec p : m.parameters()) {
            if (present.contains(p.name())) {
                specs.add(p);
            } else {
                log.add("parameters/" + p.name() + ": no variation left; its entry removed");
            }
        }
        Map<String, List<String>> groups = new LinkedHashMap<>();
        for (Map.Entry<String, List<String>> g : m.groups().entrySet()) {
            List<String> members = new ArrayList<>();
            for (String name : g.getValue()) {
                if (present.contains(name)) {
                    members.add(name);
                } else {
                    log.add("groups/" + g.getKey() + ": " + name + " has no variation left; removed from the group");
                }
            }
            groups.put(g.getKey(), members);
        }
        return new Model(m.format(), m.name(), m.description(), m.poi(), m.channels(), specs, groups, m.labels(),
                m.options());
    }
}
