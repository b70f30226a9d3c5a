package plumb.engine.minimise;

import org.junit.jupiter.api.Test;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Newton with hinge steps on f(x) = ½ Σ_i w_i (x_i − c_i)² + Σ_e a_e·max(0, u_e + ∇u_eᵀx), built so
 * that a chosen x* is its minimum: three hinges pass through x* with multipliers t_e strictly inside
 * (0, 1), one is counted in full there (t = 1) and one lies clipped (t = 0); c then follows from the
 * optimality condition w∘(x* − c) + Σ_e t_e a_e ∇u_e = 0 (subgradient of a convex function, common
 * practice). f is strictly convex, so x* is its only minimum.
 */
class HingeStepTest {

    static final double[] X_STAR = {0.3, -0.2, 0.5, 0.1, -0.4, 0.2};
    static final double[] W = {2, 1, 3, 1.5, 0.8, 1.2};
    /** ∇u_e and the multiplier t_e at x* of each hinge; a_e. */
    static final double[][] NORMAL = {
            {1, 0.5, 0, 0, 0.2, 0},
            {0, 1, -0.7, 0, 0, 0.4},
            {0.3, 0, 0, 1, -0.5, 0},
            {0, 0.2, 0.4, 0, 1, 0},      // counted in full at x*
            {0.5, 0, 0, -0.3, 0, 1},     // clipped at x*
    };
    static final double[] T = {0.3, 0.6, 0.8, 1, 0};
    static final double[] SLOPE = {4, 6, 5, 2, 3};
    /** u_e + ∇u_eᵀx* of each hinge: on the kink for the first three. */
    static final double[] AT_STAR = {0, 0, 0, 0.7, -0.9};

    /** The hinge objective; with {@code showHinges} false it hides them (a plain Objective). */
    static final class Hinged implements HingedObjective {
        final double[] c = new double[X_STAR.length];
        final double[] offset = new double[NORMAL.length];
        int evaluations;

        Hinged() {
            int n = X_STAR.length;
            for (int i = 0; i < n; i++) {
                double s = 0;
                for (int e = 0; e < NORMAL.length; e++) s += T[e] * SLOPE[e] * NORMAL[e][i];
                c[i] = X_STAR[i] + s / W[i];
            }
            for (int e = 0; e < NORMAL.length; e++) offset[e] = AT_STAR[e] - dot(NORMAL[e], X_STAR);
        }

        double u(int e, double[] x) {
            return offset[e] + dot(NORMAL[e], x);
        }

        @Override
        public int dimension() {
            return X_STAR.length;
        }

        @Override
        public double value(double[] x) {
            return valueGradientHessian(x, new double[x.length], new double[x.length * x.length]);
        }

        @Override
        public double valueAndGradient(double[] x, double[] gradient) {
            return valueGradientHessian(x, gradient, new double[x.length * x.length]);
        }

        @Override
        public double valueGradientHessian(double[] x, double[] gradient, double[] hessian) {
            evaluations++;
            int n = x.length;
            Arrays.fill(hessian, 0);
            double f = 0;
            for (int i = 0; i < n; i++) {
                f += 0.5 * W[i] * (x[i] - c[i]) * (x[i] - c[i]);
                gradient[i] = W[i] * (x[i] - c[i]);
                hessian[i * n + i] = W[i];
            }
            for (int e = 0; e < NORMAL.length; e++) {
                double u = u(e, x);
                if (u >= 0) {
                    f += SLOPE[e] * u;
                    for (int i = 0; i < n; i++) gradient[i] += SLOPE[e] * NORMAL[e][i];
                }
            }
            return f;
        }

        @Override
        public void hingesAlong(double[] x, double[] d, Hinges out) {
            int n = x.length;
            int[] index = new int[n];
            for (int i = 0; i < n; i++) index[i] = i;
            for (int e = 0; e < NORMAL.length; e++) {
                double u = u(e, x);
                if ((u >= 0) != (u + dot(NORMAL[e], d) >= 0) && !out.contains(e)) {
                    out.add(e, u, SLOPE[e], index, NORMAL[e], n);
                }
            }
        }
    }

