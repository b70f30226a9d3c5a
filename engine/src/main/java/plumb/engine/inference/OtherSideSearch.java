package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.Objective;

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
 *
 * <p>A refit is skipped when the start shows no sign of a turn ({@link #bends}): −ln L and its slope
 * there, one evaluation, rise at least {@link #NO_TURN} of what the quadratic model of the minimum
 * (its value, gradient and Hessian) predicts. Another basin beyond the start would need −ln L to
 * bend down on the way there, below that model. On models where the terms barely turn (most toys)
 * this saves nearly every refit; a start that truly lies in another basin sits far below the model
 * (at most 0.73 of it in the test cases with several minima).
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
     * Fraction of the quadratic model's rise (in value and in slope) that a start must show for its
     * refit to be skipped. Measured on the several-minima test cases: starts whose refit found
     * another minimum showed at most 0.73 in one of the two; starts of medium-model toys whose
     * refit came back show 0.57–1.3 (median 0.98), so about 4 % of them are still refitted.
     */
    static final double NO_TURN = 0.85;

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
        for (int i = 0; i < m.nParams(); i++) if (m.oneSided(i) && !held[i]) n++;
        int[] out = new int[n];
        n = 0;
        for (int i = 0; i < m.nParams(); i++) if (m.oneSided(i) && !held[i]) out[n++] = i;
        return out;
    }

    /**
     * Refits from other-side starts around {@code first} (a converged minimum) with {@code local},
     * the fitter's minimisation from a start with the same parameters held.
     */
    static Outcome run(CompiledModel m, MinimumResult first, int[] candidates, double[] lower, double[] upper,
                       Objective f, Function<double[], MinimumResult> local) {
        MinimumResult best = first;
        List<MinimumResult> met = new ArrayList<>();
        int evaluations = 0, iterations = 0;
        double[] gradient = new double[first.x().length];
        for (int round = 0; round < ROUNDS; round++) {
            boolean improved = false;
            for (double[] start : starts(best.x(), candidates, lower, upper)) {
                evaluations++;
                if (!bends(f, best, start, candidates, gradient)) continue;
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

    /**
     * Whether −ln L at {@code start} (the minimum {@code at} with some candidates moved) lies
     * clearly below the quadratic model of that minimum, in value or in slope along the move:
     * the sign of a turn toward another basin. True too when the model says nothing (no finite
     * Hessian, no positive curvature along the move), so that the refit is made.
     */
    static boolean bends(Objective f, MinimumResult at, double[] start, int[] candidates, double[] gradient) {
        double[] x = at.x(), g = at.gradient(), h = at.hessian();
        int n = x.length;
        double linear = 0, curvature = 0;
        for (int p : candidates) {
            double dp = start[p] - x[p];
            if (dp == 0) continue;
            linear += g[p] * dp;
            for (int q : candidates) curvature += dp * h[p * n + q] * (start[q] - x[q]);
        }
        double modelRise = linear + 0.5 * curvature, modelSlope = linear + curvature;
        if (!(curvature > 0 && modelRise > 0 && modelSlope > 0)) return true;
        double rise = f.valueAndGradient(start, gradient) - at.value();
        double slope = 0;
        for (int p : candidates) slope += gradient[p] * (start[p] - x[p]);
        return !(rise >= NO_TURN * modelRise && slope >= NO_TURN * modelSlope);
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
            double w = m.prefitWidth(i);
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
