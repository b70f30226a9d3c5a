package plumb.engine.inference;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.exception.MathIllegalStateException;
import plumb.engine.compile.CompiledModel;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.function.IntConsumer;

/**
 * Two-parameter profile-likelihood regions: the curve where 2ΔNLL, with every other parameter
 * refitted, reaches the χ² quantile of two degrees of freedom (2.30 for 68.27 %, 5.99 for 95 %;
 * PDG Review of Particle Physics, Statistics chapter; quantiles from commons-math's
 * {@link ChiSquaredDistribution}). Each point is a root found along a ray from the best fit
 * (Brent's method), not read off a grid. Rays are spread evenly in the frame where the post-fit
 * covariance of the pair is the unit matrix, so the points are evenly spread along the curve
 * and a quadratic −ln L would put every root at the same distance √level.
 */
public final class Contour {

    private Contour() {
    }

    /** Confidence levels drawn by default: one standard deviation in one dimension (68.27 %) and 95 %. */
    public static final double[] DEFAULT_CLS = {0.6826894921370859, 0.95};

    /**
     * One region.
     *
     * @param cl     confidence level
     * @param level  2ΔNLL of its boundary
     * @param x      x of each ray's point, in ray order (angle ascending)
     * @param y      y of each point
     * @param open   the ray reached a parameter bound before the level: the point is on the bound
     * @param failed rays whose fits did not converge (their point is NaN)
     */
    public record Region(double cl, double level, double[] x, double[] y, boolean[] open, int failed) { }

    /**
     * @param xBest, yBest the best fit
     * @param xError, yError their errors from the best fit
     * @param correlation their correlation at the best fit
     */
    public record Result(String xName, String yName, double xBest, double yBest, double xError, double yError,
                         double correlation, double nllMin, List<Region> regions, int rays, int fits, double seconds) { }

    /** The 2ΔNLL of a region at confidence level {@code cl}: the χ²(2 dof) quantile. */
    public static double level(double cl) {
        return new ChiSquaredDistribution(null, 2).inverseCumulativeProbability(cl);
    }

    /**
     * @param cls      confidence levels, ascending
     * @param rays     points per region (at least 8)
     * @param progress called with the number of rays finished, or null
     * @throws IllegalArgumentException for a name that is not a free model parameter
     * @throws InferenceException when the best fit fails
     */
    public static Result compute(Problem p, String xName, String yName, double[] cls, int rays, int threads,
                                 IntConsumer progress) {
        long t0 = System.nanoTime();
        CompiledModel m = p.model();
        int ix = parameter(p, xName), iy = parameter(p, yName);
        if (ix == iy) throw new IllegalArgumentException("the two parameters of a contour must differ");
        if (rays < 8) throw new IllegalArgumentException("a contour needs at least 8 rays, got " + rays);
        double[] levels = new double[cls.length];
        for (int k = 0; k < cls.length; k++) {
            if (!(cls[k] > 0 && cls[k] < 1)) throw new IllegalArgumentException("confidence level " + cls[k]);
            levels[k] = level(cls[k]);
            if (k > 0 && !(levels[k] > levels[k - 1])) throw new IllegalArgumentException("confidence levels must ascend");
        }
        FitResult best = new Fitter(p).fit();
        if (!best.converged()) throw new InferenceException("the best fit did not converge (" + best.status() + ")");
        int nP = m.nParams();
        double sx = best.errors()[ix], sy = best.errors()[iy];
        double rho = best.correlation(ix, iy, nP);
        if (!(sx > 0 && sy > 0 && Double.isFinite(sx) && Double.isFinite(sy))) {
            throw new InferenceException("the best fit gives no errors for " + xName + " and " + yName);
        }
        if (!Double.isFinite(rho)) rho = 0;
        // Ray directions d = L (cos φ, sin φ) with L L^T the pair's covariance.
        double l11 = sx, l21 = rho * sy, l22 = sy * Math.sqrt(Math.max(1e-12, 1 - rho * rho));
        double[][] dirs = new double[rays][];
        for (int r = 0; r < rays; r++) {
            double phi = 2 * Math.PI * r / rays;
            dirs[r] = new double[] {l11 * Math.cos(phi), l21 * Math.cos(phi) + l22 * Math.sin(phi)};
        }
        List<RayResult> results = ParallelRunner.run(rays, threads, () -> Fitter.valuesOnly(p),
                (fitter, r) -> ray(fitter, m, best, ix, iy, dirs[r], levels), progress);
        List<Region> regions = new ArrayList<>();
        int fits = 1;
        for (RayResult rr : results) fits += rr.fits;
        for (int k = 0; k < levels.length; k++) {
            double[] xs = new double[rays], ys = new double[rays];
            boolean[] open = new boolean[rays];
            int failed = 0;
            for (int r = 0; r < rays; r++) {
                double t = results.get(r).t[k];
                open[r] = results.get(r).open[k];
                if (Double.isNaN(t)) failed++;
                xs[r] = best.values()[ix] + t * dirs[r][0];
                ys[r] = best.values()[iy] + t * dirs[r][1];
            }
            regions.add(new Region(cls[k], levels[k], xs, ys, open, failed));
        }
        return new Result(xName, yName, best.values()[ix], best.values()[iy], sx, sy, rho, best.nll(), regions, rays,
                fits, (System.nanoTime() - t0) * 1e-9);
    }

