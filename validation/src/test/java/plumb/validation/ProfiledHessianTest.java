package plumb.validation;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.models.SyntheticModels;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The profiled Hessian (one fused rank-one term per bin where every sample carries MC statistics)
 * against the Schur complement H_θθ − H_θγ H_γγ⁻¹ H_γθ formed densely from the Hessian over all
 * parameters (block elimination of the γ: common practice; docs/engine.md section 1 for the closed-form γ).
 */
class ProfiledHessianTest {

    @ParameterizedTest
    @CsvSource({"1", "2"})
    void equalsTheDenseSchurComplement(long seed) {
        CompiledModel m = ModelCompiler.compile(SyntheticModels.generate(4, 12, 5, 20, seed));
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m));
        int n = m.nParams(), all = m.nAll();
        Random r = new Random(seed);
        double[] x = m.nominal();
        for (int i = 0; i < n; i++) {
            if (!m.fixed(i)) x[i] = Math.max(m.lower(i), Math.min(m.upper(i), x[i] + 0.3 * (r.nextDouble() - 0.5)));
        }
        double[] g = new double[n], h = new double[n * n];
        nll.valueGradientHessian(x, g, h);
        double[] full = new double[all * all];
        nll.fullHessian(x, full);
        double scale = 0;
        for (double v : h) scale = Math.max(scale, Math.abs(v));
        int interior = 0;
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double schur = full[i * all + j];
                for (int k = n; k < all; k++) {
                    double d = full[k * all + k];
                    if (d > 0) schur -= full[i * all + k] * full[k * all + j] / d;
                }
                assertEquals(schur, h[i * n + j], 1e-10 * scale, m.parameterNames(i) + "," + m.parameterNames(j));
            }
        }
        for (int k = n; k < all; k++) if (full[k * all + k] > 0) interior++;
        assertTrue(interior > 40, "the comparison covers the γ terms");
    }
}
