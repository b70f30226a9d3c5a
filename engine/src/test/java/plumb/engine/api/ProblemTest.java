package plumb.engine.api;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Problem;
import plumb.engine.likelihood.DataSet;

import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The problem value: validation by name, copies that leave the original alone, the facade's answers by name. */
class ProblemTest {

    private final CompiledModel m = Plumb.readModel(LibraryExampleTest.resonance());

    @Test
    void heldParametersAreValidatedByName() {
        Problem p = Plumb.observed(m);
        IllegalArgumentException unknown = assertThrows(IllegalArgumentException.class, () -> p.holding("lumii", 0));
        assertTrue(unknown.getMessage().contains("'lumii'"), unknown.getMessage());
        // Gaussian nuisance parameters default to the range [-6, 6] (docs/model-format.md).
        IllegalArgumentException out = assertThrows(IllegalArgumentException.class, () -> p.holding("lumi", 6.5));
        assertTrue(out.getMessage().contains("[-6.0, 6.0]"), out.getMessage());
        assertThrows(IllegalArgumentException.class, () -> Problem.of(m, p.data(), p.settings(), Map.of("mu", Double.NaN)));
    }

    @Test
    void copiesChangeOnlyWhatTheyNameAndLeaveTheOriginal() {
        Problem p = Plumb.observed(m);
        Problem held = p.holding("lumi", 0.5).holding("slope", -1);
        assertTrue(p.held().isEmpty());
        assertEquals(Map.of("lumi", 0.5, "slope", -1.0), held.held());
        assertArrayEquals(new int[] {m.indexOf("lumi"), m.indexOf("slope")}, held.heldIndices());
        assertArrayEquals(new double[] {0.5, -1}, held.heldValues());
        assertEquals(Map.of("slope", -1.0), held.releasing("lumi").held());
        assertEquals(0.5, held.startValues()[m.indexOf("lumi")]);

        DataSet asimov = DataSets.asimov(m, m.nominal());
        Problem other = held.withData(asimov);
        assertSame(asimov, other.data());
        assertEquals(held.held(), other.held());
        assertEquals("observed", held.data().kind());

        FitSettings explicit = FitSettings.defaults().withExplicitGamma(true);
        assertSame(explicit, held.withSettings(explicit).settings());
        assertEquals(FitSettings.defaults(), held.settings());
        assertThrows(UnsupportedOperationException.class, () -> held.held().put("mu", 1.0));
    }

    @Test
    void dataOfAnotherShapeIsRefused() {
        Problem p = Plumb.observed(m);
        DataSet small = new DataSet("toy", new double[3], new boolean[m.nChannels()], new double[m.nAll()], 0);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> p.withData(small));
        assertTrue(e.getMessage().contains("3 bins"), e.getMessage());
    }

    @Test
    void aHeldParameterStaysAtItsValueWithErrorZero() {
        FitOutcome fit = Plumb.fit(Plumb.observed(m).holding("lumi", 0.5));
        assertTrue(fit.converged());
        FitOutcome.Estimate lumi = fit.parameter("lumi");
        assertEquals(0.5, lumi.value());
        assertEquals(0, lumi.error());
        assertTrue(lumi.held());
        // Gaussian width 1 and nominal 0: the pull of a parameter held at 0.5 is 0.5.
        assertEquals(0.5, lumi.pull(), 1e-15);
        assertEquals(Double.NaN, fit.parameter("mu").pull());
    }

    @Test
    void theScanIntervalMatchesTheFitErrorForANearlyGaussianProfile() {
        Problem p = Plumb.observed(m);
        FitOutcome fit = Plumb.fit(p);
        ScanOutcome scan = Plumb.scan(p, "mu", 5);
        assertEquals(fit.value("mu"), scan.best(), 1e-12);
        // Wilks (common practice): for a near-quadratic profile the 2ΔNLL = 1 crossings lie about
        // one symmetric error from the best fit; 15 % covers the asymmetry of a Poisson profile.
        assertEquals(fit.error("mu"), scan.high68() - scan.best(), 0.15 * fit.error("mu"));
        assertEquals(fit.error("mu"), scan.best() - scan.low68(), 0.15 * fit.error("mu"));
        assertEquals(0, scan.points().stream().mapToDouble(ScanOutcome.ProfilePoint::twiceNllAboveMin).min().orElseThrow(), 0.5);
    }
}
