package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.MinimumStatus;

import java.util.Arrays;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The screen of other-side starts ({@link OtherSideSearch#bends}): every start whose refit ends in
 * a lower minimum is refitted, and on a model whose one-sided terms barely turn, starts whose
 * refit only comes back are skipped. Which refit ends where is found by making it (the search
 * off), not assumed.
 */
class OtherSideScreenTest {

    /** The fitter's minimum at {@code values} as the search sees it: value, gradient and Hessian there. */
    private static MinimumResult minimumAt(Fitter f, double[] values, boolean[] held) {
        BinnedNll nll = f.likelihood();
        int n = nll.dimension();
        double[] x = Arrays.copyOf(values, n), g = new double[n], h = new double[n * n];
        double value = nll.valueGradientHessian(x, g, h);
        return new MinimumResult(MinimumStatus.CONVERGED, x, value, g, h, held, 0, 0, 0);
    }

    private record Outcome(int starts, int screenedOut, int lower, int lowerRefitted, int skippedThatMoved) { }

    /** Refits every other-side start of the minimum reached from nominal with {@code hold} held. */
    private static Outcome screen(CompiledModel m, DataSet data, int hold, double holdValue) {
        Fitter f = new Fitter(m, data, FitSettings.defaults());
        f.searchOtherSides(false);
        FitResult first = f.fit(f.nominalStart(), hold, holdValue);
        assertTrue(first.converged());
        int n = f.dimension();
        boolean[] held = Arrays.copyOf(m.fixed(), n);
        if (hold >= 0) held[hold] = true;
        MinimumResult at = minimumAt(f, first.values(), held);
        int[] candidates = OtherSideSearch.candidates(m, held);
        List<double[]> starts = OtherSideSearch.starts(at.x(), candidates, Arrays.copyOf(m.lower(), n), Arrays.copyOf(m.upper(), n));
        int screenedOut = 0, lower = 0, lowerRefitted = 0, skippedThatMoved = 0;
        for (double[] start : starts) {
            boolean refit = OtherSideSearch.bends(f.likelihood(), at, start, candidates, new double[n]);
            FitResult r = f.fit(start, hold, holdValue);
            boolean same = OtherSideSearch.same(m, Arrays.copyOf(r.values(), n), at.x());
            if (r.nll() < first.nll() - 1e-3) {
                lower++;
                if (refit) lowerRefitted++;
            }
            if (!refit) {
                screenedOut++;
                if (!same) skippedThatMoved++;
            }
        }
        return new Outcome(starts.size(), screenedOut, lower, lowerRefitted, skippedThatMoved);
    }

    /** Model a with mu held at 0: the descent from nominal ends in the higher minimum; the start that leads lower is refitted. */
    @Test
    void theStartIntoTheLowerBasinIsRefitted() {
        CompiledModel m = SeveralMinimaCasesTest.load("several-minima-a.json");
        Outcome o = screen(m, DataSet.observed(m), m.poi(), 0);
        assertTrue(o.lower() >= 1, "the case has a lower minimum on the other side: " + o);
        assertEquals(o.lower(), o.lowerRefitted(), o.toString());
        assertEquals(0, o.skippedThatMoved(), o.toString());
    }

    /** Model b, Asimov data at mu = 0, mu held at 10: the starts into other basins are refitted. */
    @Test
    void startsIntoOtherBasinsAreRefittedInCaseB() {
        CompiledModel m = SeveralMinimaCasesTest.load("several-minima-b.json");
        DataSet asimov = DataSets.asimovAt(m, 0, new int[0], new double[0], true, FitSettings.defaults()).data();
        Outcome o = screen(m, asimov, m.poi(), 10);
        assertEquals(0, o.skippedThatMoved(), o.toString());
        assertTrue(o.starts() - o.screenedOut() >= 3, "three of the four starts end in other minima: " + o);
    }

    /**
     * One bin, one parameter whose norm term turns (up 1.02, down 1.01: both sides raise the yield
     * a little) and data below the yield: −ln L is a plain bowl, and every start is skipped
     * because its refit would only come back.
     */
    @Test
    void aBarelyTurningTermCostsNoRefit() {
        CompiledModel m = plumb.engine.compile.ModelCompiler.compile(plumb.engine.model.ModelReader.parse("""
                {"format": "plumb-model/1", "name": "bowl", "channels": [{"name": "bin", "samples": [
                  {"name": "bkg", "yields": [100], "variations": [{"parameter": "theta",
                    "norm": {"down": 1.01, "up": 1.02}, "normInterpolation": "smooth"}]}],
                  "observed": [90]}]}
                """, "bowl.json"));
        assertTrue(m.oneSided(0));
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), false);
        Fitter f = new Fitter(m, DataSet.observed(m), FitSettings.defaults());
        f.searchOtherSides(false);
        FitResult r = f.fit();
        assertEquals(1, TwoMinimaTest.gridMinima(m).size(), "a single minimum");
        MinimumResult at = minimumAt(f, r.values(), new boolean[1]);
        List<double[]> starts = OtherSideSearch.starts(at.x(), new int[] {0}, m.lower(), m.upper());
        assertEquals(1, starts.size());
        assertFalse(OtherSideSearch.bends(nll, at, starts.get(0), new int[] {0}, new double[1]));
    }
}
