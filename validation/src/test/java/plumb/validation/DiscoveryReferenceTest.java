package plumb.validation;

import org.apache.commons.math3.distribution.PoissonDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.ToyPValue;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The discovery test (q0, Z, p) against closed forms: references.md items 2–4. */
class DiscoveryReferenceTest {

    private static final int[] NONE = new int[0];
    private static final double[] NO_VALUES = new double[0];

    /**
     * Expected (Asimov, μ = 1) significance with known b: Z_A = √(2((s + b) ln(1 + s/b) − s)).
     * Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554, eq. (97).
     */
    @ParameterizedTest
    @CsvSource({"5,20", "10,100", "2,1", "30,900", "0.8,0.1", "150,40"})
    void asimovSignificanceIsEq97(double s, double b) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, 0, 0, 100));
        DataSet asimov = DataSets.asimovAt(m, 1, NONE, NO_VALUES, false, FitSettings.defaults()).data();
        Discovery.Significance r = Discovery.compute(m, asimov, FitSettings.defaults(), NONE, NO_VALUES);
        double za = Math.sqrt(2 * ((s + b) * Math.log(1 + s / b) - s));
        // 1e-6 relative: q0 comes from two minima, each within ~1e-9 of −ln L (Newton decrement 1e-8)
        assertEquals(za, r.z(), 1e-6 * za);
        // one-sided p = 1 − Φ(Z): Cowan et al. eq. (53), Φ from commons-math
        assertEquals(1 - new org.apache.commons.math3.distribution.NormalDistribution().cumulativeProbability(r.z()),
                r.p(), 1e-12);
    }

    /**
     * Observed on/off significance: Li & Ma eq. (17) (T.-P. Li, Y.-Q. Ma, ApJ 272 (1983) 317), for the
     * background from a control channel and from a Poisson-constrained factor.
     */
    @ParameterizedTest
    @CsvSource({"140,300,0.3", "25,40,0.25", "1200,1000,1.0", "12,90,0.05"})
    void observedOnOffSignificanceIsLiMa(double nOn, double nOff, double alpha) {
        double total = nOn + nOff;
        double liMa = Math.sqrt(2 * (nOn * Math.log((1 + alpha) / alpha * nOn / total)
                + nOff * Math.log((1 + alpha) * nOff / total)));
        for (Model model : new Model[] {CountingModels.onOffTwoChannels(nOn, nOff, alpha),
                CountingModels.onOffPoissonConstraint(nOn, nOff, alpha)}) {
            CompiledModel m = ModelCompiler.compile(model);
            Discovery.Significance r = Discovery.compute(m, DataSet.observed(m), FitSettings.defaults(), NONE, NO_VALUES);
            assertEquals(liMa, r.z(), 1e-6 * liMa, model.name());
        }
    }

    /**
     * Median significance with a background uncertainty σ_b from a Poisson auxiliary measurement:
     * Z_A = [2((s+b) ln[(s+b)(b+σ_b²)/(b² + (s+b)σ_b²)] − (b²/σ_b²) ln[1 + σ_b² s/(b(b+σ_b²))])]^½.
     * G. Cowan, "Discovery sensitivity for a counting experiment with background uncertainty" (2012);
     * references.md item 4. The background is b·k with k Poisson-constrained at relative width σ_b/b,
     * which is the on/off likelihood with τ = b/σ_b².
     */
    @ParameterizedTest
    @CsvSource({"10,50,5", "5,10,1", "40,400,40", "3,2,0.5", "20,100,30"})
    void asimovSignificanceWithBackgroundUncertainty(double s, double b, double sigmaB) {
        CompiledModel m = ModelCompiler.compile(LimitModels.poissonBackground(s, b, sigmaB));
        DataSet asimov = DataSets.asimovAt(m, 1, NONE, NO_VALUES, false, FitSettings.defaults()).data();
        Discovery.Significance r = Discovery.compute(m, asimov, FitSettings.defaults(), NONE, NO_VALUES);
        double v = sigmaB * sigmaB;
        double za = Math.sqrt(2 * ((s + b) * Math.log((s + b) * (b + v) / (b * b + (s + b) * v))
                - b * b / v * Math.log(1 + v * s / (b * (b + v)))));
        assertEquals(za, r.z(), 1e-6 * za);
    }

    /**
     * The toy p-value of q0 with known b equals the Poisson tail P(n ≥ n_obs | b), because q0 rises
     * with n above b (common practice: the definition of the p-value; tail from commons-math's
     * PoissonDistribution). Within 3 binomial errors of the toy count.
     */
    @Test
    void toyPValueIsPoissonTail() {
        double b = 5, nObs = 10;
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(2, b, nObs, 0, 100));
        int toys = LimitModels.full() ? 40_000 : 4_000;
        ToyPValue r = Discovery.toys(m, DataSet.observed(m), FitSettings.defaults(), NONE, NO_VALUES, toys, 17, 2, null);
        double exact = 1 - new PoissonDistribution(b).cumulativeProbability((int) nObs - 1);
        assertEquals(0, r.failed());
        assertTrue(r.error() > 0);
        assertEquals(exact, r.p(), 3 * r.error(), "toy p " + r.p() + " ± " + r.error() + ", exact " + exact);
    }
}
