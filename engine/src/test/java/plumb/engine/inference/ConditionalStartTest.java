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
 * A toy's conditional fit after its best fit ({@link Fitter#refitHolding}) starts near the
 * conditional minimum, found with the best fit's Hessian (the chord method, common practice), so
 * it ends at the minimum of the plain refit from the best fit's values with fewer Newton
 * iterations; where the best fit is not the fitter's last, it is that plain refit bit for bit.
 */
class ConditionalStartTest {

    private static final int[] NONE = new int[0];

    @Test
    void reachesThePlainRefitsMinimumInFewerIterations() {
        CompiledModel m = ModelCompiler.compile(InjectionToysTest.linearModel());
        double[] point = m.nominal();
        point[m.poi()] = 1;
        double[] expected = DataSets.expectedCounts(m, point);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        Fitter fitter = new Fitter(m, DataSet.observed(m), FitSettings.defaults());
        int plainIterations = 0, improvedIterations = 0;
        for (int t = 0; t < 20; t++) {
            fitter.setData(Toys.generate(m, expected, point, all, 5, t, true));
            FitResult best = fitter.fit(point, NONE, new double[0]);
            // μ held a few errors away, as a limit's or a discovery test's conditional fit is
            double mu = best.values()[m.poi()] + (t % 2 == 0 ? 2 : -3) * best.errors()[m.poi()];
            FitResult plain = fitter.fit(best.values(), m.poi(), mu);
            // best's fit again: refitHolding needs the fitter's last fit
            FitResult improved = fitter.refitHolding(fitter.fit(point, NONE, new double[0]), m.poi(), mu);
            assertTrue(plain.converged() && improved.converged(), "toy " + t);
            assertEquals(mu, improved.values()[m.poi()], 0.0);
            // the same minimum: both stop at a Newton decrement below 1e-8, so −ln L within 5e-9
            // of the minimum's and every value within 1e-4 of its error
            assertEquals(plain.nll(), improved.nll(), 1e-8, "toy " + t);
            for (int i = 0; i < m.nParams(); i++) {
                if (i == m.poi()) continue;
                assertEquals(plain.values()[i], improved.values()[i], 1e-3 * plain.errors()[i], "toy " + t + " " + m.parameterNames(i));
            }
            assertTrue(improved.iterations() <= plain.iterations(), "toy " + t);
            plainIterations += plain.iterations();
            improvedIterations += improved.iterations();
        }
        // on this linear model the chord steps reach the conditional minimum: no Newton step is left
        assertEquals(0, improvedIterations, "plain refits took " + plainIterations);
        assertTrue(plainIterations >= 20, plainIterations + " iterations of the plain refits");
    }

    /** Not after the fitter's last fit (a kept best fit, other data meanwhile): the plain refit, bit for bit. */
    @Test
    void aBestFitThatIsNotTheLastGivesThePlainRefit() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(2, ModelOptions.McStatConstraint.GAUSSIAN));
        double[] point = m.nominal();
        point[m.poi()] = 1.5;
        double[] expected = DataSets.expectedCounts(m, point);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        Fitter fitter = Fitter.valuesOnly(m, DataSet.observed(m), FitSettings.defaults(), NONE, new double[0]);
        DataSet toy = Toys.generate(m, expected, point, all, 8, 4, true);
        fitter.setData(toy);
        FitResult best = fitter.fit(point, NONE, new double[0]);
        fitter.setData(Toys.generate(m, expected, point, all, 8, 5, true));
        fitter.fit(point, NONE, new double[0]);
        fitter.setData(toy);
        FitResult viaRefit = fitter.refitHolding(best, m.poi(), 0.5);
        FitResult plain = fitter.fit(best.values(), m.poi(), 0.5);
        assertEquals(plain.nll(), viaRefit.nll(), 0.0);
        assertArrayEquals(plain.values(), viaRefit.values(), 0.0);
        assertEquals(plain.iterations(), viaRefit.iterations());
    }
}
