package plumb.engine.inference;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.exception.MathIllegalStateException;
import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.MinimumStatus;

import java.util.ArrayList;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * Profile likelihood of one parameter around a best fit: −ln L minimised over all other
 * parameters with that one held, at grid points and at the crossings of 2ΔNLL with a level
 * (Wilks: 1 for 68.27 %, 3.841 for 95 %; S. S. Wilks, Ann. Math. Stat. 9 (1938) 60). Crossings
 * are found by root-finding on the profile itself, not read off a grid. Every refit is
 * warm-started from the best fit (see {@link Refits}), so results do not depend on the threads.
 */
public final class ProfileScan {

    /** 2ΔNLL of the 68.27 % interval: the χ²₁ quantile at 0.6827 (Wilks). */
    public static final double LEVEL_68 = 1.0;
    /** 2ΔNLL of the 95 % interval: the χ²₁ quantile at 0.95 (commons-math: 3.8414588...). */
    public static final double LEVEL_95 = 3.841458820694124;

    /** Relative step growth while bracketing a crossing. */
    private static final double GROWTH = 1.6;
    private static final int MAX_BRACKET_STEPS = 40;
    /** 2ΔNLL accuracy of a crossing: well below the 1e-6 a check asks, above the fits' own ~1e-8. */
    private static final double LEVEL_ACCURACY = 1e-8;
    private static final int MAX_SOLVER_EVALUATIONS = 100;

    /**
     * One profiled point. nllAboveMin is relative to the best fit's −ln L (NaN when the refit did
     * not converge; status says so).
     */
    public record Point(double value, double nll, double nllAboveMin, MinimumStatus status) { }

    /**
     * An interval [low, high] at one level; an end is NaN when the profile stays below the level up
     * to the parameter's range, or when a refit failed ({@code failure} non-null then).
     */
    public record Interval(double level, double low, double high, MinimumStatus failure) { }

    private final CompiledModel m;
    private final DataSet data;
    private final FitSettings settings;
    private final int[] held;
    private final double[] heldValues;
    private final FitResult best;
    private final int dim;
    private final Refits refits;

    /**
     * @param best the converged best fit of the same data with the same held parameters
     * @throws IllegalArgumentException when the best fit did not converge
     */
    public ProfileScan(CompiledModel m, DataSet data, FitSettings settings, int[] held, double[] heldValues,
                       FitResult best) {
        if (!best.converged()) throw new IllegalArgumentException("a profile needs a converged best fit, got " + best.status());
        this.m = m;
        this.data = data;
        this.settings = settings;
        this.held = held.clone();
        this.heldValues = heldValues.clone();
        this.best = best;
        Fitter probe = new Fitter(m, data, settings, held, heldValues);
        this.dim = probe.dimension();
        // No full covariance: a scanned γ of the profiled layout starts from the best fit with only γ moved.
        this.refits = new Refits(m, best, dim, null);
    }

    /** @param best the converged best fit of the problem */
    public ProfileScan(Problem p, FitResult best) {
        this(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues(), best);
    }

    /**
     * The default scan range of parameter k: the best fit ± {@value #DEFAULT_HALF_WIDTH} post-fit
     * errors (covers the 95 % interval of a Gaussian profile with room), or ± 10 % of the value
     * (at least 1e-3) when the error is unknown, clipped to the parameter's range.
     */
    public static double[] defaultRange(CompiledModel m, FitResult best, int k) {
        double v = best.values()[k], e = best.errors()[k];
        double half = DEFAULT_HALF_WIDTH * (e > 0 && Double.isFinite(e) ? e : Math.max(1e-3, 0.1 * Math.abs(v)));
        return new double[] {Math.max(m.lower(k), v - half), Math.min(m.upper(k), v + half)};
    }

    /** Default half-width of a scan, in post-fit errors. */
    public static final double DEFAULT_HALF_WIDTH = 3;

    /**
     * The points with ΔNLL measured from the lowest −ln L found: the best fit's, unless a scan
     * point found a lower one (a sign the best fit missed the global minimum). Failed points stay NaN.
     */
    public static List<Point> rebased(List<Point> points) {
        double floor = 0;
        for (Point x : points) if (x.nllAboveMin() < floor) floor = x.nllAboveMin();
        if (floor == 0) return List.copyOf(points);
        List<Point> out = new java.util.ArrayList<>(points.size());
        for (Point x : points) out.add(new Point(x.value(), x.nll(), x.nllAboveMin() - floor, x.status()));
        return List.copyOf(out);
    }

    private Fitter newFitter() {
        return Fitter.valuesOnly(m, data, Refits.refitSettings(settings), held, heldValues);
    }

