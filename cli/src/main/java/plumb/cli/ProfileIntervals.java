package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.table.Table;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.ProfileScan;

import java.io.PrintWriter;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * {@code fit --intervals}: asymmetric 68 % profile-likelihood errors for the POI and listed
 * parameters, added to the fit's parameter entries as {@code errorLow} (≤ 0, the lower end minus
 * the value) and {@code errorHigh} (≥ 0); null where the profile does not reach 2ΔNLL = 1 inside
 * the range or a refit failed.
 */
final class ProfileIntervals {

    private ProfileIntervals() {
    }

    /** The POI (when the model has one) and the named parameters, in that order, without repeats. */
    static int[] resolve(CompiledModel m, FitOptions.Prepared p, List<String> names) {
        Set<Integer> out = new LinkedHashSet<>();
        if (m.poi() >= 0) out.add(m.poi());
        for (String n : names) {
            int k = m.indexOf(n);
            if (k < 0) throw new InputException("--intervals " + n + ": the model has no parameter '" + n + "'");
            boolean held = m.fixed(k);
            for (int h : p.held()) held |= h == k;
            if (held) throw new InputException("--intervals " + n + ": the parameter is held; it has no interval");
            out.add(k);
        }
        if (out.isEmpty()) throw new InputException("--intervals: the model names no POI; list the parameters");
        return out.stream().mapToInt(Integer::intValue).toArray();
    }

    /** Parameter index to {errorLow, errorHigh}. */
    static Map<Integer, double[]> compute(CompiledModel m, FitOptions.Prepared p, FitResult best, int[] params, int threads) {
        ProfileScan scan = new ProfileScan(m, p.data(), p.settings(), p.held(), p.heldValues(), best);
        Map<Integer, double[]> out = new LinkedHashMap<>();
        for (int k : params) {
            ProfileScan.Interval iv = scan.intervals(k, new double[] {ProfileScan.LEVEL_68}, threads).get(0);
            double v = best.values()[k];
            out.put(k, new double[] {iv.low() - v, iv.high() - v});
        }
        return out;
    }

    /**
     * The intervals asked for and those of every parameter that ends on an interpolation kink,
     * whose symmetric error is the curvature of one side only; none when the fit did not converge.
     */
    static Map<Integer, double[]> withKinks(CompiledModel m, FitOptions.Prepared p, FitResult best, int[] asked,
                                            int threads) {
        if (!best.converged()) return Map.of();
        Set<Integer> params = new LinkedHashSet<>();
        for (int k : asked) params.add(k);
        for (int k = 0; k < m.nAll(); k++) if (best.atKink()[k]) params.add(k);
        if (params.isEmpty()) return Map.of();
        return compute(m, p, best, params.stream().mapToInt(Integer::intValue).toArray(), threads);
    }

    static ObjectNode addTo(ObjectNode root, CompiledModel m, Map<Integer, double[]> profile) {
        if (profile.isEmpty()) return root;
        for (JsonNode node : root.withArray("parameters")) {
            int k = m.indexOf(node.get("name").asText());
            double[] e = profile.get(k);
            if (e == null) continue;
            Json.put((ObjectNode) node, "errorLow", e[0]);
            Json.put((ObjectNode) node, "errorHigh", e[1]);
        }
        return root;
    }

    static void print(PrintWriter out, CompiledModel m, FitResult r, Map<Integer, double[]> profile) {
        if (profile.isEmpty()) return;
        out.println();
        out.println("  68% profile-likelihood intervals (2ΔNLL = 1):");
        for (Map.Entry<Integer, double[]> e : profile.entrySet()) {
            double[] d = e.getValue();
            out.printf(Locale.ROOT, "  %-28s %12s  %s / %s%n", m.parameterNames(e.getKey()), Numbers.plain(r.values()[e.getKey()]),
                    Double.isFinite(d[0]) ? Numbers.plain(d[0]) : Table.MISSING,
                    Double.isFinite(d[1]) ? "+" + Numbers.plain(d[1]) : Table.MISSING);
        }
        out.flush();
    }
}
