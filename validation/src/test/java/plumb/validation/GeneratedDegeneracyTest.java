package plumb.validation;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.models.SyntheticModels;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The generated models' weakest direction is a property of the model, not of where the fit
 * stopped: the free background factor k_bkg1 against the global normalisation variations that
 * scale the same sample (the data fix their product; only the variations' constraints fix the
 * split). The fit's check (a power iteration) is compared with commons-math's eigen decomposition
 * of two matrices: the correlation matrix from the Hessian at the fit's end point (same numbers,
 * so to 1e-6), and the one from the expected Fisher information Σ_b ∇ν_b∇ν_bᵀ/ν_b (Cowan,
 * Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554, section 3.2) built here from central differences
 * of the expected counts alone, the per-bin γ eliminated by hand (block elimination: common
 * practice). Observed and expected information differ by the data's fluctuation, so to 15 %.
 */
class GeneratedDegeneracyTest {

    @Test
    void theWeakestDirectionOfAGeneratedModelIsItsBackgroundFactorAgainstTheGlobalNormalisations() {
        CompiledModel m = ModelCompiler.compile(SyntheticModels.generate(10, 100, 8, 400, 1));
        FitResult r = new Fitter(m, DataSet.observed(m), FitSettings.defaults()).fit();
        assertTrue(r.converged(), r.status().toString());
        double check = r.checks().smallestEigenvalue();
        int n = m.nParams();
        double[] x = r.values();

        double[] h = new double[n * n];
        new BinnedNll(m, DataSet.observed(m)).valueGradientHessian(Arrays.copyOf(x, n), new double[n], h);
        double[][] hessian = new double[n][n];
        for (int i = 0; i < n; i++) hessian[i] = Arrays.copyOfRange(h, i * n, (i + 1) * n);
        Weakest observed = weakest(m, hessian);
        // reference: commons-math EigenDecomposition of the same correlation matrix
        assertEquals(observed.value, check, 1e-6 * observed.value, "the check's power iteration");

        // reference: the expected Fisher information (Cowan et al., section 3.2), eigenvalues by commons-math
        Weakest expected = weakest(m, expectedInformation(m, x));
        assertEquals(expected.value, check, 0.15 * expected.value, "expected against observed information");
        for (Weakest w : new Weakest[] {observed, expected}) {
            double factor = 0, global = 0;
            for (int i = 0; i < n; i++) {
                String name = m.parameterNames(i);
                if (name.startsWith("k_bkg")) factor += w.shares[i];
                if (name.startsWith("glob_")) global += w.shares[i];
            }
            assertTrue(w.shares[m.indexOf("k_bkg1")] > 0.03, "k_bkg1's share " + w.shares[m.indexOf("k_bkg1")]);
            assertTrue(factor + global > 0.85, "factors " + factor + " globals " + global);
        }
    }

    /**
     * Smallest eigenvalue of the free parameters' correlation matrix, and each parameter's share
     * (squared component) of its eigenvector.
     */
    private record Weakest(double value, double[] shares) { }

    private static Weakest weakest(CompiledModel m, double[][] information) {
        int n = m.nParams();
        int[] free = new int[n];
        int k = 0;
        for (int i = 0; i < n; i++) if (!m.fixed(i)) free[k++] = i;
        RealMatrix h = new Array2DRowRealMatrix(k, k);
        for (int a = 0; a < k; a++) for (int b = 0; b < k; b++) h.setEntry(a, b, information[free[a]][free[b]]);
        RealMatrix v = new CholeskyDecomposition(h, 1e-12, 0).getSolver().getInverse();
        RealMatrix c = new Array2DRowRealMatrix(k, k);
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) {
                c.setEntry(a, b, v.getEntry(a, b) / Math.sqrt(v.getEntry(a, a) * v.getEntry(b, b)));
            }
        }
        EigenDecomposition e = new EigenDecomposition(c);
        double[] values = e.getRealEigenvalues();
        int min = 0;
        for (int a = 1; a < k; a++) if (values[a] < values[min]) min = a;
        RealVector u = e.getEigenvector(min);
        double[] shares = new double[n];
        for (int a = 0; a < k; a++) shares[free[a]] = u.getEntry(a) * u.getEntry(a);
        return new Weakest(values[min], shares);
    }

    /** Σ_b ∇ν_b∇ν_bᵀ/ν_b with each bin's γ eliminated, plus the constraints' curvature, at x (nAll). */
    private static double[][] expectedInformation(CompiledModel m, double[] x) {
        int n = m.nParams(), bins = m.nBins();
        BinnedNll yields = new BinnedNll(m, DataSet.observed(m), true);
        double[] nu = new double[bins], up = new double[bins], down = new double[bins];
        yields.expectedBins(x, nu);
        double[][] jacobian = new double[n][bins];
        double[] at = x.clone();
        for (int i = 0; i < n; i++) {
            if (m.fixed(i)) continue;
            double step = 1e-5 * Math.max(1, Math.abs(x[i]));
            at[i] = x[i] + step;
            yields.expectedBins(at, up);
            at[i] = x[i] - step;
            yields.expectedBins(at, down);
            at[i] = x[i];
            for (int b = 0; b < bins; b++) jacobian[i][b] = (up[b] - down[b]) / (2 * step);
        }
        // every γ moved at once: each scales its own bin only
        for (int g = n; g < m.nAll(); g++) at[g] = x[g] + 1e-5;
        yields.expectedBins(at, up);
        for (int g = n; g < m.nAll(); g++) at[g] = x[g] - 1e-5;
        yields.expectedBins(at, down);
        double[] weight = new double[bins];
        for (int b = 0; b < bins; b++) weight[b] = 1 / nu[b];
        for (int g = n; g < m.nAll(); g++) {
            int b = m.gammaBin(g - n);
            double dg = (up[b] - down[b]) / 2e-5, own = dg * dg / nu[b];
            double constraint = m.constraintType(g) == ConstraintType.GAUSSIAN ? 1 / (m.width(g) * m.width(g))
                    : m.tau(g) / x[g];
            weight[b] = (1 / nu[b]) * constraint / (own + constraint);
        }
        double[][] info = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j <= i; j++) {
                double s = 0;
                for (int b = 0; b < bins; b++) s += jacobian[i][b] * weight[b] * jacobian[j][b];
                info[i][j] = s;
                info[j][i] = s;
            }
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) info[i][i] += 1 / (m.width(i) * m.width(i));
        }
        return info;
    }
}
