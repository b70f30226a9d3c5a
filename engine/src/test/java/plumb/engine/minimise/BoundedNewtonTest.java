package plumb.engine.minimise;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import plumb.engine.minimise.TestObjectives.Analytic;
import plumb.engine.minimise.TestObjectives.PoissonToy;
import plumb.engine.minimise.TestObjectives.Quadratic;
import plumb.engine.minimise.TestObjectives.Rosenbrock;

class BoundedNewtonTest {

    private static final double INF = Double.POSITIVE_INFINITY;

    private static double[] filled(int n, double v) {
        double[] a = new double[n];
        Arrays.fill(a, v);
        return a;
    }

    @Test
    void findsTheMinimumAndCovarianceOfAQuadratic() {
        // A = [[2, 1], [1, 2]]: A⁻¹ = (1/3)[[2, -1], [-1, 2]] (2×2 inverse by hand).
        Quadratic q = new Quadratic(new double[] {2, 1, 1, 2}, new double[] {0.7, -1.3}, 5.0);
        MinimumResult r = new BoundedNewton(2).minimise(q, new double[] {4, 4}, filled(2, -10), filled(2, 10));
        assertTrue(r.converged(), r.status().toString());
        // A quadratic is minimised exactly by one Newton step (definition of the Newton step).
        assertEquals(1, r.iterations());
        assertArrayEquals(q.m, r.x(), 1e-12);
        assertEquals(5.0, r.value(), 1e-12);
        assertArrayEquals(new double[] {2 / 3.0, -1 / 3.0, -1 / 3.0, 2 / 3.0}, r.covariance(), 1e-14);
        assertArrayEquals(new double[] {Math.sqrt(2 / 3.0), Math.sqrt(2 / 3.0)}, r.errors(), 1e-14);
        assertEquals(0.0, r.decrement(), 1e-20);
        assertEquals(q.calls(), r.evaluations()); // every call counted
    }

    @ParameterizedTest
    @ValueSource(ints = {2, 10})
    void reachesTheRosenbrockMinimum(int n) {
        Rosenbrock f = new Rosenbrock(n);
        // (−1.2, 1) is the customary 2-d start (from memory); in 10 dimensions a start near
        // x_0 = −1 can end in the chained function's local minimum near (−1, 1, …, 1) (from
        // memory), so start at 0 there.
        double[] start = n == 2 ? new double[] {-1.2, 1} : new double[n];
        MinimumResult r = new BoundedNewton(n).minimise(f, start, filled(n, -5), filled(n, 5));
        assertTrue(r.converged(), r.status().toString());
        // Minimum at (1, …, 1), f = 0 (from memory). A decrement d below the tolerance bounds the
        // distance to the minimum of the local quadratic: |Δx_i| ≤ √(d (H⁻¹)_ii) (Cauchy–Schwarz).
        double[] errors = r.errors();
        for (int i = 0; i < n; i++) {
            assertEquals(1.0, r.x()[i], 1.5 * Math.sqrt(1e-8) * errors[i] + 1e-12);
        }
        assertEquals(0.0, r.value(), 1e-8); // f − f_min ≈ d/2
        assertEquals(f.calls(), r.evaluations());
        assertTrue(r.evaluations() < 200, "evaluations " + r.evaluations());
    }

    @Test
    void holdsAVariableOnTheBoundWhereTheMinimumSits() {
        // f = (x − 3)² + (y + 1)² + x·y/2 on x ∈ [0, 2]: unconstrained minimum at x > 2; on the face
        // x = 2, ∂f/∂y = 0 gives y = −1 − x/4 = −1.5 and f = 1 + 0.25 − 1.5 = −0.25, with
        // ∂f/∂x = 2(x − 3) + y/2 = −2.75 < 0 pushing out (derived by hand).
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
        MinimumResult r = new BoundedNewton(2).minimise(f, new double[] {0.5, 0}, new double[] {0, -INF},
                new double[] {2, INF});
        assertTrue(r.converged(), r.status().toString());
        assertEquals(2.0, r.x()[0], 0.0); // exactly on the bound
        assertEquals(-1.5, r.x()[1], 1e-10);
        assertEquals(-0.25, r.value(), 1e-12);
        // Covariance includes the variable at the bound: inverse of [[2, .5], [.5, 2]], det 3.75.
        assertArrayEquals(new double[] {2 / 3.75, -0.5 / 3.75, -0.5 / 3.75, 2 / 3.75}, r.covariance(), 1e-14);
    }

