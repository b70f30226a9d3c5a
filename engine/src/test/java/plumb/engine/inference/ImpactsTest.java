package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelOptions;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Impacts, profile points and covariances on a model with every kind of term. */
class ImpactsTest {

    private final CompiledModel m = ModelCompiler.compile(TestModels.mixed(5, ModelOptions.McStatConstraint.GAUSSIAN));
    private final DataSet data = DataSet.observed(m);
    private final FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();

    private Impacts impacts(boolean mcstat) {
        assertTrue(best.converged(), best.status().toString());
        return new Impacts(m, data, FitSettings.defaults(), new int[0], new double[0], best, mcstat);
    }

    /** Each refit starts from a point that depends only on its task: the ranking does not depend on the threads. */
    @Test
    void rankingDoesNotDependOnThreads() {
        List<Impacts.Entry> one = impacts(true).rank(-1, 1, null);
        List<Impacts.Entry> two = impacts(true).rank(-1, 2, null);
        assertEquals(one, two);
        assertTrue(one.stream().anyMatch(e -> e.parameter() >= m.nParams()), "γ ranked on request");
    }

    /** The exact shift is a refit's POI minus the best fit's: recompute one by hand with a fresh Fitter from nominal. */
    @Test
    void exactShiftEqualsAnIndependentRefit() {
        Impacts.Entry top = impacts(false).rank(1, 1, null).get(0);
        int k = top.parameter();
        double target = Math.min(m.upper(k), best.values()[k] + best.errors()[k]);
        Fitter f = new Fitter(m, data, FitSettings.defaults(), new int[] {k}, new double[] {target});
        FitResult r = f.fit();
        assertTrue(r.converged());
        // both converge to the same conditional minimum; tolerance: the fits' precision (~1e-4 σ)
        assertEquals(r.values()[m.poi()] - best.values()[m.poi()], top.postfit().up(), 2e-4 * best.errors()[m.poi()]);
    }

    /**
     * The breakdown's "error with the group fixed" (conditional variance from the full covariance)
     * equals the inverse-Hessian error of a fit with the group held at its best-fit values.
     */
    @Test
    void conditionalVarianceEqualsHeldRefitError() {
        int[] group = {m.indexOf("lumi"), m.indexOf("scale"), m.nParams() + 2};
        double[] at = new double[group.length];
        for (int i = 0; i < group.length; i++) at[i] = best.values()[group[i]];
        FitResult held = new Fitter(m, data, FitSettings.defaults(), group, at).fit();
        assertTrue(held.converged());
        double[] full = impacts(false).fullCovariance();
        double fixedError = Math.sqrt(Covariances.conditionalVariance(full, m.nAll(), m.poi(), group));
        // the held fit starts at the minimum, so its Hessian is the best fit's: agreement to the fits' precision
        assertEquals(held.errors()[m.poi()], fixedError, 1e-4 * fixedError);
        // the full covariance's θ block is the fit's own (Schur complement of the γ block)
        for (int i = 0; i < m.nParams(); i++) {
            assertEquals(best.covariance()[i * m.nParams() + i], full[i * m.nAll() + i], 1e-6 * best.covariance()[i * m.nParams() + i]);
        }
    }

    /** A profile point at the best fit has ΔNLL 0, and ΔNLL grows away from it on both sides. */
    @Test
    void profilePointsAreZeroAtTheBestFitAndGrow() {
        ProfileScan scan = new ProfileScan(m, data, FitSettings.defaults(), new int[0], new double[0], best);
        double v = best.values()[m.poi()], e = best.errors()[m.poi()];
        List<ProfileScan.Point> pts = scan.points(m.poi(), v - 2 * e, v + 2 * e, 5, 2, null);
        assertEquals(0, pts.get(2).nllAboveMin(), 1e-7);
        assertTrue(pts.get(0).nllAboveMin() > pts.get(1).nllAboveMin() && pts.get(1).nllAboveMin() > 0.1);
        assertTrue(pts.get(4).nllAboveMin() > pts.get(3).nllAboveMin() && pts.get(3).nllAboveMin() > 0.1);
        // ~Gaussian: 2ΔNLL at ±2σ near 4
        assertEquals(4, 2 * pts.get(4).nllAboveMin(), 1.0);
    }
}
