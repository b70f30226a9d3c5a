package plumb.engine.minimise;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import plumb.engine.minimise.TestObjectives.Analytic;
import plumb.engine.minimise.TestObjectives.PoissonToy;
import plumb.engine.minimise.TestObjectives.Quadratic;
import plumb.engine.minimise.TestObjectives.Rosenbrock;

class BoundedBfgsTest {

    private static double[] filled(int n, double v) {
        double[] a = new double[n];
        Arrays.fill(a, v);
        return a;
    }

    @Test
    void findsAQuadraticMinimumWithFewHessianCalls() {
        // A = [[4,1,0.5],[1,3,0.2],[0.5,0.2,2]], minimum at m (definition of the quadratic).
        Quadratic q = new Quadratic(new double[] {4, 1, 0.5, 1, 3, 0.2, 0.5, 0.2, 2}, new double[] {1, -2, 0.5}, 1);
        MinimumResult r = new BoundedBfgs(3).minimise(q, new double[] {-3, 3, 3}, filled(3, -10), filled(3, 10));
        assertTrue(r.converged(), r.status().toString());
        assertArrayEquals(q.m, r.x(), 1e-8);
        assertEquals(1.0, r.value(), 1e-12);
        // The covariance comes from the exact Hessian: A⁻¹, checked by A·C = I (definition).
        double[] c = r.covariance();
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                double s = 0;
                for (int k = 0; k < 3; k++) {
                    s += q.a[i * 3 + k] * c[k * 3 + j];
                }
                assertEquals(i == j ? 1 : 0, s, 1e-14);
            }
        }
        assertTrue(q.hessianCalls <= 2, "Hessian calls " + q.hessianCalls);
        assertEquals(q.calls(), r.evaluations());
    }

    @ParameterizedTest
    @ValueSource(ints = {2, 10})
    void reachesTheRosenbrockMinimumUsingGradientsOnly(int n) {
        Rosenbrock f = new Rosenbrock(n);
        double[] start = n == 2 ? new double[] {-1.2, 1} : new double[n]; // as in BoundedNewtonTest
        MinimumResult r = new BoundedBfgs(n).minimise(f, start, filled(n, -5), filled(n, 5));
        assertTrue(r.converged(), r.status().toString());
        // Minimum at (1, …, 1), f = 0 (from memory); |Δx_i| ≤ √(d (H⁻¹)_ii) with d < 1e-8.
        double[] errors = r.errors();
        for (int i = 0; i < n; i++) {
            assertEquals(1.0, r.x()[i], 1.5 * Math.sqrt(1e-8) * errors[i] + 1e-12);
        }
        assertEquals(0.0, r.value(), 1e-8);
        assertEquals(0, f.valueCalls); // gradients only in the iterations
        assertTrue(f.hessianCalls <= 4, "Hessian calls " + f.hessianCalls);
    }

    @Test
    void holdsAVariableOnTheBound() {
        // Same problem and hand derivation as BoundedNewtonTest.holdsAVariableOnTheBoundWhereTheMinimumSits.
        Analytic f = new Analytic(2) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                g[0] = 2 * (x[0] - 3) + 0.5 * x[1];
                g[1] = 2 * (x[1] + 1) + 0.5 * x[0];
                h[0] = 2;
                h[1] = 0.5;
                h[2] = 0.5;
                h[3] = 2;
                return (x[0] - 3) * (x[0] - 3) + (x[1] + 1) * (x[1] + 1) + 0.5 * x[0] * x[1];
            }
        };
        MinimumResult r = new BoundedBfgs(2).minimise(f, new double[] {0.5, 0}, new double[] {0, -5},
                new double[] {2, 5});
        assertTrue(r.converged(), r.status().toString());
        assertEquals(2.0, r.x()[0], 0.0);
        assertEquals(-1.5, r.x()[1], 1e-4);
        assertEquals(-0.25, r.value(), 1e-8);
    }

    @Test
    void agreesWithNewtonOnAPoissonLikelihoodWithAFixedNuisance() {
        PoissonToy toy = BoundedNewtonTest.threeBinToy();
        double[] lower = {0, -5, -5};
        double[] upper = {10, 5, 5};
        boolean[] fixed = {false, false, true};
        MinimumResult newton = new BoundedNewton(3).minimise(toy, new double[] {1, 0.5, 1.2}, lower, upper, fixed);
        MinimumResult bfgs = new BoundedBfgs(3).minimise(toy, new double[] {1, 0.5, 1.2}, lower, upper, fixed);
        assertTrue(bfgs.converged(), bfgs.status().toString());
        assertEquals(1.2, bfgs.x()[2], 0.0); // fixed: never moves
        // Both stop with decrement < 1e-8: each within √1e-8 σ of the minimum (Cauchy–Schwarz).
        double[] errors = newton.errors();
        for (int i = 0; i < 2; i++) {
            assertEquals(newton.x()[i], bfgs.x()[i], 2e-4 * errors[i]);
        }
        assertEquals(newton.value(), bfgs.value(), 1e-8);
    }

    @Test
    void reportsANonFiniteObjective() {
        Analytic f = new Analytic(2) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                Arrays.fill(g, Double.NaN);
                return Double.NaN;
            }
        };
        MinimumResult r = new BoundedBfgs(2).minimise(f, new double[2], filled(2, -1), filled(2, 1));
        assertEquals(MinimumStatus.NON_FINITE, r.status());
        assertEquals(2, r.evaluations()); // start and restart point
    }
}
