package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelReader;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * One parameter, one bin, one sample with a one-sided norm variation under smooth interpolation:
 * the yield is lowest near θ = 0 and rises on both sides, and the data lie above it, so −ln L
 * along θ has a minimum on each side of 0. Which one is deeper and by how much comes from a
 * dense grid scan of −ln L (common practice: for one parameter a grid finer than the minima's
 * width finds them all).
 */
class TwoMinimaTest {

    /** Yield 100 at θ = 0, 125 at θ = −1 and 135 at θ = +1; 125 events seen. */
    static CompiledModel model(String interpolation, double down, double up) {
        String json = String.format(Locale.ROOT, """
                {"format": "plumb-model/1", "name": "two_minima", "channels": [{"name": "bin", "samples": [
                  {"name": "bkg", "yields": [100], "variations": [{"parameter": "theta",
                    "norm": {"down": %s, "up": %s}, "normInterpolation": "%s"}]}],
                  "observed": [125]}]}
                """, down, up, interpolation);
        return ModelCompiler.compile(ModelReader.parse(json, "two-minima.json"));
    }

    /** Local minima of −ln L on a grid of step 1e-4 over θ ∈ [−5, 5], refined by a parabola through three points. */
    static List<double[]> gridMinima(CompiledModel m) {
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), false);
        double step = 1e-4;
        int n = (int) Math.round(10 / step);
        double[] f = new double[n + 1];
        for (int i = 0; i <= n; i++) f[i] = nll.value(new double[] {-5 + i * step});
        List<double[]> out = new ArrayList<>();
        for (int i = 1; i < n; i++) {
            if (f[i] < f[i - 1] && f[i] <= f[i + 1]) {
                double den = f[i - 1] - 2 * f[i] + f[i + 1];
                double shift = den > 0 ? 0.5 * (f[i - 1] - f[i + 1]) / den : 0;
                double theta = -5 + (i + shift) * step;
                out.add(new double[] {theta, nll.value(new double[] {theta})});
            }
        }
        return out;
    }

    @Test
    void theGridSeesTwoMinimaOfDifferentDepth() {
        List<double[]> minima = gridMinima(model("smooth", 1.25, 1.35));
        assertEquals(2, minima.size());
        assertTrue(minima.get(0)[0] < -0.5 && minima.get(1)[0] > 0.5, "one minimum on each side");
        assertTrue(minima.get(1)[1] < minima.get(0)[1] - 0.01, "the one at θ > 0 is deeper");
    }

    /** From any start the fitter ends in the deeper minimum and reports the other with its depth. */
    @ParameterizedTest
    @ValueSource(strings = {"smooth", "linear", "exponential"})
    void theDeeperMinimumFromAnyStart(String interpolation) {
        CompiledModel m = model(interpolation, 1.25, 1.35);
        assertTrue(m.oneSided(0));
        List<double[]> grid = gridMinima(m);
        assertEquals(2, grid.size(), interpolation);
        double[] deep = grid.get(0)[1] < grid.get(1)[1] ? grid.get(0) : grid.get(1);
        double[] shallow = deep == grid.get(0) ? grid.get(1) : grid.get(0);
        Fitter fitter = new Fitter(m, DataSet.observed(m), FitSettings.defaults());
        for (double start = -3; start <= 3; start += 0.25) {
            FitResult r = fitter.fit(new double[] {start}, -1, 0);
            assertTrue(r.converged(), r.status() + " from " + start);
            assertEquals(deep[1], r.nll(), 1e-8, "from " + start);
            assertEquals(deep[0], r.values()[0], 1e-3, "from " + start);
            assertTrue(r.severalMinima(), "from " + start);
            assertEquals(shallow[1] - deep[1], r.otherMinima().get(0).nllAboveBest(), 1e-8, "from " + start);
            assertEquals(shallow[0], r.otherMinima().get(0).values()[0], 1e-3, "from " + start);
        }
        // The descent alone stays in the basin it starts in.
        fitter.searchOtherSides(false);
        assertEquals(shallow[1], fitter.fit(new double[] {-2}, -1, 0).nll(), 1e-8);
    }

    /** A variation meant to stay at nominal on one side, off by rounding only, is not one-sided for the fitter. */
    @Test
    void roundingDoesNotMakeAVariationOneSided() {
        assertFalse(model("smooth", 1.0000004, 1.2).oneSided(0));
        assertFalse(model("smooth", 0.8, 1.2).oneSided(0));
        assertTrue(model("smooth", 1.01, 1.2).oneSided(0));
    }
}