    private static int parameter(Problem p, String name) {
        CompiledModel m = p.model();
        int i = m.indexOf(name);
        if (i < 0) throw new IllegalArgumentException("the model has no parameter '" + name + "'");
        if (i >= m.nParams()) throw new IllegalArgumentException(name + " is an MC-statistics parameter; a contour takes model parameters");
        if (m.fixed(i) || p.holds(name)) throw new IllegalArgumentException(name + " is held; a contour needs two free parameters");
        return i;
    }

    /** Distance along one ray (in units of the direction) of each level, and whether it stopped at a bound. */
    private record RayResult(double[] t, boolean[] open, int fits) { }

    /** Relative accuracy of each root in t: far below what a figure or the 1e-4 check can see. */
    private static final double T_ACCURACY = 1e-7;

    private static RayResult ray(Fitter fitter, CompiledModel m, FitResult best, int ix, int iy, double[] d,
                                 double[] levels) {
        double x0 = best.values()[ix], y0 = best.values()[iy];
        double tMax = Double.POSITIVE_INFINITY;
        tMax = Math.min(tMax, reach(x0, d[0], m.lower(ix), m.upper(ix)));
        tMax = Math.min(tMax, reach(y0, d[1], m.lower(iy), m.upper(iy)));
        Along along = new Along(fitter, best, ix, iy, d);
        double[] ts = new double[levels.length];
        boolean[] open = new boolean[levels.length];
        double lo = 0, fLo = 0;
        for (int k = 0; k < levels.length; k++) {
            double level = levels[k];
            double guess = Math.min(tMax, Math.max(lo * 1.05, Math.sqrt(level)));
            double a = lo, b = guess;
            double fb = along.value(b);
            while (fb < level && b < tMax) {      // expand outwards
                a = b;
                fLo = fb;
                b = Math.min(tMax, b * 1.5);
                fb = along.value(b);
            }
            if (Double.isNaN(fb)) {
                Arrays.fill(ts, k, levels.length, Double.NaN);
                break;
            }
            if (fb < level) {                      // the bound comes first: the region is open there
                ts[k] = tMax;
                open[k] = true;
                lo = tMax;
                continue;
            }
            // a below the level, b above: Brent in between.
            final double target = level;
            try {
                BrentSolver solver = new BrentSolver(T_ACCURACY, 1e-3 * T_ACCURACY * b);
                ts[k] = solver.solve(100, t -> along.value(t) - target, a, b);
            } catch (MathIllegalStateException | org.apache.commons.math3.exception.NoBracketingException e) {
                ts[k] = Double.NaN;
            }
            if (Double.isNaN(ts[k]) || along.failed) {
                Arrays.fill(ts, k, levels.length, Double.NaN);
                break;
            }
            lo = ts[k];
        }
        return new RayResult(ts, open, along.fits);
    }

    /** Largest t ≥ 0 with v + t·d inside [lo, hi]. */
    private static double reach(double v, double d, double lo, double hi) {
        if (d > 0) return (hi - v) / d;
        if (d < 0) return (lo - v) / d;
        return Double.POSITIVE_INFINITY;
    }

    /**
     * 2ΔNLL along one ray, each refit started from the last one (the nearest point already fitted).
     * The value at a point is computed once: refits from other starts differ in the last digits,
     * which could otherwise undo a bracket that an endpoint's value established.
     */
    private static final class Along {
        private final Fitter fitter;
        private final FitResult best;
        private final int ix, iy;
        private final double[] d;
        private double[] start;
        int fits;
        boolean failed;

        Along(Fitter fitter, FitResult best, int ix, int iy, double[] d) {
            this.fitter = fitter;
            this.best = best;
            this.ix = ix;
            this.iy = iy;
            this.d = d;
            this.start = Arrays.copyOf(best.values(), fitter.dimension());
        }

        /** Values already computed on this ray: the solver sees the same endpoint values that bracketed the root. */
        private final java.util.HashMap<Double, Double> known = new java.util.HashMap<>();

        double value(double t) {
            Double v = known.get(t);
            if (v != null) return v;
            double f = fit(t);
            known.put(t, f);
            return f;
        }

        private double fit(double t) {
            double x = best.values()[ix] + t * d[0], y = best.values()[iy] + t * d[1];
            FitResult r = fitter.fit(start, new int[] {ix, iy}, new double[] {x, y});
            fits++;
            if (!r.converged()) {
                r = fitter.fit(fitter.nominalStart(), new int[] {ix, iy}, new double[] {x, y});
                fits++;
            }
            if (!r.converged()) {
                failed = true;
                return Double.NaN;
            }
            start = Arrays.copyOf(r.values(), fitter.dimension());
            return Math.max(0, 2 * (r.nll() - best.nll()));
        }
    }

    /** "68.3 %" for 0.6827. */
    public static String percent(double cl) {
        return String.format(Locale.ROOT, "%.3g %%", 100 * cl);
    }
}
