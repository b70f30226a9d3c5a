package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.ModelReader;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Pre-fit and post-fit yields against a model small enough to solve by hand: one channel of two
 * bins, one sample, one norm variation with exponential interpolation f(θ) = κ^θ and κ = 1.1 both
 * ways (so no kink at 0), and optionally MC-statistics errors. Every expected number below is
 * written from the model alone: first-order error propagation σ_y = |∂y/∂θ| σ_θ with
 * σ_θ² = 1 / (∂²(−ln L)/∂θ²) at the best fit (common practice).
 */
class YieldsTest {

    private static final double KAPPA = 1.1;
    private static final double L = Math.log(KAPPA);
    private static final double[] NOMINAL = {60, 40};
    private static final double[] DATA = {70, 50};

    private static CompiledModel model(boolean mcError) {
        String json = """
                {"format": "plumb-model/1", "name": "yields_by_hand",
                 "channels": [{"name": "sr", "observed": [70, 50],
                   "samples": [{"name": "bkg", "yields": [60, 40], %s
                     "variations": [{"parameter": "eff", "normInterpolation": "exponential",
                                     "norm": {"down": %s, "up": 1.1}}]}]}]}
                """.formatted(mcError ? "\"mcError\": [3, 4]," : "", Double.toString(1 / KAPPA));
        return ModelCompiler.compile(ModelReader.parse(json, "yields_by_hand.json"));
    }

    private static Yields.ChannelYields only(List<Yields.ChannelYields> channels) {
        assertEquals(1, channels.size());
        return channels.get(0);
    }

    @Test
    void prefitErrorsPropagateTheConstraintWidthsAndTheMcStatistics() {
        // Pre-fit, at θ = 0 and γ_b = 1: ν_b = n_b, ∂ν_b/∂θ = n_b ln κ (width 1), ∂ν_b/∂γ_b = n_b
        // (width δ_b = mcError_b / n_b, so that term is mcError_b). The sum over bins shares θ but
        // not the γ_b: σ_sum² = (Σ n_b ln κ)² + Σ mcError_b².
        Problem p = Problem.observed(model(true));
        Yields.ChannelYields c = only(Yields.compute(p.model(), p.data(), p.startValues(),
                new boolean[p.model().nAll()], null, null));
        double[] mc = {3, 4};
        Yields.Band pre = c.totalPrefit();
        for (int b = 0; b < 2; b++) {
            assertEquals(NOMINAL[b], pre.values()[b], 1e-9);
            assertEquals(Math.hypot(NOMINAL[b] * L, mc[b]), pre.errors()[b], 1e-6 * pre.errors()[b], "bin " + b);
        }
        assertEquals(100, pre.sum(), 1e-9);
        assertEquals(Math.sqrt(Math.pow(100 * L, 2) + 9 + 16), pre.sumError(), 1e-6 * pre.sumError());
        assertEquals(null, c.totalPostfit());
        assertEquals(DATA[0], c.observed()[0]);
        assertEquals(DATA[1], c.observed()[1]);
    }

    @Test
    void postfitYieldsAndErrorsMatchTheOneParameterSolution() {
        Problem p = Problem.observed(model(false));
        Fitter fitter = new Fitter(p);
        FitResult best = fitter.fit();
        assertTrue(best.converged(), best.status().toString());
        PostfitCovariance cov = PostfitCovariance.of(fitter.likelihood(), best);
        assertNotNull(cov);
        Yields.ChannelYields c = only(Yields.compute(p, best, cov));

        // −ln L(θ) = Σ_b [ν_b − n_b ln ν_b] + θ²/2 + const with ν_b = N_b κ^θ, so
        // d/dθ = (ν − n) ln κ + θ (ν, n summed over bins) and d²/dθ² = ν ln²κ + 1. Solve the first
        // for θ̂ by bisection (it increases in θ), independently of the engine's minimiser.
        double n = DATA[0] + DATA[1], nu0 = NOMINAL[0] + NOMINAL[1];
        double lo = -6, hi = 6;
        for (int it = 0; it < 200; it++) {
            double mid = 0.5 * (lo + hi);
            if ((nu0 * Math.exp(mid * L) - n) * L + mid > 0) hi = mid; else lo = mid;
        }
        double theta = 0.5 * (lo + hi);
        double scale = Math.exp(theta * L);
        double sigmaTheta = 1 / Math.sqrt(nu0 * scale * L * L + 1);

        Yields.Band post = c.totalPostfit();
        for (int b = 0; b < 2; b++) {
            double nu = NOMINAL[b] * scale;
            assertEquals(nu, post.values()[b], 1e-5 * nu, "bin " + b);   // the fit stops within about 1e-4 σ_θ
            assertEquals(nu * L * sigmaTheta, post.errors()[b], 1e-5 * nu * L * sigmaTheta, "bin " + b);
        }
        // one parameter moves both bins together: the errors add linearly, not in quadrature
        double sumError = nu0 * scale * L * sigmaTheta;
        assertEquals(nu0 * scale, post.sum(), 1e-5 * nu0);
        assertEquals(sumError, post.sumError(), 1e-5 * sumError);
        assertTrue(post.sumError() > 1.3 * Math.hypot(post.errors()[0], post.errors()[1]));
        // the one sample is the whole channel
        assertEquals(post.sumError(), c.samples().get(0).postfit().sumError(), 1e-12 * sumError);
    }
}