    /** The same function without its hinges made known. */
    static Objective hidden(Hinged h) {
        return new Objective() {
            public int dimension() { return h.dimension(); }
            public double value(double[] x) { return h.value(x); }
            public double valueAndGradient(double[] x, double[] g) { return h.valueAndGradient(x, g); }
            public double valueGradientHessian(double[] x, double[] g, double[] m) { return h.valueGradientHessian(x, g, m); }
        };
    }

    static double dot(double[] a, double[] b) {
        double s = 0;
        for (int i = 0; i < a.length; i++) s += a[i] * b[i];
        return s;
    }

    static MinimumResult minimise(Objective f, double[] start) {
        int n = start.length;
        double[] lo = new double[n], hi = new double[n];
        Arrays.fill(lo, -10);
        Arrays.fill(hi, 10);
        return new BoundedNewton(n).minimise(f, start, lo, hi, new boolean[n]);
    }

    @Test
    void stopsOnTheKinksAtTheKnownMinimum() {
        Hinged f = new Hinged();
        MinimumResult r = minimise(f, new double[] {2, 2, -2, 1, 1, -1});
        assertEquals(MinimumStatus.CONVERGED_AT_KINK, r.status());
        for (int i = 0; i < X_STAR.length; i++) assertEquals(X_STAR[i], r.x()[i], 1e-7, "x" + i);
        assertEquals(f.value(X_STAR), r.value(), 1e-12);
        assertTrue(r.decrement() < MinimiserOptions.defaults().tolerance(), "decrement " + r.decrement());
        assertTrue(r.iterations() <= 8, "iterations " + r.iterations());
    }

    @Test
    void withoutTheHingesNewtonNeedsFarMoreEvaluationsAndMissesThePoint() {
        Hinged f = new Hinged();
        MinimumResult r = minimise(hidden(f), new double[] {2, 2, -2, 1, 1, -1});
        Hinged g = new Hinged();
        MinimumResult withHinges = minimise(g, new double[] {2, 2, -2, 1, 1, -1});
        assertFalse(r.converged() && maxDistance(r.x()) < 1e-7, r.status() + " at distance " + maxDistance(r.x()));
        assertTrue(f.evaluations > 3 * g.evaluations, f.evaluations + " vs " + g.evaluations);
        assertTrue(withHinges.value() <= r.value() + 1e-12);
    }

    @Test
    void aStartOnTheKinksIsRecognisedAsTheMinimumAtOnce() {
        Hinged f = new Hinged();
        MinimumResult r = minimise(f, X_STAR.clone());
        assertEquals(MinimumStatus.CONVERGED_AT_KINK, r.status());
        assertEquals(0, r.iterations());
        assertEquals(0, maxDistance(r.x()), 1e-12);
    }

    @Test
    void theCovarianceComesFromTheHessianOfTheSideReached() {
        Hinged f = new Hinged();
        BoundedNewton newton = new BoundedNewton(X_STAR.length);
        double[] lo = new double[X_STAR.length], hi = new double[X_STAR.length];
        Arrays.fill(lo, -10);
        Arrays.fill(hi, 10);
        MinimumResult r = newton.minimise(f, new double[] {2, 2, -2, 1, 1, -1}, lo, hi, new boolean[X_STAR.length]);
        double[] fromFactor = newton.covariance(r);
        double[] plain = r.covariance();
        for (int i = 0; i < X_STAR.length; i++) assertEquals(1 / W[i], plain[i * X_STAR.length + i], 1e-15);
        assertEquals(Arrays.toString(plain), Arrays.toString(fromFactor));
    }

    private static double maxDistance(double[] x) {
        double d = 0;
        for (int i = 0; i < x.length; i++) d = Math.max(d, Math.abs(x[i] - X_STAR[i]));
        return d;
    }
}
