package plumb.validation;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

/** Models of the limit, discovery and goodness-of-fit checks. */
final class LimitModels {

    private LimitModels() {
    }

    /** True when the full-size toy checks are asked for (environment PLUMB_FULL_TOYS=1). */
    static boolean full() {
        return "1".equals(System.getenv("PLUMB_FULL_TOYS"));
    }

    /**
     * One bin: signal s·μ over a background b·k, k constrained by a Poisson auxiliary count with
     * relative width σ_b/b (τ = (b/σ_b)², m = τ; docs/model-format.md).
     */
    static Model poissonBackground(double s, double b, double sigmaB) {
        Sample sig = new Sample("signal", new double[] {s}, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", new double[] {b}, null, List.of("k"), List.of());
        Channel ch = new Channel("sr", null, null, new double[] {s + b}, List.of(sig, bkg));
        return new Model(Model.FORMAT, "poisson-background", null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, 100}, null, null, false),
                        new ParameterSpec("k", null, new double[] {1e-6, 100}, null,
                                new ParameterSpec.Poisson(sigmaB / b), true)),
                Map.of(), Map.of(), null);
    }

    /**
     * Two channels of {@code bins} bins with large counts: a peaked signal (factor mu), a falling
     * background with a free factor and two Gaussian-constrained normalisation nuisances; observed
     * counts equal to the nominal expectation at mu = 1 (rounded).
     */
    static Model highCount(int bins) {
        List<Channel> channels = new java.util.ArrayList<>();
        for (int c = 0; c < 2; c++) {
            double[] sig = new double[bins], bkg = new double[bins], obs = new double[bins];
            for (int i = 0; i < bins; i++) {
                sig[i] = 200 * Math.exp(-0.5 * Math.pow((i - bins / 2.0) / 1.5, 2));
                bkg[i] = (c == 0 ? 2000 : 1200) * Math.exp(-0.15 * i);
                obs[i] = Math.round(sig[i] + bkg[i]);
            }
            Sample s = new Sample("signal", sig, null, List.of("mu"),
                    List.of(new Variation("lumi", new Variation.NormEffect(0.97, 1.03), null, null, null)));
            Sample b = new Sample("background", bkg, null, List.of("k_bkg"),
                    List.of(new Variation(c == 0 ? "eff_a" : "eff_b", new Variation.NormEffect(0.95, 1.06), null, null, null)));
            channels.add(new Channel("ch" + c, null, null, obs, List.of(s, b)));
        }
        return new Model(Model.FORMAT, "high-count", null, "mu", channels, List.of(), Map.of(), Map.of(), null);
    }
}
