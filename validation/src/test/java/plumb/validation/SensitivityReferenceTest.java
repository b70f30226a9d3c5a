package plumb.validation;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Impacts;
import plumb.engine.inference.Sensitivity;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The sensitivity ranking against the closed form of a linear Gaussian model: the Fisher
 * information of the Asimov data set is F = XᵀWX + P (X the derivatives of the bin expectations,
 * W = diag(1/ν_b), P the constraint curvatures 1/w²), the POI's variance (F⁻¹)_μμ; holding a
 * parameter removes its row and column before the inversion, scaling its width by k changes its
 * diagonal 1/w² into 1/(k w)² (references.md item 17, common practice, exact for a linear model;
 * generalised least squares computed here with commons-math).
 */
class SensitivityReferenceTest {

    private static final int BINS = 6;
    private static final double DELTA = 0.004;

    /**
     * Fast path, exact path (a fit to the changed model's Asimov set) and the closed form agree on
     * σ_μ to 1e-6 relative for every parameter, every group and MC statistics, removed and halved.
     * The expected limit and Z_A of the fast path (σ-scaling of the exact values) agree with the
     * exact recomputation to 2e-3: with s/√b ≈ 1 per bin the Poisson q0 and q̃μ are quadratic up to
     * O(s/b) ≈ 1e-3 (Cowan et al. 2011, eq. 97 against its expansion s/√b).
     */
    @Test
    void fastAndExactEqualGeneralisedLeastSquares() {
        double[] s = new double[BINS], b = new double[BINS];
        double[][] effects = new double[3][BINS];
        for (int i = 0; i < BINS; i++) {
            b[i] = 1e6 * (1 + 0.2 * i);
            s[i] = 1.5e3 * Math.exp(-0.5 * (i - 2.5) * (i - 2.5));
            effects[0][i] = 1.5e3;
            effects[1][i] = 1.2e3 * (i - 2.5) / 2.5;
            effects[2][i] = 1e3 * ((i % 2 == 0) ? 1 : -1) + 300;
        }
        Map<String, List<String>> groups = new LinkedHashMap<>();
        groups.put("detector", List.of("theta0", "theta2"));
        CompiledModel m = ModelCompiler.compile(LinearModels.blindedWithMcStat(s, b, effects, DELTA, groups));
        double[] scales = {0.5};
        Sensitivity.Result r = Sensitivity.compute(new Sensitivity.Request(m, new int[0], new double[0],
                FitSettings.defaults(), false, 0.95, scales, 100, 2), null);

        double sigma0 = Math.sqrt(closedFormVariance(m, s, b, effects, 0, List.of(), 1, false));
        double sigma1 = Math.sqrt(closedFormVariance(m, s, b, effects, 1, List.of(), 1, false));
        assertEquals(sigma0, r.sigma0(), 1e-6 * sigma0);
        assertEquals(sigma1, r.sigma1(), 1e-6 * sigma1);

        List<Sensitivity.Target> all = new ArrayList<>(r.parameters());
        all.addAll(r.groups());
        assertEquals(3 + 3, all.size(), "three parameters; detector, MC statistics, all systematics");
        for (Sensitivity.Target t : all) {
            List<String> names = new ArrayList<>();
            boolean gammas = false;
            for (int i : t.members()) {
                if (i < m.nParams()) names.add(m.parameterNames(i));
                else gammas = true;
            }
            for (Sensitivity.Variant v : t.variants()) {
                String what = t.name() + " at " + v.scale();
                double c0 = Math.sqrt(closedFormVariance(m, s, b, effects, 0, names, v.scale(), gammas));
                double c1 = Math.sqrt(closedFormVariance(m, s, b, effects, 1, names, v.scale(), gammas));
                assertEquals(c0, v.fastSigma0(), 1e-6 * c0, what);
                assertEquals(c1, v.fastSigma1(), 1e-6 * c1, what);
                assertNull(v.exactError(), what);
                assertEquals(c1, v.exactSigma1(), 1e-6 * c1, what);
                assertEquals(v.exactLimit(), v.fastLimit(), 2e-3 * v.exactLimit(), what);
                assertEquals(v.exactZ(), v.fastZ(), 2e-3 * v.exactZ(), what);
                assertTrue(v.fastSigma1() < sigma1, what + " narrows the POI's error");
            }
        }
        // Removing all systematics leaves the statistical error: σ² = 1/Σ s²/ν.
        Sensitivity.Target stat = all.stream().filter(t -> t.name().equals(Impacts.ALL_SYSTEMATICS)).findFirst()
                .orElseThrow();
        double info = 0;
        for (int i = 0; i < BINS; i++) info += s[i] * s[i] / (b[i] + s[i]);
        assertEquals(1 / Math.sqrt(info), stat.removed().fastSigma1(), 1e-6 / Math.sqrt(info));
        assertNotNull(r.groups().get(0));
        assertEquals(Impacts.ALL_SYSTEMATICS, r.groups().get(0).name(), "all systematics gain the most");
    }

    /**
     * (F⁻¹)_μμ of the model at the Asimov point μ = {@code mu}, θ = 0, γ = 1, with the named
     * parameters (and, with {@code gammas}, every γ) removed (k = 0) or their widths scaled by k.
     * Order of the matrix: the model's parameters, then one γ per bin.
     */
    private static double closedFormVariance(CompiledModel m, double[] s, double[] b, double[][] effects, double mu,
                                             List<String> names, double k, boolean gammas) {
        int n = m.nParams() + BINS;
        double[][] x = new double[BINS][n];
        for (int i = 0; i < BINS; i++) {
            x[i][m.indexOf("mu")] = s[i];
            for (int e = 0; e < effects.length; e++) x[i][m.indexOf("theta" + e)] = effects[e][i];
            x[i][m.nParams() + i] = b[i];                        // ∂ν/∂γ_i at γ = 1, θ = 0
        }
        double[] prior = new double[n];
        boolean[] removed = new boolean[n];
        for (int e = 0; e < effects.length; e++) {
            int j = m.indexOf("theta" + e);
            prior[j] = names.contains("theta" + e) ? scaled(1, k) : 1;
            removed[j] = names.contains("theta" + e) && k == 0;
        }
        for (int i = 0; i < BINS; i++) {
            prior[m.nParams() + i] = gammas ? scaled(1 / (DELTA * DELTA), k) : 1 / (DELTA * DELTA);
            removed[m.nParams() + i] = gammas && k == 0;
        }
        List<Integer> keep = new ArrayList<>();
        for (int j = 0; j < n; j++) if (!removed[j]) keep.add(j);
        RealMatrix f = new Array2DRowRealMatrix(keep.size(), keep.size());
        for (int a = 0; a < keep.size(); a++) {
            for (int c = 0; c < keep.size(); c++) {
                int ja = keep.get(a), jc = keep.get(c);
                double sum = ja == jc ? prior[ja] : 0;
                for (int i = 0; i < BINS; i++) sum += x[i][ja] * x[i][jc] / (b[i] + mu * s[i]);
                f.setEntry(a, c, sum);
            }
        }
        RealMatrix cov = new CholeskyDecomposition(f).getSolver().getInverse();
        int p = keep.indexOf(m.indexOf("mu"));
        return cov.getEntry(p, p);
    }

    /** A constraint curvature c with the width scaled by k: c/k² (k = 0: unused, the row is removed). */
    private static double scaled(double c, double k) {
        return k == 0 ? c : c / (k * k);
    }
}