    @Test
    void matchesTheSingleBinClosedForm() {
        // ν = μ s + b θ with θ fixed at 1: μ̂ = (n − b)/s, σ_μ = √n / s (references.md item 1).
        double n = 37;
        double s = 12.5;
        double b = 20;
        PoissonToy toy = new PoissonToy(new double[] {n}, new double[] {s}, new double[][] {{b}}, new double[] {0.1});
        MinimumResult r = new BoundedNewton(2).minimise(toy, new double[] {1, 1}, new double[] {0, -5},
                new double[] {10, 5}, new boolean[] {false, true});
        assertTrue(r.converged(), r.status().toString());
        double sigma = Math.sqrt(n) / s;
        // Decrement below 1e-8: |μ − μ̂| ≤ √1e-8 σ (Cauchy–Schwarz on the quadratic model).
        assertEquals((n - b) / s, r.x()[0], 1e-4 * sigma);
        // σ from the Hessian at the fitted point: off by O(|μ − μ̂|/μ̂) relative at most.
        assertEquals(sigma, r.errors()[0], 1e-4 * sigma);
        assertEquals(0.0, r.errors()[1], 0.0); // fixed: zero row and column
        assertEquals(1.0, r.x()[1], 0.0);
    }

    @Test
    void matchesTheSingleBinClosedFormWithAConstrainedBackground() {
        // θ free with Gaussian constraint width δ: the minimum has ν = n and θ = 1, so μ̂ = (n − b)/s
        // (item 1); inverting the 2×2 Hessian (1/n)∇ν∇νᵀ + diag(0, 1/δ²) by hand gives
        // σ_μ = √(n + b²δ²) / s.
        double n = 55;
        double s = 8;
        double b = 30;
        double delta = 0.2;
        PoissonToy toy = new PoissonToy(new double[] {n}, new double[] {s}, new double[][] {{b}}, new double[] {delta});
        MinimumResult r = new BoundedNewton(2).minimise(toy, new double[] {1, 1}, new double[] {0, -5},
                new double[] {10, 5});
        assertTrue(r.converged(), r.status().toString());
        double sigma = Math.sqrt(n + b * b * delta * delta) / s;
        // Tolerances as in the test above: decrement < 1e-8 puts μ within 1e-4 σ.
        assertEquals((n - b) / s, r.x()[0], 1e-4 * sigma);
        assertEquals(1.0, r.x()[1], 1e-4 * delta);
        assertEquals(sigma, r.errors()[0], 1e-4 * sigma);
    }

    @Test
    void fallsBackToMachinePrecisionWhenTheToleranceIsOutOfReach() {
        // A tolerance no double arithmetic reaches: the stop must come from f no longer changing
        // (decrement then above the tolerance but below the fallback one), at the same minimum as a
        // fit with the default tolerance (there |Δx_i| ≤ √1e-8 σ_i, Cauchy–Schwarz).
        double[] lower = {0, -5, -5};
        double[] upper = {10, 5, 5};
        MinimumResult reference = new BoundedNewton(3).minimise(threeBinToy(), new double[] {1, 0, 0}, lower, upper);
        MinimiserOptions options = MinimiserOptions.defaults().withTolerance(1e-300).withFallbackTolerance(1e-6);
        MinimumResult r = new BoundedNewton(3, options).minimise(threeBinToy(), new double[] {1, 0, 0}, lower, upper);
        assertTrue(r.converged(), r.status().toString());
        assertTrue(r.decrement() > 1e-300 && r.decrement() <= 1e-6, "decrement " + r.decrement());
        double[] errors = reference.errors();
        for (int i = 0; i < 3; i++) {
            assertEquals(reference.x()[i], r.x()[i], 1e-4 * errors[i]);
        }
        assertTrue(r.evaluations() < 40, "evaluations " + r.evaluations());
    }

