package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelOptions;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Chord steps move a refit's start toward its minimum without changing where the refit ends. */
class ChordStepsTest {

    private final CompiledModel m = ModelCompiler.compile(TestModels.mixed(5, ModelOptions.McStatConstraint.GAUSSIAN));
    private final DataSet data = DataSet.observed(m);
    private final FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();

    @Test
    void startsCloserAndEndsAtTheSameMinimum() {
        assertTrue(best.converged(), best.status().toString());
        Fitter fitter = Fitter.valuesOnly(m, data, FitSettings.defaults(), new int[0], new double[0]);
        BinnedNll nll = fitter.likelihood();
        Refits refits = new Refits(m, best, fitter.dimension(), null);
        int plainIterations = 0, improvedIterations = 0, cases = 0;
        for (int k = 0; k < m.nParams(); k++) {
            if (best.held()[k] || !ChordSteps.apply(m, nll, best, k)) continue;
            for (double side : new double[] {-2, 2}) {
                double value = refits.clip(k, best.values()[k] + side * best.errors()[k]);
                double[] plain = refits.start(k, value);
                double[] improved = plain.clone();
                int evaluations = ChordSteps.improve(m, nll, best, improved, k);
                assertTrue(evaluations >= 1);
                assertEquals(value, improved[k], "the held parameter stays");
                assertTrue(nll.value(improved) <= nll.value(plain), "a step never raises -ln L");
                FitResult fromPlain = fitter.fit(plain, k, value);
                FitResult fromImproved = fitter.fit(improved, k, value);
                // A fit from scratch with θ_k held: the reference both must reach.
                FitResult fresh = new Fitter(m, data, FitSettings.defaults(), new int[] {k}, new double[] {value}).fit();
                assertTrue(fromImproved.converged() && fresh.converged());
                // −ln L at a point with Newton decrement d lies within d/2 of the minimum
                // (the decrement's definition, docs/engine.md section 4); both ends pass d < 1e-8.
                assertEquals(fresh.nll(), fromImproved.nll(), 1e-8);
                // parameters within √d ≈ 1e-4 standard deviations of the minimum
                assertEquals(fresh.values()[m.poi()], fromImproved.values()[m.poi()], 2e-4 * best.errors()[m.poi()]);
                plainIterations += fromPlain.iterations();
                improvedIterations += fromImproved.iterations();
                cases++;
            }
        }
        assertTrue(cases >= 6, "cases " + cases);
        assertTrue(improvedIterations < plainIterations,
                "Newton iterations from the improved starts " + improvedIterations + " vs " + plainIterations);
    }

    @Test
    void profileOfThePoiMatchesFitsFromScratch() {
        PoiProfile profile = new PoiProfile(m, data, FitSettings.defaults(), new int[0], new double[0], "the data");
        double muHat = profile.muHat();
        double sigma = profile.best().errors()[m.poi()];
        // up, then down across earlier points: starts come from cached fits on either side
        for (double z : new double[] {1, 3, 2, 0.5, 4}) {
            double mu = muHat + z * sigma;
            FitResult fresh = new Fitter(m, data, FitSettings.defaults(), new int[] {m.poi()}, new double[] {mu}).fit();
            assertTrue(fresh.converged());
            assertEquals(2 * (fresh.nll() - profile.best().nll()), profile.qTilde(mu), 2e-8);
        }
    }
}
