package plumb.validation;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.Contour;
import plumb.engine.inference.Problem;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

/** Two-parameter profile-likelihood contours against the covariance ellipse of a linear Gaussian model. */
class ContourReferenceTest {

    private static final int BINS = 6;

    /**
     * The levels are the χ² quantiles of two degrees of freedom: 2.30 and 5.99 (PDG Review of
     * Particle Physics, Statistics chapter; references.md item 14).
     */
    @Test
    void levelsAreTheTwoDegreeOfFreedomQuantiles() {
        assertEquals(2.2957, Contour.level(Contour.DEFAULT_CLS[0]), 1e-4);
        assertEquals(5.9915, Contour.level(Contour.DEFAULT_CLS[1]), 1e-4);
    }

    /**
     * Linear model, Gaussian constraints, yields ~1e10 (Poisson = Gaussian to ~1e-5 over the
     * region): −ln L is quadratic, so every contour point p satisfies (p − p̂)ᵀ Σ₂⁻¹ (p − p̂) = level,
     * Σ₂ the pair's block of the generalised least-squares covariance (XᵀWX + P)⁻¹, W = diag(1/n),
     * computed with commons-math (references.md items 10 and 14; common practice). Tolerance 1e-4.
     */
    @Test
    void linearGaussianContourIsTheCovarianceEllipse() {
        double[] s = new double[BINS], b = new double[BINS], n = new double[BINS];
        double[][] effects = new double[3][BINS];
        for (int i = 0; i < BINS; i++) {
            b[i] = 1e10 * (1 + 0.2 * i);
            s[i] = 2e7 * Math.exp(-0.5 * (i - 2.5) * (i - 2.5));
            effects[0][i] = 1.5e5;
            effects[1][i] = 1.2e5 * (i - 2.5) / 2.5;
            effects[2][i] = 1e5 * ((i % 2 == 0) ? 1 : -1) + 3e4;
            n[i] = b[i] + 1.3 * s[i] + 1e5 * Math.sin(1.7 * i + 0.3) + 0.4 * effects[1][i];
        }
        CompiledModel m = ModelCompiler.compile(LinearModels.channel(s, b, effects, n));
        Contour.Result c = Contour.compute(Problem.observed(m), "mu", "theta1", Contour.DEFAULT_CLS, 32, 2, null);

        int p = m.nParams();
        RealMatrix f = new Array2DRowRealMatrix(p, p);
        for (int a = 0; a < p; a++) {
            for (int d = 0; d < p; d++) {
                double sum = a == d && a != m.indexOf("mu") ? 1 : 0;   // unit Gaussian constraints on the θ
                for (int i = 0; i < BINS; i++) sum += derivative(m, a, i, s, effects) * derivative(m, d, i, s, effects) / n[i];
                f.setEntry(a, d, sum);
            }
        }
        RealMatrix cov = new CholeskyDecomposition(f).getSolver().getInverse();
        int ix = m.indexOf("mu"), iy = m.indexOf("theta1");
        RealMatrix pair = new Array2DRowRealMatrix(new double[][] {
                {cov.getEntry(ix, ix), cov.getEntry(ix, iy)}, {cov.getEntry(iy, ix), cov.getEntry(iy, iy)}});
        RealMatrix inv = new CholeskyDecomposition(pair).getSolver().getInverse();
        assertEquals(Math.sqrt(cov.getEntry(ix, ix)), c.xError(), 1e-4 * c.xError());
        for (Contour.Region r : c.regions()) {
            assertEquals(0, r.failed());
            for (int k = 0; k < r.x().length; k++) {
                assertFalse(r.open()[k]);
                double dx = r.x()[k] - c.xBest(), dy = r.y()[k] - c.yBest();
                double q = dx * dx * inv.getEntry(0, 0) + 2 * dx * dy * inv.getEntry(0, 1) + dy * dy * inv.getEntry(1, 1);
                assertEquals(r.level(), q, 1e-4 * r.level(), "ray " + k + " of " + r.cl());
            }
        }
    }

    private static double derivative(CompiledModel m, int param, int bin, double[] s, double[][] effects) {
        if (param == m.indexOf("mu")) return s[bin];
        for (int e = 0; e < effects.length; e++) if (param == m.indexOf("theta" + e)) return effects[e][bin];
        return 0;
    }
}