    @Test
    void stopsTheSignalAtZeroWhenFewerEventsThanBackground() {
        // n < b: μ̂ = (n − b)/s < 0 (item 1), so with μ ∈ [0, 10] (the bounds of this test) the minimum is on μ = 0.
        PoissonToy toy = new PoissonToy(new double[] {12}, new double[] {5}, new double[][] {{20}}, new double[] {0.1});
        MinimumResult r = new BoundedNewton(2).minimise(toy, new double[] {2, 1}, new double[] {0, -5},
                new double[] {10, 5}, new boolean[] {false, true});
        assertTrue(r.converged(), r.status().toString());
        assertEquals(0.0, r.x()[0], 0.0);
        assertTrue(r.gradient()[0] > 0); // pushing outward: the bound is active
    }

    @Test
    void dampsAnIndefiniteHessianAtTheStart() {
        // f = (x² − 1)² + (y − x)²: minima 0 at ±(1, 1) (by inspection). At (0.1, 0) the Hessian
        // [[12x² − 2, −2], [−2, 2]] has a negative eigenvalue, so undamped Newton cannot be used.
        Analytic f = new Analytic(2) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                final double u = x[0] * x[0] - 1;
                g[0] = 4 * x[0] * u - 2 * (x[1] - x[0]);
                g[1] = 2 * (x[1] - x[0]);
                h[0] = 12 * x[0] * x[0] - 4 + 2;
                h[1] = -2;
                h[2] = -2;
                h[3] = 2;
                return u * u + (x[1] - x[0]) * (x[1] - x[0]);
            }
        };
        double[] start = {0.1, 0};
        double[] g = new double[2];
        double[] h = new double[4];
        f.compute(start, g, h);
        // Precondition checked with commons-math: the starting Hessian is indefinite.
        double[] eigen = new EigenDecomposition(new Array2DRowRealMatrix(new double[][] {{h[0], h[1]}, {h[2], h[3]}}))
                .getRealEigenvalues();
        assertTrue(Math.min(eigen[0], eigen[1]) < 0);
        MinimumResult r = new BoundedNewton(2).minimise(f, start, filled(2, -3), filled(2, 3));
        assertTrue(r.converged(), r.status().toString());
        assertEquals(0.0, r.value(), 1e-12);
        assertEquals(Math.abs(r.x()[0]), 1.0, 1e-6);
        assertEquals(r.x()[0], r.x()[1], 1e-6);
    }

    /**
     * f = (x² − 1)² + (y − x)² as a sum of squared residuals r = (x² − 1, y − x): its Gauss–Newton
     * form 2JᵀJ, J = [[2x, 0], [−1, 1]] (common practice), is positive semidefinite everywhere.
     */
    private static Analytic squaresWithCurvatureForm(int[] curvatureCalls) {
        return new Analytic(2) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                final double u = x[0] * x[0] - 1;
                g[0] = 4 * x[0] * u - 2 * (x[1] - x[0]);
                g[1] = 2 * (x[1] - x[0]);
                h[0] = 12 * x[0] * x[0] - 4 + 2;
                h[1] = -2;
                h[2] = -2;
                h[3] = 2;
                return u * u + (x[1] - x[0]) * (x[1] - x[0]);
            }

            @Override
            public double valueGradientCurvature(double[] x, double[] g, double[] c) {
                curvatureCalls[0]++;
                double f = compute(x, g, c);
                c[0] = 2 * (4 * x[0] * x[0] + 1);
                c[1] = -2;
                c[2] = -2;
                c[3] = 2;
                return f;
            }

            @Override
            int calls() {
                return super.calls() + curvatureCalls[0];
            }
        };
    }

    @Test
    void takesTheCurvatureFormWhereTheHessianIsIndefinite() {
        int[] curvatureCalls = {0};
        Analytic f = squaresWithCurvatureForm(curvatureCalls);
        MinimumResult r = new BoundedNewton(2).minimise(f, new double[] {0.1, 0}, filled(2, -3), filled(2, 3));
        assertTrue(r.converged(), r.status().toString());
        // Minima 0 at ±(1, 1) (by inspection).
        assertEquals(0.0, r.value(), 1e-10);
        assertEquals(1.0, Math.abs(r.x()[0]), 1e-6);
        assertEquals(r.x()[0], r.x()[1], 1e-6);
        assertTrue(curvatureCalls[0] > 0, "the indefinite start asks for the curvature form");
        // The result carries the exact Hessian at the minimum, not the curvature form.
        double[] g = new double[2];
        double[] h = new double[4];
        f.compute(r.x(), g, h);
        assertArrayEquals(h, r.hessian(), 0.0);
        assertEquals(f.calls(), r.evaluations());
    }

    @Test
    void neverAsksTheCurvatureFormWhileTheHessianIsPositiveDefinite() {
        int[] curvatureCalls = {0};
        Analytic f = squaresWithCurvatureForm(curvatureCalls);
        // Near (1, 1) the Hessian [[12x² − 2, −2], [−2, 2]] is positive definite: plain Newton.
        MinimumResult r = new BoundedNewton(2).minimise(f, new double[] {1.3, 0.8}, filled(2, -3), filled(2, 3));
        assertTrue(r.converged(), r.status().toString());
        assertEquals(0, curvatureCalls[0]);
        assertArrayEquals(new double[] {1, 1}, r.x(), 1e-6);
    }

    @Test
    void reportsANonFiniteObjectiveWithoutThrowing() {
        Analytic f = new Analytic(3) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                Arrays.fill(g, Double.NaN);
                Arrays.fill(h, Double.NaN);
                return Double.NaN;
            }
        };
        MinimumResult r = new BoundedNewton(3).minimise(f, new double[3], filled(3, -1), filled(3, 1));
        assertEquals(MinimumStatus.NON_FINITE, r.status());
        assertFalse(r.converged());
        assertNull(r.covariance());
        assertEquals(2, r.evaluations()); // the start, then the restart point
    }

    @Test
    void backsOffFromRegionsWhereTheObjectiveIsUndefined() {
        // f = x − 2 ln x, NaN for x ≤ 0: minimum at x = 2, f'' = 1/2 there (calculus). From x = 5 the
        // first Newton step lands at x = −2.5, where f is NaN.
        Analytic f = new Analytic(1) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                if (!(x[0] > 0)) {
                    return Double.NaN;
                }
                g[0] = 1 - 2 / x[0];
                h[0] = 2 / (x[0] * x[0]);
                return x[0] - 2 * Math.log(x[0]);
            }
        };
        MinimumResult r = new BoundedNewton(1).minimise(f, new double[] {5}, new double[] {-10}, new double[] {10});
        assertTrue(r.converged(), r.status().toString());
        assertEquals(2.0, r.x()[0], 1e-6);
        assertEquals(Math.sqrt(2), r.errors()[0], 1e-5);
    }

    @Test
    void neverMovesFixedVariables() {
        // Conditional minimum of a quadratic with x1 held at t: x_F = m_F − A_FF⁻¹ A_F1 (t − m_1)
        // (Gaussian conditioning, common practice). A = [[4,1,0.5],[1,3,0.2],[0.5,0.2,2]].
        double[] a = {4, 1, 0.5, 1, 3, 0.2, 0.5, 0.2, 2};
        double[] m = {1, 2, 3};
        Quadratic q = new Quadratic(a, m, 0);
        double t = 2.75;
        MinimumResult r = new BoundedNewton(3).minimise(q, new double[] {0, t, 0}, filled(3, -10), filled(3, 10),
                new boolean[] {false, true, false});
        assertTrue(r.converged());
        assertEquals(t, r.x()[1], 0.0);
        // A_FF = [[4, 0.5], [0.5, 2]], det 7.75; rhs A_F1 (t − m1) = (1, 0.2)·0.75.
        double r0 = 0.75;
        double r2 = 0.15;
        assertEquals(1 - (2 * r0 - 0.5 * r2) / 7.75, r.x()[0], 1e-12);
        assertEquals(3 - (-0.5 * r0 + 4 * r2) / 7.75, r.x()[2], 1e-12);
        double[] cov = r.covariance();
        assertEquals(2 / 7.75, cov[0], 1e-14);
        assertEquals(4 / 7.75, cov[8], 1e-14);
        for (int i = 0; i < 3; i++) {
            assertEquals(0.0, cov[3 + i], 0.0);
            assertEquals(0.0, cov[3 * i + 1], 0.0);
        }
        assertTrue(r.fixed()[1]);
    }

    @Test
    void warmStartsFromTheMinimumWithinTwoIterations() {
        PoissonToy toy = threeBinToy();
        BoundedNewton newton = new BoundedNewton(3);
        double[] lower = {0, -5, -5};
        double[] upper = {10, 5, 5};
        MinimumResult best = newton.minimise(toy, new double[] {1, 0, 0}, lower, upper);
        assertTrue(best.converged());
        MinimumResult again = newton.minimise(toy, best.x(), lower, upper);
        assertTrue(again.converged());
        assertTrue(again.iterations() <= 2, "iterations " + again.iterations());
        assertArrayEquals(best.x(), again.x(), 1e-6);
        // A refit with one nuisance held one error away, started from the best fit (docs/engine.md
        // section 5): two or three steps.
        double[] start = best.x().clone();
        start[1] += best.errors()[1];
        MinimumResult moved = newton.minimise(toy, start, lower, upper, new boolean[] {false, true, false});
        assertTrue(moved.converged());
        assertTrue(moved.iterations() <= 3, "iterations " + moved.iterations());
    }

    @Test
    void reportsANegativeCurvatureBoundMinimum() {
        // f = x² − y² on y ∈ [−1, 1]: minimum at x = 0, y = ±1 on a bound, where the Hessian over
        // the non-fixed variables, diag(2, −2), is not positive definite (by inspection).
        Analytic f = new Analytic(2) {
            @Override
            double compute(double[] x, double[] g, double[] h) {
                g[0] = 2 * x[0];
                g[1] = -2 * x[1];
                h[0] = 2;
                h[1] = 0;
                h[2] = 0;
                h[3] = -2;
                return x[0] * x[0] - x[1] * x[1];
            }
        };
        MinimumResult r = new BoundedNewton(2).minimise(f, new double[] {0.5, 0.3}, filled(2, -1), filled(2, 1));
        assertEquals(MinimumStatus.NOT_POSITIVE_DEFINITE_AT_MINIMUM, r.status());
        assertEquals(0.0, r.x()[0], 1e-8);
        assertEquals(1.0, r.x()[1], 0.0);
        assertNull(r.covariance());
    }

    @Test
    void restartsOnceThenReportsTheIterationLimit() {
        Rosenbrock f = new Rosenbrock(2);
        MinimiserOptions options = MinimiserOptions.defaults().withMaxIterations(3);
        MinimumResult r = new BoundedNewton(2, options).minimise(f, new double[] {-1.2, 1}, filled(2, -5), filled(2, 5));
        assertEquals(MinimumStatus.MAX_ITERATIONS, r.status());
        assertEquals(6, r.iterations()); // two attempts of three steps
        MinimumResult once = new BoundedNewton(2, options.withRestart(false))
                .minimise(f, new double[] {-1.2, 1}, filled(2, -5), filled(2, 5));
        assertEquals(3, once.iterations());
        assertTrue(r.value() <= once.value()); // the better of the two attempts is returned
    }

    @Test
    void stopsAtTheEvaluationLimit() {
        Rosenbrock f = new Rosenbrock(2);
        MinimumResult r = new BoundedNewton(2, MinimiserOptions.defaults().withMaxEvaluations(5))
                .minimise(f, new double[] {-1.2, 1}, filled(2, -5), filled(2, 5));
        assertEquals(MinimumStatus.MAX_EVALUATIONS, r.status());
        assertEquals(5, r.evaluations());
        assertEquals(5, f.calls());
    }

    @Test
    void rejectsBadArguments() {
        BoundedNewton newton = new BoundedNewton(2);
        Quadratic q = new Quadratic(new double[] {1, 0, 0, 1}, new double[] {0, 0}, 0);
        assertThrows(IllegalArgumentException.class,
                () -> newton.minimise(q, new double[3], filled(2, -1), filled(2, 1)));
        assertThrows(IllegalArgumentException.class,
                () -> newton.minimise(q, new double[2], filled(2, 1), filled(2, -1)));
        assertThrows(IllegalArgumentException.class,
                () -> newton.minimise(q, new double[] {Double.NaN, 0}, filled(2, -1), filled(2, 1)));
        assertThrows(IllegalArgumentException.class,
                () -> new BoundedNewton(3).minimise(q, new double[3], filled(3, -1), filled(3, 1)));
        assertThrows(IllegalArgumentException.class, () -> MinimiserOptions.defaults().withTolerance(0));
        assertThrows(IllegalArgumentException.class, () -> MinimiserOptions.defaults().withMaxIterations(0));
    }

    /** Three bins, signal plus two background components each with a 10 % / 20 % constraint. */
    @Test
    void givesTheCovarianceFromItsLastFactorWithTheSameNumbers() {
        // The factor the convergence test leaves is that of the Hessian over the not-held
        // variables at the minimum, so its inverse must equal MinimumResult.covariance() bit for bit.
        BoundedNewton newton = new BoundedNewton(3);
        PoissonToy toy = threeBinToy();
        MinimumResult r = newton.minimise(toy, new double[] {1, 0, 0}, filled(3, -5), filled(3, 5));
        assertTrue(r.converged(), r.status().toString());
        assertArrayEquals(r.covariance(), newton.covariance(r));
        // A held variable: zero row and column, as in MinimumResult.covariance().
        MinimumResult held = newton.minimise(toy, new double[] {1, 0.3, 0}, filled(3, -5), filled(3, 5),
                new boolean[] {false, true, false});
        assertTrue(held.converged(), held.status().toString());
        assertEquals(0.0, held.covariance()[4]);
        assertArrayEquals(held.covariance(), newton.covariance(held));
        // Only for the last result: the factor of the earlier fit is gone.
        assertNull(newton.covariance(r));
    }

    @Test
    void givesTheCovarianceAlsoWhenTheMinimumLiesOnABound() {
        // More background than data: the signal strength ends on its lower bound 0 and leaves the
        // free set, so the check factors the not-held set once more; that factor gives the covariance.
        PoissonToy toy = new PoissonToy(new double[] {20, 25, 18}, new double[] {6, 14, 5},
                new double[][] {{30, 40, 25}, {10, 20, 12}}, new double[] {0.1, 0.2});
        BoundedNewton newton = new BoundedNewton(3);
        MinimumResult r = newton.minimise(toy, new double[] {1, 0, 0}, new double[] {0, -5, -5}, filled(3, 5));
        assertTrue(r.converged(), r.status().toString());
        assertEquals(0.0, r.x()[0]);
        assertTrue(r.covariance()[0] > 0);
        assertArrayEquals(r.covariance(), newton.covariance(r));
    }

    static PoissonToy threeBinToy() {
        return new PoissonToy(new double[] {52, 81, 40}, new double[] {6, 14, 5},
                new double[][] {{30, 40, 25}, {10, 20, 12}}, new double[] {0.1, 0.2});
    }
}
