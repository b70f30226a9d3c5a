package plumb.engine.tooling;

import plumb.engine.model.Channel;
import plumb.engine.model.McStatBins;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterKind;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Warnings about a valid model that is probably not what its author meant (docs/model-tooling.md,
 * "Lint"). One-sided and over-100 % variations are warned about by the compiler already and are
 * not repeated here. Each warning is one line that names where.
 */
public final class Lint {

    /** Variations moving every yield by less than this (relative) are worth pruning. */
    public static final double PRUNABLE = 0.001;
    /** A shape part whose ratio to nominal is flat within this is a normalisation. */
    public static final double FLAT = 1e-6;
    /** MC-statistics errors above this fraction of the yield in a bin are warned about. */
    public static final double LARGE_MC_ERROR = 0.5;

    private Lint() {
    }

    public static List<String> warnings(Model model) {
        List<String> out = new ArrayList<>();
        Map<String, Boolean> moves = new LinkedHashMap<>();   // variation parameter -> moves some yield
        for (Channel ch : model.channels()) {
            double[] total = new double[ch.bins()];
            for (Sample s : ch.samples()) {
                String where = ch.name() + "/" + s.name();
                boolean any = false;
                for (int b = 0; b < total.length; b++) {
                    total[b] += s.yields()[b];
                    any |= s.yields()[b] > 0;
                }
                if (!any) out.add(where + ": every yield is 0");
                for (Variation v : s.variations()) variation(v, s.yields(), where, moves, out);
            }
            if (ch.observed() != null) {
                for (int b = 0; b < total.length; b++) {
                    if (total[b] == 0 && ch.observed()[b] > 0) {
                        out.add(String.format(Locale.ROOT, "%s bin %d: %s observed but no sample expects anything",
                                ch.name(), b, plain(ch.observed()[b])));
                    }
                }
            }
            double[] delta = McStatBins.relativeErrors(ch);
            for (int b = 0; b < delta.length; b++) {
                if (delta[b] > LARGE_MC_ERROR && McStatBins.exists(ch, b, model.options())) {
                    out.add(String.format(Locale.ROOT, "%s bin %d: MC-statistics error is %.0f %% of the yield",
                            ch.name(), b, 100 * delta[b]));
                }
            }
        }
        Set<String> factors = new LinkedHashSet<>();
        for (Channel ch : model.channels()) for (Sample s : ch.samples()) factors.addAll(s.factors());
        for (Map.Entry<String, Boolean> e : moves.entrySet()) {
            if (!e.getValue() && !factors.contains(e.getKey())) {
                out.add("parameter " + e.getKey() + ": none of its variations moves any yield (unused)");
            }
        }
        ungrouped(model, out);
        return out;
    }

    private static void variation(Variation v, double[] nominal, String where, Map<String, Boolean> moves,
                                  List<String> out) {
        String at = where + "/" + v.parameter() + ": ";
        boolean effect = VariationEdits.hasEffect(v, nominal);
        moves.merge(v.parameter(), effect, Boolean::logicalOr);
        if (!effect) return;
        if (VariationEdits.normEffect(v) < PRUNABLE && VariationEdits.shapeEffect(v, nominal) < PRUNABLE) {
            out.add(at + "moves no yield by 0.1 % or more (prunable: tidy --prune-norm/--prune-shape 0.001)");
        } else if (v.shape() != null && VariationEdits.splitNorm(v, nominal, FLAT).changed()) {
            out.add(at + "shape with a flat ratio to nominal: a normalisation only (tidy --split-norm)");
        }
    }

    /**
     * With groups given, the nuisance parameters (those of variations, the POI aside) in no group,
     * listed once; free factors and generated parameters are left out of groups on purpose.
     */
    private static void ungrouped(Model model, List<String> out) {
        if (model.groups().isEmpty()) return;
        Set<String> grouped = new LinkedHashSet<>();
        model.groups().values().forEach(grouped::addAll);
        List<String> left = new ArrayList<>();
        for (Map.Entry<String, ParameterKind> e : ParameterKind.of(model).entrySet()) {
            if (e.getValue() == ParameterKind.VARIATION && !e.getKey().equals(model.poi()) && !grouped.contains(e.getKey())) left.add(e.getKey());
        }
        if (!left.isEmpty()) {
            out.add(String.format(Locale.ROOT, "groups: %d parameter%s in no group: %s", left.size(),
                    left.size() == 1 ? "" : "s", String.join(", ", left)));
        }
    }

    private static String plain(double x) {
        return x == Math.rint(x) && Math.abs(x) < 1e15 ? Long.toString((long) x) : Double.toString(x);
    }
}
