package plumb.validation;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Models whose expectation is exactly linear in every parameter: a signal s_b·μ, backgrounds,
 * and symmetric shape variations u = n + S, d = n − S with smooth interpolation, whose polynomial
 * part A = (u + d − 2n)/16 vanishes, so Δ = θ·S exactly (docs/model-format.md). With large
 * yields the Poisson terms are Gaussian to O(1/√n): the setting of references.md item 10.
 */
final class LinearModels {

    private LinearModels() {
    }

    /**
     * One channel: signal s·μ, background b, and one symmetric shape variation per row of
     * {@code effects} (S per bin) on the background; θ_k Gaussian, width 1; μ free in [−50, 50].
     */
    static Model channel(double[] s, double[] b, double[][] effects, double[] observed) {
        List<Variation> vars = new ArrayList<>();
        for (int k = 0; k < effects.length; k++) vars.add(symmetric("theta" + k, b, effects[k]));
        Sample sig = new Sample("signal", s, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", b, null, List.of(), vars);
        Channel ch = new Channel("sr", null, null, observed, List.of(sig, bkg));
        return new Model(Model.FORMAT, "linear", null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", 0.0, new double[] {-50, 50}, null, null, false)),
                Map.of(), Map.of(), null);
    }

    /**
     * One bin: signal s·μ, a background b1 with one symmetric shape variation per entry of
     * {@code effects} (parameter "theta"+k), and a background b2 with MC-statistics error δ·b2.
     * μ takes up the bin entirely, so each θ_k and γ is measured by its own constraint alone:
     * after the fit the parameters are uncorrelated with each other, and
     * σ_μ² = (n + Σ S_k² + δ² b2²)/s².
     */
    static Model singleBin(double s, double b1, double[] effects, double b2, double delta, double n,
                           Map<String, List<String>> groups) {
        List<Variation> vars = new ArrayList<>();
        for (int k = 0; k < effects.length; k++) {
            vars.add(symmetric("theta" + k, new double[] {b1}, new double[] {effects[k]}));
        }
        Sample sig = new Sample("signal", new double[] {s}, null, List.of("mu"), List.of());
        Sample bkg1 = new Sample("bkg1", new double[] {b1}, null, List.of(), vars);
        Sample bkg2 = new Sample("bkg2", new double[] {b2}, new double[] {delta * b2}, List.of(), List.of());
        Channel ch = new Channel("sr", null, null, new double[] {n}, List.of(sig, bkg1, bkg2));
        return new Model(Model.FORMAT, "single-bin", null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", 0.0, new double[] {-1000, 1000}, null, null, false)),
                new LinkedHashMap<>(groups), Map.of(), null);
    }

    /**
     * Like {@link #channel}, with an MC-statistics error δ·b on the background in every bin and the
     * given groups of the θ_k; no observed counts (the model is blinded, Asimov data only).
     */
    static Model blindedWithMcStat(double[] s, double[] b, double[][] effects, double delta,
                                   Map<String, List<String>> groups) {
        List<Variation> vars = new ArrayList<>();
        for (int k = 0; k < effects.length; k++) vars.add(symmetric("theta" + k, b, effects[k]));
        double[] mcError = new double[b.length];
        for (int i = 0; i < b.length; i++) mcError[i] = delta * b[i];
        Sample sig = new Sample("signal", s, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", b, mcError, List.of(), vars);
        Channel ch = new Channel("sr", null, null, null, List.of(sig, bkg));
        return new Model(Model.FORMAT, "linear-mcstat", null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", 0.0, new double[] {-50, 50}, null, null, false)),
                new LinkedHashMap<>(groups), Map.of(), null);
    }

    private static Variation symmetric(String name, double[] nominal, double[] effect) {
        double[] up = new double[nominal.length], down = new double[nominal.length];
        for (int i = 0; i < nominal.length; i++) {
            up[i] = nominal[i] + effect[i];
            down[i] = nominal[i] - effect[i];
        }
        return new Variation(name, null, new Variation.ShapeEffect(down, up), null, null);
    }
}