    private void checkParameter(int k) {
        if (k < 0 || k >= m.nAll()) throw new IllegalArgumentException("no parameter " + k);
        if (best.held()[k]) throw new IllegalArgumentException(m.parameterNames(k) + " is held in the fit; it cannot be scanned");
    }

    /** The profiled −ln L with parameter k held at value (clipped to its range). */
    public Point profile(Fitter fitter, int k, double value) {
        double v = refits.clip(k, value);
        FitResult r = refits.refit(fitter, k, v);
        double nll = r.converged() ? r.nll() : Double.NaN;
        return new Point(v, nll, nll - best.nll(), r.status());
    }

    /**
     * Profiled points at {@code count} evenly spaced values from {@code from} to {@code to}
     * (inclusive; clipped to the range), in parallel.
     *
     * @param progress called with the number of finished points, or null
     */
    public List<Point> points(int k, double from, double to, int count, int threads, IntConsumer progress) {
        checkParameter(k);
        if (count < 2) throw new IllegalArgumentException("a scan needs at least 2 points, got " + count);
        return ParallelRunner.run(count, threads, this::newFitter,
                (fitter, i) -> profile(fitter, k, from + (to - from) * i / (count - 1)), progress);
    }

    /**
     * The intervals of parameter k at the given 2ΔNLL levels; the 2·levels crossings are found in
     * parallel, each by bracketing outward from the best fit and Brent's method on the profile.
     */
    public List<Interval> intervals(int k, double[] levels, int threads) {
        checkParameter(k);
        List<Crossing> ends = ParallelRunner.run(2 * levels.length, threads, this::newFitter,
                (fitter, t) -> crossing(fitter, k, levels[t / 2], t % 2 == 0 ? -1 : 1), null);
        List<Interval> out = new ArrayList<>(levels.length);
        for (int l = 0; l < levels.length; l++) {
            Crossing lo = ends.get(2 * l), hi = ends.get(2 * l + 1);
            out.add(new Interval(levels[l], lo.value(), hi.value(), lo.failure() != null ? lo.failure() : hi.failure()));
        }
        return out;
    }

    /** One end of an interval: NaN when not reached or when a refit failed (failure non-null). */
    private record Crossing(double value, MinimumStatus failure) { }

    /** Where 2ΔNLL crosses {@code level} on one side ({@code side} = ±1) of the best fit. */
    private Crossing crossing(Fitter fitter, int k, double level, int side) {
        double v0 = best.values()[k];
        double sigma = best.errors()[k];
        double bound = side < 0 ? m.lower(k) : m.upper(k);
        if (!(sigma > 0) || !Double.isFinite(sigma)) sigma = 1e-3 * Math.max(1, Math.abs(v0));
        if (Double.isFinite(bound) && Math.abs(bound - v0) > 0) sigma = Math.min(sigma, Math.abs(bound - v0));
        MinimumStatus[] failed = new MinimumStatus[1];
        java.util.function.DoubleUnaryOperator f = v -> {
            Point p = profile(fitter, k, v);
            if (!p.status().isMinimum()) {
                failed[0] = p.status();
                return Double.NaN;
            }
            return 2 * p.nllAboveMin() - level;
        };
        double step = sigma * Math.sqrt(level);
        double inside = v0, outside = Double.NaN;
        for (int i = 0; i < MAX_BRACKET_STEPS; i++) {
            if (v0 == bound) break;
            double v = v0 + side * step;
            boolean atBound = side < 0 ? v <= bound : v >= bound;
            if (atBound) v = bound;
            double fv = f.applyAsDouble(v);
            if (Double.isNaN(fv)) return new Crossing(Double.NaN, failed[0]);
            if (fv >= 0) {
                outside = v;
                break;
            }
            inside = v;
            if (atBound) break;
            step *= GROWTH;
        }
        if (Double.isNaN(outside)) return new Crossing(Double.NaN, null);
        // Brent's method (commons-math: a well-tested bracketing solver with superlinear
        // convergence); the function-value accuracy is what the intervals are judged by.
        BrentSolver solver = new BrentSolver(1e-14, 1e-12 * Math.max(sigma, 1e-300), LEVEL_ACCURACY);
        try {
            double root = solver.solve(MAX_SOLVER_EVALUATIONS, f::applyAsDouble,
                    Math.min(inside, outside), Math.max(inside, outside), 0.5 * (inside + outside));
            return failed[0] != null ? new Crossing(Double.NaN, failed[0]) : new Crossing(root, null);
        } catch (MathIllegalStateException | IllegalArgumentException e) {
            // Too many evaluations, or a NaN from a failed refit inside the bracket.
            return new Crossing(Double.NaN, failed[0] != null ? failed[0] : MinimumStatus.MAX_ITERATIONS);
        }
    }
}
