package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelOptions;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The toys' start: one Fisher-scoring step from the generating point (the expected information
 * in place of the Hessian, common practice for Poisson likelihoods) lands near the toy's minimum,
 * so the fit from it takes fewer Newton iterations and ends at the same minimum.
 */
class ToyStartTest {

    private static final int[] NONE = new int[0];

    /** Distance of x from y in the fit's errors, the largest over the model parameters. */
    private static double distance(CompiledModel m, double[] x, double[] y, double[] errors) {
        double d = 0;
        for (int i = 0; i < m.nParams(); i++) if (errors[i] > 0) d = Math.max(d, Math.abs(x[i] - y[i]) / errors[i]);
        return d;
    }

    @Test
    void startsNearTheToysMinimumAndSavesIterations() {
        CompiledModel m = ModelCompiler.compile(InjectionToysTest.linearModel());
        double[] point = m.nominal();
        point[m.poi()] = 1;
        double[] expected = DataSets.expectedCounts(m, point);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        Fitter fitter = new Fitter(m, DataSet.observed(m), FitSettings.defaults());
        ToyStart start = new ToyStart(fitter, point, expected, all, NONE);
        int fromPoint = 0, fromStart = 0;
        for (int t = 0; t < 20; t++) {
            fitter.setData(Toys.generate(m, expected, point, all, 3, t, true));
            double[] s = start.of(fitter);
            FitResult a = fitter.fit(point, NONE, new double[0]);
            FitResult b = fitter.fit(s, NONE, new double[0]);
            assertTrue(a.converged() && b.converged());
            // a linear model with thousands of events per bin: the toy's minimum lies about an error
            // from the generating point, the step lands within a few hundredths of an error of it
            // (the remainder is of second order in the fluctuation)
            double fromGenerating = distance(m, point, a.values(), a.errors());
            assertTrue(fromGenerating > 0.3, "toy " + t);
            assertTrue(distance(m, s, a.values(), a.errors()) < 0.1 * fromGenerating, "toy " + t);
            // the same minimum: both fits stop at a Newton decrement below 1e-8, so −ln L is within
            // 5e-9 of the minimum's and the values within 1e-4 of an error
            assertEquals(a.nll(), b.nll(), 1e-8, "toy " + t);
            assertTrue(distance(m, a.values(), b.values(), a.errors()) < 1e-3, "toy " + t);
            assertTrue(b.iterations() <= a.iterations(), "toy " + t);
            fromPoint += a.iterations();
            fromStart += b.iterations();
        }
        assertTrue(fromStart < fromPoint, fromStart + " vs " + fromPoint + " iterations");
    }

    /** Held parameters keep their generating values; the start does not depend on earlier toys. */
    @Test
    void heldStayAndStartsAreReproducible() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(2, ModelOptions.McStatConstraint.GAUSSIAN));
        int lumi = m.indexOf("lumi");
        double[] point = m.nominal();
        point[m.poi()] = 1.5;
        point[lumi] = 0.3;
        double[] expected = DataSets.expectedCounts(m, point);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        Fitter fitter = Fitter.valuesOnly(m, DataSet.observed(m), FitSettings.defaults(), new int[] {lumi}, new double[] {0.3});
        ToyStart start = new ToyStart(fitter, point, expected, all, new int[] {lumi});
        fitter.setData(Toys.generate(m, expected, point, all, 8, 4, true));
        double[] first = start.of(fitter);
        fitter.setData(Toys.generate(m, expected, point, all, 8, 5, true));
        start.of(fitter);
        fitter.setData(Toys.generate(m, expected, point, all, 8, 4, true));
        assertArrayEquals(first, start.of(fitter), 0.0);
        assertEquals(0.3, first[lumi], 0.0);
        assertTrue(first[m.poi()] != point[m.poi()], "the POI moves");
        for (int i = 0; i < first.length; i++) {
            assertTrue(first[i] >= m.lower(i) && first[i] <= m.upper(i), m.parameterNames(i));
        }
    }
}
