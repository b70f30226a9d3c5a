package plumb.validation;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Fits of counting experiments against closed forms (docs/references.md, counting experiments). */
class CountingReferenceTest {

    private static FitResult fit(CompiledModel m, DataSet d, int hold, double value) {
        Fitter f = new Fitter(m, d, FitSettings.defaults());
        FitResult r = f.fit(f.nominalStart(), hold, value);
        assertTrue(r.converged(), r.status().toString());
        return r;
    }

    /** q0 = 2(−ln L(μ = 0) − min −ln L), from two fits. */
    private static double q0(CompiledModel m, DataSet d) {
        FitResult free = fit(m, d, -1, 0);
        FitResult zero = fit(m, d, m.poi(), 0);
        return 2 * (zero.nll() - free.nll());
    }

    /**
     * Single bin, known background: μ̂ = (n − b)/s and σ_μ = √n/s from the inverse Hessian.
     * references.md item 1 (elementary derivation, common practice).
     */
    @ParameterizedTest
    @CsvSource({"10,50,67", "3.5,12,9", "25,400,460", "1,0.5,4"})
    void singleBinEstimateAndError(double s, double b, double n) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, n, -100, 1000));
        FitResult r = fit(m, DataSet.observed(m), -1, 0);
        double sigma = Math.sqrt(n) / s;
        // tolerance: convergence at Newton decrement gᵀH⁻¹g < 1e-8 leaves |μ − μ̂| ≤ √(1e-8)·σ = 1e-4 σ
        assertEquals((n - b) / s, r.values()[m.poi()], 1e-4 * sigma);
        // the error is the Hessian's at the point reached: off by O(1e-4) relative at most for a Poisson bin
        assertEquals(sigma, r.errors()[m.poi()], 2e-4 * sigma);
    }

    /**
     * Median discovery significance on the Asimov data set at μ = 1, known b:
     * Z_A = √(2((s + b) ln(1 + s/b) − s)). Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554, eq. (97).
     */
    @ParameterizedTest
    @CsvSource({"5,20", "10,100", "2,1", "30,900", "0.8,0.1"})
    void asimovDiscoverySignificance(double s, double b) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, 0, 0, 100));
        DataSet asimov = DataSets.asimovAt(m, 1, new int[0], new double[0], false, FitSettings.defaults()).data();
        double expected = Math.sqrt(2 * ((s + b) * Math.log(1 + s / b) - s));
        assertEquals(expected, Math.sqrt(q0(m, asimov)), 1e-6 * expected);
    }

    /**
     * Observed on/off significance equals Li & Ma eq. (17) (T.-P. Li, Y.-Q. Ma, ApJ 272 (1983) 317),
     * with the background fitted from a control channel and, equally, from a Poisson constraint.
     */
    @ParameterizedTest
    @CsvSource({"140,300,0.3", "25,40,0.25", "1200,1000,1.0", "12,90,0.05"})
    void onOffSignificanceIsLiMa(double nOn, double nOff, double alpha) {
        double total = nOn + nOff;
        double liMa = Math.sqrt(2 * (nOn * Math.log((1 + alpha) / alpha * nOn / total)
                + nOff * Math.log((1 + alpha) * nOff / total)));
        for (Model model : new Model[] {CountingModels.onOffTwoChannels(nOn, nOff, alpha),
                CountingModels.onOffPoissonConstraint(nOn, nOff, alpha)}) {
            CompiledModel m = ModelCompiler.compile(model);
            assertEquals(liMa, Math.sqrt(q0(m, DataSet.observed(m))), 1e-6 * liMa, model.name());
        }
    }
}
