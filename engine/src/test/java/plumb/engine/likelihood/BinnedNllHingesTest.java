package plumb.engine.likelihood;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.minimise.Hinges;
import plumb.engine.model.ModelReader;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The clip kinks the likelihood reports to the minimiser ({@link BinnedNll#hingesAlong}): the
 * entry whose unclipped yield a step takes through zero, its offset and gradient against the
 * unclipped yield itself, and its slope against the jump of −ln L's directional derivative across
 * the kink, by one-sided finite differences (common practice), with γ at its conditional minimum
 * (profiled layout) or a variable held in the difference (explicit layout).
 */
class BinnedNllHingesTest {

    /**
     * Bin 1 of "moving" is 4 + 3a − 4b (linear interpolation; a, b &gt; 0 here), clipped where that
     * reaches 0; "flat" holds 10 per bin. The MC-statistics errors put γ's on both bins (with
     * {@code mc}), whose conditional minimum the slope must see.
     */
    static CompiledModel model(double observed1, boolean mc) {
        String errors = mc ? ", \"mcError\": [1, 1.5]" : "";
        return ModelCompiler.compile(ModelReader.parse("""
                {"format": "plumb-model/1", "name": "hinge", "channels": [{"name": "sr", "samples": [
                  {"name": "moving", "yields": [1, 4]%s, "variations": [
                    {"parameter": "a", "shape": {"down": [0.5, 1], "up": [2, 7]}, "shapeInterpolation": "linear"},
                    {"parameter": "b", "shape": {"down": [1, 8], "up": [1.5, 0]}, "shapeInterpolation": "linear"}]},
                  {"name": "flat", "yields": [10, 10]%s}],
                  "observed": [12, %s]}]}
                """.formatted(errors, errors, observed1), "hinge.json"));
    }

    @ParameterizedTest
    @CsvSource({"5,false,false", "5,true,false", "7,true,false", "7,true,true"})
    void aValleyCrossedIsReportedWithItsOffsetGradientAndSlope(double observed1, boolean mc, boolean explicit) {
        CompiledModel m = model(observed1, mc);
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), explicit);
        int a = m.indexOf("a"), b = m.indexOf("b"), n = nll.dimension();
        double[] x = new double[n];
        for (int i = 0; i < n; i++) x[i] = m.nominal(i);
        if (explicit) {
            x[m.nParams() + 1] = 1.1; // the γ of bin 1, a variable of the explicit layout
        }
        x[a] = 0.2;
        x[b] = 1.149; // u = 4 + 0.6 − 4.596 = 0.004
        double[] d = new double[n];
        d[a] = -0.05;
        d[b] = 0.05;
        Hinges hinges = new Hinges();
        nll.hingesAlong(x, d, hinges);
        assertEquals(1, hinges.size());
        int moving = 0;
        double[] grad = new double[m.nParams()];
        double u = nll.unclippedBase(x, moving, 1, grad);
        assertEquals(0.004, u, 1e-12);
        assertTrue(hinges.contains(m.sampleEntryStart(moving) + 1));
        assertEquals(u, hinges.offset(0), 0);
        // the kink along d, and the one-sided directional derivatives a little either side of it
        double along = grad[a] * d[a] + grad[b] * d[b];
        double s = -u / along;
        double left = directional(nll, x, d, s - 1e-4), right = directional(nll, x, d, s + 1e-4);
        double slope = (left - right) / along; // a·max(0, u) stops counting beyond the kink
        double reported = reportedSlope(nll, x, d);
        assertTrue(reported > 0);
        assertEquals(slope, reported, 2e-3 * slope);
        // a second call adds nothing: the hinge is held already
        nll.hingesAlong(x, d, hinges);
        assertEquals(1, hinges.size());
    }

    @ParameterizedTest
    @CsvSource({"15,false", "15,true"})
    void aRidgeOrAStepThatStaysOnItsSideIsNotReported(double observed1, boolean mc) {
        CompiledModel m = model(observed1, mc);
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m));
        int a = m.indexOf("a"), b = m.indexOf("b"), n = nll.dimension();
        double[] x = new double[n];
        for (int i = 0; i < n; i++) x[i] = m.nominal(i);
        x[a] = 0.2;
        x[b] = 1.149;
        double[] d = new double[n];
        d[b] = 0.05;
        Hinges hinges = new Hinges();
        // more data than the flat sample: −ln L falls as the yield grows, a ridge at the clip
        nll.hingesAlong(x, d, hinges);
        assertEquals(0, hinges.size());
        d[b] = -0.05;
        nll.hingesAlong(x, d, hinges);
        assertEquals(0, hinges.size());
    }

    /** The slope of the one hinge reported at x along d, by adding it to an empty list. */
    private static double reportedSlope(BinnedNll nll, double[] x, double[] d) {
        Hinges h = new Hinges();
        nll.hingesAlong(x, d, h);
        return h.slope(0);
    }

    /** d/ds of −ln L(x + s·d) by a central difference small against the distance to the kink. */
    private static double directional(BinnedNll nll, double[] x, double[] d, double s) {
        double h = 1e-6;
        return (nll.value(shifted(x, d, s + h)) - nll.value(shifted(x, d, s - h))) / (2 * h);
    }

    private static double[] shifted(double[] x, double[] d, double s) {
        double[] y = x.clone();
        for (int i = 0; i < y.length; i++) y[i] += s * d[i];
        return y;
    }
}
