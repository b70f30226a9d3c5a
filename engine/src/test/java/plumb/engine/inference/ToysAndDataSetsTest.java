package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelOptions;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Generated data sets: Asimov sets at their expectation, toys reproducible by (seed, index) and Poisson on average. */
class ToysAndDataSetsTest {

    private final CompiledModel m = ModelCompiler.compile(TestModels.mixed(11, ModelOptions.McStatConstraint.POISSON));

    @Test
    void theAsimovSetIsTheExpectationWithAuxiliaryValuesAtTheGeneratingPoint() {
        double[] values = m.nominal();
        values[m.poi()] = 2;
        values[m.indexOf("lumi")] = 0.7;
        DataSet a = DataSets.asimov(m, values);
        assertArrayEquals(DataSets.expectedCounts(m, values), a.counts());
        for (boolean included : a.channelIncluded()) assertTrue(included);
        for (int i = 0; i < m.nAll(); i++) {
            // Gaussian centre = θ, Poisson count m = τ·γ (docs/model-format.md, generated data sets)
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) assertEquals(values[i], a.aux()[i], 0, m.parameterNames(i));
            if (m.constraintType(i) == ConstraintType.POISSON) assertEquals(m.tau(i) * values[i], a.aux()[i], 1e-12 * m.tau(i));
        }
        // The fit of an Asimov set returns its generating point (Cowan et al. 2011, section 3.1).
        FitResult fit = new Fitter(m, a, FitSettings.defaults()).fit();
        assertTrue(fit.converged());
        assertEquals(2, fit.values()[m.poi()], 1e-4);
        assertEquals(0.7, fit.values()[m.indexOf("lumi")], 1e-4);
    }

    @Test
    void aPrefitAsimovSetUsesTheNominalValuesWithTheHeldOnesApplied() {
        int lumi = m.indexOf("lumi");
        DataSets.Generated g = DataSets.asimovAt(m, 1.5, new int[] {lumi}, new double[] {-0.4}, false, FitSettings.defaults());
        double[] expected = m.nominal();
        expected[m.poi()] = 1.5;
        expected[lumi] = -0.4;
        assertArrayEquals(expected, g.values());
        assertEquals(null, g.conditionalFit());
        assertArrayEquals(DataSets.expectedCounts(m, expected), g.data().counts());
    }

    @Test
    void aToyDependsOnlyOnSeedAndIndex() {
        double[] values = m.nominal();
        double[] expected = DataSets.expectedCounts(m, values);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        DataSet a = Toys.generate(m, expected, values, all, 42, 7, true);
        DataSet b = Toys.generate(m, expected, values, all, 42, 7, true);
        DataSet c = Toys.generate(m, expected, values, all, 42, 8, true);
        assertArrayEquals(a.counts(), b.counts());
        assertArrayEquals(a.aux(), b.aux());
        assertFalse(Arrays.equals(a.counts(), c.counts()));
        DataSet held = Toys.generate(m, expected, values, all, 42, 7, false);
        assertArrayEquals(a.counts(), held.counts());
        assertArrayEquals(DataSets.generatingAux(m, values), held.aux());
    }

    @Test
    void toyCountsArePoissonAroundTheExpectation() {
        double[] values = m.nominal();
        double[] expected = DataSets.expectedCounts(m, values);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        int toys = 4000;
        double[] sum = new double[m.nBins()], sumSq = new double[m.nBins()];
        for (int t = 0; t < toys; t++) {
            double[] n = Toys.generate(m, expected, values, all, 3, t, false).counts();
            for (int b = 0; b < n.length; b++) {
                assertEquals(Math.rint(n[b]), n[b], 0, "counts are integers");
                sum[b] += n[b];
                sumSq[b] += n[b] * n[b];
            }
        }
        for (int b = 0; b < m.nBins(); b++) {
            double mean = sum[b] / toys, var = sumSq[b] / toys - mean * mean;
            // Poisson: mean = variance = ν (common practice); 5 standard errors of each estimate
            assertEquals(expected[b], mean, 5 * Math.sqrt(expected[b] / toys), "mean of bin " + b);
            assertEquals(expected[b], var, 5 * expected[b] * Math.sqrt(2.0 / toys) + 5 * Math.sqrt(expected[b] / toys), "variance of bin " + b);
        }
    }
}
