package plumb.validation;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.ProfileScan;
import plumb.engine.likelihood.DataSet;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Profile-likelihood intervals against Wilks' theorem (references.md item 7). */
class ProfileIntervalReferenceTest {

    /** 2ΔNLL of one Poisson bin ν = sμ + b with n observed, relative to its minimum at ν = n (closed form). */
    private static double twiceDeltaNll(double s, double b, double n, double mu) {
        double nu = s * mu + b;
        return 2 * (nu - n - n * Math.log(nu / n));
    }

    /**
     * Single Poisson bin, known background: the interval ends found by root-finding satisfy
     * 2ΔNLL = 1 (68 %) and = χ²₁ quantile at 0.95 (from commons-math) to 1e-6, evaluated with the
     * closed form above, independent of the engine. S. S. Wilks, Ann. Math. Stat. 9 (1938) 60.
     */
    @ParameterizedTest
    @CsvSource({"10,50,67", "3.5,12,9", "25,400,460", "1,0.5,4"})
    void singleBinEndsSitOnTheLevel(double s, double b, double n) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, n, -100, 1000));
        DataSet data = DataSet.observed(m);
        FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();
        assertTrue(best.converged());
        double q95 = new ChiSquaredDistribution(1).inverseCumulativeProbability(0.95);
        assertEquals(q95, ProfileScan.LEVEL_95, 1e-12);
        List<ProfileScan.Interval> iv = new ProfileScan(m, data, FitSettings.defaults(), new int[0], new double[0], best)
                .intervals(m.poi(), new double[] {ProfileScan.LEVEL_68, ProfileScan.LEVEL_95}, 2);
        for (ProfileScan.Interval i : iv) {
            assertNull(i.failure());
            assertTrue(i.low() < best.values()[m.poi()] && best.values()[m.poi()] < i.high());
            assertEquals(i.level(), twiceDeltaNll(s, b, n, i.low()), 1e-6);
            assertEquals(i.level(), twiceDeltaNll(s, b, n, i.high()), 1e-6);
        }
    }

    /**
     * A linear model with yields ~1e8 is Gaussian to O(1/√n): the profiled 68 % interval equals
     * the best fit ± the inverse-Hessian error, for the POI and for a nuisance parameter (Wilks;
     * exact for a quadratic −ln L). Tolerance 1e-3 σ: the Poisson skew shifts each end by ~σ²/(6ν)·s ≪ 1e-3 σ.
     */
    @Test
    void gaussianModelIntervalsEqualHessianErrors() {
        int bins = 5;
        double[] s = new double[bins], b = new double[bins], n = new double[bins];
        double[][] effects = new double[2][bins];
        for (int i = 0; i < bins; i++) {
            b[i] = 1e8 * (1 + 0.3 * i);
            s[i] = 3e4 * (1 + i);
            effects[0][i] = 1.2e4;
            effects[1][i] = 8e3 * (i - 2);
            n[i] = b[i] + 0.8 * s[i] + 1e4 * Math.cos(2.1 * i);
        }
        CompiledModel m = ModelCompiler.compile(LinearModels.channel(s, b, effects, n));
        DataSet data = DataSet.observed(m);
        FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();
        assertTrue(best.converged());
        ProfileScan scan = new ProfileScan(m, data, FitSettings.defaults(), new int[0], new double[0], best);
        for (int k : new int[] {m.poi(), m.indexOf("theta1")}) {
            ProfileScan.Interval iv = scan.intervals(k, new double[] {ProfileScan.LEVEL_68}, 2).get(0);
            double v = best.values()[k], e = best.errors()[k];
            assertEquals(v - e, iv.low(), 1e-3 * e, m.parameterNames(k));
            assertEquals(v + e, iv.high(), 1e-3 * e, m.parameterNames(k));
        }
        // and the scan points follow the parabola ((x − v)/σ)² / 2
        List<ProfileScan.Point> pts = scan.points(m.poi(), best.values()[m.poi()] - 2 * best.errors()[m.poi()],
                best.values()[m.poi()] + 2 * best.errors()[m.poi()], 5, 2, null);
        for (ProfileScan.Point p : pts) {
            double z = (p.value() - best.values()[m.poi()]) / best.errors()[m.poi()];
            assertEquals(0.5 * z * z, p.nllAboveMin(), 2e-3);
        }
    }
}
