package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.minimise.MinimumResult;

import java.util.ArrayList;
import java.util.List;
import java.util.function.Function;

/**
 * Looks for a lower minimum on the other side of one-sided terms. A one-sided norm or shape term
 * ({@link CompiledModel#oneSided}) turns back inside the parameter's range, so −ln L can have one
 * minimum on each side of the turn, and a descent method ends in whichever basin it starts in.
 * After a fit converges, this refits from starts with those parameters moved to the other side of
 * θ = 0 (where every such turn or ridge lies for linear and exponential interpolation, and close
 * to where it lies for smooth): all of them at once, then each alone. The lowest minimum wins and
 * the search repeats from it; the others are kept for the report. Models without one-sided terms
 * pay nothing. Package-private: the {@link Fitter} runs it.
 */
final class OtherSideSearch {

    /** Searches repeated from a newly found lower minimum before stopping. */
    static final int ROUNDS = 3;
    /** Up to this many candidates, each is also moved alone; beyond, only all together. */
    static final int MAX_SINGLE = 8;
    /**
     * Smallest distance from θ = 0 of a moved start. A minimum close to the turn is mirrored to a
     * point clearly beyond it: for smooth interpolation the turn lies near, not at, θ = 0.
     */
    static final double MIN_JUMP = 0.5;
    /** A lower minimum must beat the current one by this much in −ln L to replace it (fits settle to ~1e-10). */
    static final double MIN_GAIN = 1e-9;
    /** Two minima are the same when no parameter differs by more than this many widths (or units). */
    static final double SAME_POINT = 0.02;

    /**
     * @param best        the lowest minimum found
     * @param others      other distinct minima met, lowest first
     * @param evaluations and iterations spent on the extra fits
     */
    record Outcome(MinimumResult best, List<MinimumResult> others, int evaluations, int iterations) { }

    private OtherSideSearch() {
    }

    /** The one-sided parameters not held: the ones to move (empty for most models). */
    static int[] candidates(CompiledModel m, boolean[] held) {
        int n = 0;
        for (int i = 0; i < m.nParams; i++) if (m.oneSided[i] && !held[i]) n++;
        int[] out = new int[n];
        n = 0;
        for (int i = 0; i < m.nParams; i++) if (m.oneSided[i] && !held[i]) out[n++] = i;
        return out;
    }

    /**
     * Refits from other-side starts around {@code first} (a converged minimum) with {@code local},
     * the fitter's minimisation from a start with the same parameters held.
     */
    static Outcome run(CompiledModel m, MinimumResult first, int[] candidates, double[] lower, double[] upper,
                       Function<double[], MinimumResult> local) {
        MinimumResult best = first;
        List<MinimumResult> met = new ArrayList<>();
        int evaluations = 0, iterations = 0;
        for (int round = 0; round < ROUNDS; round++) {
            boolean improved = false;
            for (double[] start : starts(best.x(), candidates, lower, upper)) {
                MinimumResult r = local.apply(start);
                evaluations += r.evaluations();
                iterations += r.iterations();
                if (!r.converged() || same(m, r.x(), best.x())) continue;
                if (r.value() < best.value() - MIN_GAIN) {
                    met.add(best);
                    best = r;
                    improved = true;
                    break;
                }
                met.add(r);
            }
            if (!improved) break;
        }
        return new Outcome(best, distinct(m, met, best), evaluations, iterations);
    }

    /** The other-side starts around x: every candidate moved, then each alone. */
    static List<double[]> starts(double[] x, int[] candidates, double[] lower, double[] upper) {
        List<double[]> out = new ArrayList<>();
        double[] all = x.clone();
        boolean moved = false;
        for (int p : candidates) moved |= move(all, p, lower, upper);
        if (moved) out.add(all);
        if (candidates.length > 1 && candidates.length <= MAX_SINGLE) {
            for (int p : candidates) {
                double[] one = x.clone();
                if (move(one, p, lower, upper)) out.add(one);
            }
        }
        return out;
    }

    /** Moves θ_p to the other side of 0, at least {@link #MIN_JUMP} from it; false when the range leaves no room. */
    private static boolean move(double[] x, int p, double[] lower, double[] upper) {
        double v = x[p];
        double target = v > 0 ? -Math.max(v, MIN_JUMP) : Math.max(-v, MIN_JUMP);
        target = Math.max(lower[p], Math.min(upper[p], target));
        if (target == v || Math.signum(target) == Math.signum(v) && v != 0) return false;
        x[p] = target;
        return true;
    }

    /** Whether two points are the same minimum: every parameter within {@link #SAME_POINT} of its scale. */
    static boolean same(CompiledModel m, double[] a, double[] b) {
        for (int i = 0; i < a.length; i++) {
            double w = m.prefitWidth[i];
            double scale = w > 0 && Double.isFinite(w) ? w : Math.max(1, Math.abs(a[i]));
            if (Math.abs(a[i] - b[i]) > SAME_POINT * scale) return false;
        }
        return true;
    }

    /** The minima other than best, one per point, lowest first. */
    private static List<MinimumResult> distinct(CompiledModel m, List<MinimumResult> met, MinimumResult best) {
        List<MinimumResult> out = new ArrayList<>();
        for (MinimumResult r : met) {
            if (same(m, r.x(), best.x())) continue;
            boolean seen = false;
            for (MinimumResult o : out) seen |= same(m, r.x(), o.x());
            if (!seen) out.add(r);
        }
        out.sort((a, b) -> Double.compare(a.value(), b.value()));
        return out;
    }
}
