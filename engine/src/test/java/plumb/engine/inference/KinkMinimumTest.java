package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelReader;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A minimum exactly on the kink of a linear interpolation at θ = 0. Two bins of one sample, a
 * two-sided shape variation whose slope is 10 right of 0 and 20 left of it in the first bin, the
 * other way round in the second; the data lie 10 % above nominal in the first bin and 10 % below
 * in the second. The one-sided slopes of −ln L at 0 are then −1 (left) and +1 (right): a minimum
 * on the kink, where no curvature of one side describes the error.
 */
class KinkMinimumTest {

    static final String MODEL = """
            {"format": "plumb-model/1", "name": "kink", "channels": [{"name": "two_bins", "samples": [
              {"name": "bkg", "yields": [100, 100], "variations": [{"parameter": "theta",
                "shape": {"down": [80, 90], "up": [110, 120]}, "shapeInterpolation": "linear"}]}],
              "observed": [110, 90]}]}
            """;

    @Test
    void theFitFlagsTheParameterAndTheProfileSpansTheKink() {
        CompiledModel m = ModelCompiler.compile(ModelReader.parse(MODEL, "kink.json"));
        assertTrue(m.kinked(0));
        assertFalse(m.oneSided(0));
        DataSet data = DataSet.observed(m);
        FitResult r = new Fitter(m, data, FitSettings.defaults()).fit();
        assertTrue(r.converged(), r.status().toString());
        assertEquals(0, r.values()[0], 0);
        assertTrue(r.atKink()[0]);
        assertTrue(r.anyAtKink());

        // The 68 % interval where 2ΔNLL = 1, against the crossings of a grid of −ln L (one parameter:
        // the profile is −ln L itself; common practice), linear between grid points 1e-5 apart.
        ProfileScan scan = new ProfileScan(m, data, FitSettings.defaults(), new int[0], new double[0], r);
        ProfileScan.Interval iv = scan.intervals(0, new double[] {ProfileScan.LEVEL_68}, 1).get(0);
        BinnedNll nll = new BinnedNll(m, data, false);
        double f0 = nll.value(new double[] {0});
        assertEquals(gridCrossing(nll, f0, -1), iv.low(), 1e-5);
        assertEquals(gridCrossing(nll, f0, +1), iv.high(), 1e-5);
        // The error from one side's curvature misses the interval spanning the kink by more than 5 %.
        double halfWidth = 0.5 * (iv.high() - iv.low());
        assertTrue(Math.abs(r.errors()[0] - halfWidth) > 0.05 * halfWidth, List.of(r.errors()[0], halfWidth).toString());
    }

    private static double gridCrossing(BinnedNll nll, double f0, int side) {
        double step = 1e-5, prev = 0;
        for (int i = 1; i < 1_000_000; i++) {
            double t = side * i * step;
            double g = 2 * (nll.value(new double[] {t}) - f0) - 1;
            if (g >= 0) {
                double gPrev = 2 * (nll.value(new double[] {prev}) - f0) - 1;
                return prev + (t - prev) * (-gPrev) / (g - gPrev);
            }
            prev = t;
        }
        return Double.NaN;
    }
}
