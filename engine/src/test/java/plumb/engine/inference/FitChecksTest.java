package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelReader;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Suspicious fits are flagged: a flat direction of the likelihood, a parameter on a bound. */
class FitChecksTest {

    private static FitResult fit(String channels, String extra) {
        String json = "{\"format\": \"plumb-model/1\", \"name\": \"t\", " + extra + "\"channels\": [" + channels + "]}";
        CompiledModel m = ModelCompiler.compile(ModelReader.parse(json, "t.json"));
        return new Fitter(m, DataSet.observed(m), FitSettings.defaults()).fit();
    }

    private static CompiledModel model(String channels, String extra) {
        String json = "{\"format\": \"plumb-model/1\", \"name\": \"t\", " + extra + "\"channels\": [" + channels + "]}";
        return ModelCompiler.compile(ModelReader.parse(json, "t.json"));
    }

    @Test
    void twoFactorsOfOneSampleNextToASignalAreFlaggedWhereverTheFitStops() {
        // the flat direction a·b = const ends with a residual curvature of order the stopping
        // gradient; the check must still name it
        String ch = "{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": [12, 20, 9], \"samples\": ["
                + "{\"name\": \"sig\", \"yields\": [1, 4, 1], \"factors\": [\"mu\"]},"
                + "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\", \"b\"]}]}";
        CompiledModel m = model(ch, "\"poi\": \"mu\", ");
        FitResult r = fit(ch, "\"poi\": \"mu\", ");
        assertTrue(r.converged(), r.status().toString());
        assertTrue(r.checks().nearSingular(), "smallest eigenvalue " + r.checks().smallestEigenvalue());
        String[] named = Arrays.stream(r.checks().degenerate()).mapToObj(i -> m.parameterNames(i)).sorted().toArray(String[]::new);
        assertArrayEquals(new String[] {"a", "b"}, named);
    }

    @Test
    void twoFactorsOfOneSampleMakeANearSingularHessianNamingBoth() {
        String ch = "{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": [12, 20, 9], \"samples\": ["
                + "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\", \"b\"]}]}";
        CompiledModel m = model(ch, "");
        FitResult r = fit(ch, "");
        assertTrue(r.converged(), r.status().toString());
        // only the product a·b is constrained: ln a + ln b, a direction with equal shares of both
        assertTrue(r.checks().nearSingular(), "smallest eigenvalue " + r.checks().smallestEigenvalue());
        String[] named = Arrays.stream(r.checks().degenerate()).mapToObj(i -> m.parameterNames(i)).sorted().toArray(String[]::new);
        assertArrayEquals(new String[] {"a", "b"}, named);
        // the product itself is fitted: total 41 observed over 33 expected
        assertEquals(41.0 / 33, r.values()[m.indexOf("a")] * r.values()[m.indexOf("b")], 1e-4);
    }

    @Test
    void aWellConstrainedFitIsNotFlagged() {
        String ch = "{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": [12, 20, 9], \"samples\": ["
                + "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\"]},"
                + "{\"name\": \"sig\", \"yields\": [1, 8, 1], \"factors\": [\"b\"]}]}";
        FitResult r = fit(ch, "");
        assertTrue(r.converged());
        assertFalse(r.checks().nearSingular(), "smallest eigenvalue " + r.checks().smallestEigenvalue());
        assertTrue(r.checks().smallestEigenvalue() > 0.01 && r.checks().smallestEigenvalue() <= 1);
        assertEquals(0, r.checks().degenerate().length);
        assertFalse(r.checks().anyAtBound());
    }

    @Test
    void aPoiOnItsUpperBoundIsFlagged() {
        // 100 observed over a background of 20 wants mu = 16, the range stops it at 2
        String ch = "{\"name\": \"sr\", \"edges\": [0, 1, 2], \"observed\": [40, 60], \"samples\": ["
                + "{\"name\": \"sig\", \"yields\": [5, 5], \"factors\": [\"mu\"]}, {\"name\": \"bkg\", \"yields\": [10, 10]}]}";
        String extra = "\"poi\": \"mu\", \"parameters\": [{\"name\": \"mu\", \"range\": [0, 2]}], ";
        CompiledModel m = model(ch, extra);
        FitResult r = fit(ch, extra);
        assertTrue(r.converged());
        assertEquals(2.0, r.values()[m.poi()], 1e-9);
        assertEquals(1, r.checks().bound()[m.poi()]);
        // the deficit pushes mu down to its lower bound 0
        String low = ch.replace("[40, 60]", "[5, 6]");
        FitResult r0 = fit(low, extra);
        assertEquals(0.0, r0.values()[m.poi()], 1e-9);
        assertEquals(-1, r0.checks().bound()[m.poi()]);
    }

    @Test
    void fitsWithoutErrorsAreNotChecked() {
        String ch = "{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": [12, 20, 9], \"samples\": ["
                + "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\", \"b\"]}]}";
        CompiledModel m = model(ch, "");
        FitResult r = Fitter.valuesOnly(m, DataSet.observed(m), FitSettings.defaults(), new int[0], new double[0]).fit();
        assertTrue(Double.isNaN(r.checks().smallestEigenvalue()));
        assertFalse(r.checks().nearSingular());
    }
}
