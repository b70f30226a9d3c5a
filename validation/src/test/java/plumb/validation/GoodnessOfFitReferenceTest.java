package plumb.validation;

import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.GoodnessOfFit;
import plumb.engine.likelihood.DataSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Saturated-model goodness of fit: references.md item 8 (Baker, Cousins, NIM 221 (1984) 437). */
class GoodnessOfFitReferenceTest {

    /**
     * One bin with μ held: χ²_λ = 2[ν − n + n ln(n/ν)] (Baker–Cousins eq. for Poisson counts),
     * ndof = 1 bin − 0 free parameters, p = Q(½, χ²/2) (commons-math regularised gamma).
     */
    @ParameterizedTest
    @CsvSource({"10,50,67,1", "3.5,12,9,0.4", "2,1,0,1"})
    void singleBinWithPoiHeld(double s, double b, double n, double mu) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, n, 0, 100));
        GoodnessOfFit.Result r = GoodnessOfFit.compute(m, DataSet.observed(m), FitSettings.defaults(),
                new int[] {m.poi()}, new double[] {mu});
        double nu = mu * s + b;
        double expected = n > 0 ? 2 * (nu - n + n * Math.log(n / nu)) : 2 * nu;
        assertEquals(expected, r.statistic(), 1e-12 * Math.max(1, expected));
        assertEquals(1, r.ndof());
        assertEquals(Gamma.regularizedGammaQ(0.5, 0.5 * expected), r.p(), 1e-14);
    }

    /** With μ free a single bin is fitted exactly: statistic 0, ndof 0 and no p-value. */
    @Test
    void saturatedSingleBin() {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(10, 50, 67, 0, 100));
        GoodnessOfFit.Result r = GoodnessOfFit.compute(m, DataSet.observed(m), FitSettings.defaults(), new int[0],
                new double[0]);
        assertEquals(0, r.statistic(), 1e-7);
        assertEquals(0, r.ndof());
        assertTrue(Double.isNaN(r.p()));
    }

    /**
     * In toys the saturated statistic follows χ²(ndof): its mean lies within 3 standard errors of
     * ndof (Wilks / Baker–Cousins asymptotics, references.md items 7–8; counts ≥ ~50 per bin keep
     * the O(1/ν) bias far below the toy error). ndof = 2 × 12 bins − 2 free factors = 22: the
     * three Gaussian-constrained nuisances each bring an auxiliary measurement with them.
     */
    @Test
    void toyStatisticHasChiSquareMean() {
        CompiledModel m = ModelCompiler.compile(LimitModels.highCount(12));
        DataSet data = DataSet.observed(m);
        GoodnessOfFit.Result fit = GoodnessOfFit.compute(m, data, FitSettings.defaults(), new int[0], new double[0]);
        assertEquals(22, fit.ndof());
        int toys = LimitModels.full() ? 5_000 : 500;
        double[] t = GoodnessOfFit.toyStatistics(m, data, fit.fit().values(), FitSettings.defaults(), new int[0],
                new double[0], toys, 23, 2, null);
        double sum = 0, sum2 = 0;
        for (double v : t) {
            assertTrue(Double.isFinite(v), "a toy fit failed");
            sum += v;
            sum2 += v * v;
        }
        double mean = sum / toys, sd = Math.sqrt((sum2 - toys * mean * mean) / (toys - 1));
        assertEquals(fit.ndof(), mean, 3 * sd / Math.sqrt(toys), "mean " + mean + ", sd " + sd);
        // the χ²(22) width √44 ≈ 6.6: the spread must be of that size too (within 20 %, loose for 500 toys)
        assertEquals(Math.sqrt(2.0 * fit.ndof()), sd, 0.2 * Math.sqrt(2.0 * fit.ndof()));
    }
}
