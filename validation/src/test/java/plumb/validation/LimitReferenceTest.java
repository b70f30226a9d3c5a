package plumb.validation;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.AsymptoticUpperLimit;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.ExpectedBands;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.ToyLimits;
import plumb.engine.likelihood.DataSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** CLs upper limits against closed forms and published tables: references.md items 5 and 6. */
class LimitReferenceTest {

    private static final int[] NONE = new int[0];
    private static final double[] NO_VALUES = new double[0];
    private static final NormalDistribution NORMAL = new NormalDistribution();

    private static DataSet asimovZero(CompiledModel m) {
        return DataSets.asimovAt(m, 0, NONE, NO_VALUES, false, FitSettings.defaults()).data();
    }

    private static LimitResult asymptotic(CompiledModel m, double cl) {
        return AsymptoticUpperLimit.compute(m, DataSet.observed(m), asimovZero(m), FitSettings.defaults(), NONE, NO_VALUES, cl);
    }

    /** q_μ,A of one bin with known b on the background-only Asimov set (n = b): 2[μs − b ln(1 + μs/b)]. */
    private static double qmuA(double mu, double s, double b) {
        return 2 * (mu * s - b * Math.log1p(mu * s / b));
    }

    /**
     * The median expected CLs limit of a single bin with known b solves q_μ,A = (Φ⁻¹(1 − α/2))²:
     * Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554, sections 3–4 (references.md item 6).
     * The closed-form root comes from commons-math's Brent solver at 1e-14; the engine's limit
     * must agree to the 1e-4 relative accuracy the limits promise.
     */
    @ParameterizedTest
    @CsvSource({"10,50,0.95", "3,4,0.95", "1,0.2,0.95", "25,900,0.90", "7,30,0.90"})
    void medianExpectedLimitSolvesQmuA(double s, double b, double cl) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, Math.round(b), 0, 1000));
        double target = Math.pow(NORMAL.inverseCumulativeProbability(1 - (1 - cl) / 2), 2);
        double exact = new BrentSolver(1e-14, 1e-14).solve(200, mu -> qmuA(mu, s, b) - target, 1e-9, 1000);
        LimitResult r = asymptotic(m, cl);
        assertEquals(exact, r.expected().median(), 1e-4 * exact);
    }

    /**
     * For a high-count single bin, σ is nearly constant and the bands follow eq. (89) of Cowan et al.:
     * μ_up+N = σ(Φ⁻¹(1 − αΦ(N)) + N), σ = √b/s; within 1 % (the relative change of σ over the
     * bands is about μs/(3b) &lt; 0.2 % here).
     */
    @ParameterizedTest
    @CsvSource({"100,1e6", "30,2e5"})
    void bandsFollowEq89AtHighCounts(double s, double b) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, b, 0, 1000));
        double alpha = 0.05, sigma = Math.sqrt(b) / s;
        double[] bands = asymptotic(m, 0.95).expected().toArray();
        for (int k = 0; k < bands.length; k++) {
            int n = ExpectedBands.N[k];
            double eq89 = sigma * (NORMAL.inverseCumulativeProbability(1 - alpha * NORMAL.cumulativeProbability(n)) + n);
            assertEquals(eq89, bands[k], 0.01 * eq89, "band " + n);
        }
    }

    /**
     * The observed asymptotic limit is where CLs = α: re-evaluated from the closed-form q̃μ of one
     * bin with known b (Cowan et al. eqs. 16, 65–66), CLs at the engine's limit is 0.05 to 1e-3 relative.
     */
    @ParameterizedTest
    @CsvSource({"10,50,55", "10,50,40", "4,3,9"})
    void observedLimitHasClsAlpha(double s, double b, double n) {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, n, 0, 1000));
        double mu = asymptotic(m, 0.95).observed();
        double muHat = Math.max(0, (n - b) / s);
        double nll0 = (muHat * s + b) - n * Math.log(muHat * s + b), nllMu = (mu * s + b) - n * Math.log(mu * s + b);
        double q = muHat > mu ? 0 : 2 * (nllMu - nll0);
        assertEquals(0.05, AsymptoticUpperLimit.cls(q, qmuA(mu, s, b)), 0.05 * 1e-3);
    }

    /** A limit beyond the POI's range is reported as a failure to bracket, never as a number. */
    @Test
    void limitOutsideRangeIsNotBracketed() {
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(1, 10, 10, 0, 1));
        InferenceException e = assertThrows(InferenceException.class, () -> asymptotic(m, 0.95));
        assertTrue(e.getMessage().contains("could not be bracketed"), e.getMessage());
    }

    /**
     * Toy-based CLs with negligible background reproduces the classical Poisson upper limits:
     * Review of Particle Physics (PDG), "Statistics", table of Poisson limits, 95 % CL, n = 0..3:
     * 3.00, 4.74, 6.30, 7.75 (references.md item 5; CLs with b → 0 is the classical limit,
     * A. L. Read, J. Phys. G 28 (2002) 2693). The same numbers follow from μ_up = ½ F⁻¹_χ²(CL; 2(n+1))
     * with commons-math (within the table's rounding, 0.005). The toy limit must lie within
     * 3 toy-statistics errors of the formula.
     */
    @ParameterizedTest
    @CsvSource({"0,3.00", "1,4.74", "2,6.30", "3,7.75"})
    void toyClsReproducesPoissonLimits(int n, double pdg) {
        double formula = 0.5 * new ChiSquaredDistribution(2 * (n + 1)).inverseCumulativeProbability(0.95);
        assertEquals(pdg, formula, 0.005);
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(1, 1e-6, n, 0, 30));
        int toys = LimitModels.full() ? 40_000 : 3_000;
        DataSet data = DataSet.observed(m);
        LimitResult r = ToyLimits.compute(new ToyLimits.Request(m, data, data, asimovZero(m), FitSettings.defaults(),
                NONE, NO_VALUES, 0.95, toys, 11, 2), null);
        assertEquals(0, r.failedToys());
        assertTrue(r.observedError() > 0 && r.observedError() < 0.1 * formula, "error " + r.observedError());
        assertEquals(formula, r.observed(), 3 * r.observedError(),
                "toy limit " + r.observed() + " ± " + r.observedError());
    }
}
