package plumb.engine.minimise;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import plumb.engine.minimise.TestObjectives.PoissonToy;
import plumb.engine.minimise.TestObjectives.Rosenbrock;

/**
 * BOBYQA (commons-math 3.6.1, derivative-free) as the independent check of the Newton and BFGS
 * minimisers: same minimum f to 1e-6 and best-fit values to 1e-4 (references.md item 11).
 */
class ReferenceMinimiserTest {

    record Case(String name, Objective objective, double[] start, double[] lower, double[] upper, boolean[] fixed) {
        @Override
        public String toString() {
            return name;
        }
    }

    static Stream<Arguments> cases() {
        double[] lo3 = {0, -5, -5};
        double[] hi3 = {10, 5, 5};
        return Stream.of(
                new Case("three bins", BoundedNewtonTest.threeBinToy(), new double[] {1, 0.5, 0.5}, lo3, hi3, null),
                new Case("three bins, signal fixed", BoundedNewtonTest.threeBinToy(), new double[] {2, 1, 1}, lo3, hi3,
                        new boolean[] {true, false, false}),
                new Case("one free variable", BoundedNewtonTest.threeBinToy(), new double[] {1, 1, 1}, lo3, hi3,
                        new boolean[] {true, false, true}),
                new Case("signal on its bound", new PoissonToy(new double[] {30, 41}, new double[] {4, 6},
                        new double[][] {{35, 45}}, new double[] {0.1}), new double[] {1, 1}, new double[] {0, -5},
                        new double[] {10, 5}, null),
                new Case("twelve bins, five nuisances", bigToy(), bigStart(), bigBound(-5, 0), bigBound(5, 10), null),
                new Case("Rosenbrock", new Rosenbrock(2), new double[] {-1.2, 1}, new double[] {-5, -5},
                        new double[] {5, 5}, null))
                .map(Arguments::of);
    }

    @ParameterizedTest
    @MethodSource("cases")
    void agreesWithNewtonAndBfgs(Case c) {
        int n = c.objective().dimension();
        MinimumResult reference = new ReferenceMinimiser(n).minimise(c.objective(), c.start(), c.lower(), c.upper(), c.fixed());
        MinimumResult newton = new BoundedNewton(n).minimise(c.objective(), c.start(), c.lower(), c.upper(), c.fixed());
        MinimumResult bfgs = new BoundedBfgs(n).minimise(c.objective(), c.start(), c.lower(), c.upper(), c.fixed());
        assertTrue(reference.converged(), reference.status().toString());
        assertTrue(newton.converged(), newton.status().toString());
        assertTrue(bfgs.converged(), bfgs.status().toString());
        // references.md item 11: f to 1e-6, best-fit values to 1e-4.
        assertEquals(reference.value(), newton.value(), 1e-6);
        assertEquals(reference.value(), bfgs.value(), 1e-6);
        for (int i = 0; i < n; i++) {
            assertEquals(reference.x()[i], newton.x()[i], 1e-4, "x" + i);
            assertEquals(reference.x()[i], bfgs.x()[i], 1e-4, "x" + i);
        }
        // Newton should never be worse than the reference by more than its stopping slack d/2.
        assertTrue(newton.value() <= reference.value() + 1e-8);
        // Errors from the exact Hessian at both minima agree (x agrees to 1e-4 σ or better).
        double[] refErrors = reference.errors();
        double[] newtonErrors = newton.errors();
        for (int i = 0; i < n; i++) {
            assertEquals(refErrors[i], newtonErrors[i], 1e-3 * refErrors[i] + 1e-12);
        }
    }

    @Test
    void matchesTheSingleBinClosedFormWithOneFreeVariable() {
        // μ̂ = (n − b)/s with θ fixed (references.md item 1); one free variable uses the dummy pairing.
        double n = 37;
        double s = 12.5;
        double b = 20;
        PoissonToy toy = new PoissonToy(new double[] {n}, new double[] {s}, new double[][] {{b}}, new double[] {0.1});
        MinimumResult r = new ReferenceMinimiser(2).minimise(toy, new double[] {1, 1}, new double[] {0, -5},
                new double[] {10, 5}, new boolean[] {false, true});
        assertTrue(r.converged(), r.status().toString());
        assertEquals((n - b) / s, r.x()[0], 1e-6); // radius stops at 1e-10·0.5: far inside 1e-6
        assertEquals(Math.sqrt(n) / s, r.errors()[0], 1e-6);
    }

    /** Twelve bins, signal peaked in the middle, five background components: 6 variables. */
    static PoissonToy bigToy() {
        SplittableRandom random = new SplittableRandom(314159);
        int bins = 12;
        double[] signal = new double[bins];
        double[][] beta = new double[5][bins];
        double[] counts = new double[bins];
        for (int b = 0; b < bins; b++) {
            signal[b] = 20 * Math.exp(-0.5 * (b - 6) * (b - 6) / 2.0);
            double total = signal[b];
            for (int k = 0; k < 5; k++) {
                beta[k][b] = random.nextDouble(5, 40);
                total += beta[k][b];
            }
            counts[b] = Math.round(total * random.nextDouble(0.85, 1.15));
        }
        return new PoissonToy(counts, signal, beta, new double[] {0.05, 0.1, 0.1, 0.2, 0.3});
    }

    static double[] bigStart() {
        double[] x = new double[6];
        Arrays.fill(x, 1.0);
        return x;
    }

    static double[] bigBound(double nuisance, double signal) {
        double[] v = new double[6];
        Arrays.fill(v, nuisance);
        v[0] = signal;
        return v;
    }
}
