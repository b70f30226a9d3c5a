package plumb.validation;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Problem;
import plumb.engine.inference.Projection;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Luminosity projections against the scaling laws of a counting experiment. */
class ProjectionReferenceTest {

    private static final double[] LUMIS = {1, 2, 5, 10};

    private static double cowanZ(double s, double b) {
        return Math.sqrt(2 * ((s + b) * Math.log(1 + s / b) - s));
    }

    /**
     * Statistics only, s ≪ b: Z_A equals Cowan et al. 2011 eq. (97) with s and b times L (to 1e-6,
     * the fits' precision), and so grows as √L (to 2e-3 ≈ s/b, the size of the next term of the
     * expansion Z_A ≈ s/√b). The median limit, μ_up ≈ 1.96 σ_μ with σ_μ = √b/s in the Gaussian
     * regime (Cowan et al. 2011, eq. 89 with N = 0), falls as 1/√L to 5e-3 (terms of O(μ s/b)).
     */
    @Test
    void statOnlyCountingScalesWithRootLuminosity() {
        double s = 20, b = 10_000;
        CompiledModel m = ModelCompiler.compile(CountingModels.knownBackground(s, b, b, 0, 100));
        Projection.Result r = Projection.compute(Problem.observed(m), false, 0.95, LUMIS, 2, null);
        Projection.Point one = r.at(1, Projection.Scenario.STAT_ONLY);
        for (double lumi : LUMIS) {
            for (Projection.Scenario sc : Projection.Scenario.values()) {
                Projection.Point p = r.at(lumi, sc);
                assertNull(p.error());
                assertEquals(cowanZ(s * lumi, b * lumi), p.z(), 1e-6 * p.z(), sc + " at " + lumi);
                assertEquals(Math.sqrt(lumi), p.z() / one.z(), 2e-3 * Math.sqrt(lumi), sc + " at " + lumi);
                assertEquals(1 / Math.sqrt(lumi), p.limit() / one.limit(), 5e-3 / Math.sqrt(lumi), sc + " at " + lumi);
            }
        }
        assertEquals(1.96 * Math.sqrt(b) / s, one.limit(), 0.01 * one.limit());
    }

    /**
     * With a background normalisation uncertainty of 5 % the gain saturates (references.md item 16,
     * common practice): Z_A ≈ sL/√(bL + (δbL)²) tends to s/(δb) = 0.6 from 0.55 at L = 1, so the
     * systematic scenario grows far slower than √L while the statistics-only one keeps √L.
     */
    @Test
    void systematicsSaturateTheGain() {
        double s = 60, b = 2_000;
        Variation norm = new Variation("bkg_norm", new Variation.NormEffect(0.95, 1.05), null, null, null);
        Sample sig = new Sample("signal", new double[] {s}, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", new double[] {b}, null, List.of(), List.of(norm));
        Channel ch = new Channel("sr", null, null, new double[] {b}, List.of(sig, bkg));
        Model model = new Model(Model.FORMAT, "counting-syst", null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, 20}, null, null, false)), Map.of(), Map.of(), null);
        CompiledModel m = ModelCompiler.compile(model);
        Projection.Result r = Projection.compute(Problem.of(m, plumb.engine.likelihood.DataSet.observed(m),
                FitSettings.defaults(), Map.of()), false, 0.95, LUMIS, 2, null);
        double sys = r.at(10, Projection.Scenario.SYSTEMATICS).z() / r.at(1, Projection.Scenario.SYSTEMATICS).z();
        double stat = r.at(10, Projection.Scenario.STAT_ONLY).z() / r.at(1, Projection.Scenario.STAT_ONLY).z();
        assertEquals(Math.sqrt(10), stat, 2e-2 * Math.sqrt(10));
        assertTrue(sys < 0.7 * Math.sqrt(10), "systematic scenario grows as " + sys);
        assertEquals(cowanZ(s, b), r.at(1, Projection.Scenario.STAT_ONLY).z(), 1e-6);
    }
}
