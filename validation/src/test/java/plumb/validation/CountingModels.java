package plumb.validation;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;

import java.util.List;
import java.util.Map;

/** Counting experiments written as Plumb models, for checks against closed forms. */
final class CountingModels {

    private CountingModels() {
    }

    /** One bin: signal s·μ over a known background b, n observed; μ free in [lo, hi]. */
    static Model knownBackground(double s, double b, double n, double lo, double hi) {
        Sample sig = new Sample("signal", new double[] {s}, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", new double[] {b}, null, List.of(), List.of());
        Channel ch = new Channel("sr", null, null, new double[] {n}, List.of(sig, bkg));
        return new Model(Model.FORMAT, "counting", null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {lo, hi}, null, null, false)),
                Map.of(), Map.of(), null);
    }

    /**
     * On/off measurement as two channels: "on" has signal μ (one event per unit of μ) plus α·β,
     * "off" has β; β = {@code bkg} times a free factor. Li & Ma's likelihood exactly.
     */
    static Model onOffTwoChannels(double nOn, double nOff, double alpha) {
        Sample sig = new Sample("signal", new double[] {1}, null, List.of("mu"), List.of());
        Sample bOn = new Sample("background", new double[] {alpha * nOff}, null, List.of("k"), List.of());
        Sample bOff = new Sample("background", new double[] {nOff}, null, List.of("k"), List.of());
        Channel on = new Channel("on", null, null, new double[] {nOn}, List.of(sig, bOn));
        Channel off = new Channel("off", null, null, new double[] {nOff}, List.of(bOff));
        return new Model(Model.FORMAT, "onoff", null, "mu", List.of(on, off),
                List.of(new ParameterSpec("mu", null, new double[] {0, 10 * nOn}, null, null, false),
                        new ParameterSpec("k", null, new double[] {1e-6, 100}, null, null, false)),
                Map.of(), Map.of(), null);
    }

    /**
     * The same on/off measurement with the control count as a Poisson constraint: the background
     * α·N_off·k with k constrained by τ = N_off (relative width 1/√N_off) and auxiliary count
     * m = τ = N_off (docs/model-format.md, Poisson constraint).
     */
    static Model onOffPoissonConstraint(double nOn, double nOff, double alpha) {
        Sample sig = new Sample("signal", new double[] {1}, null, List.of("mu"), List.of());
        Sample bOn = new Sample("background", new double[] {alpha * nOff}, null, List.of("k"), List.of());
        Channel on = new Channel("on", null, null, new double[] {nOn}, List.of(sig, bOn));
        return new Model(Model.FORMAT, "onoff-poisson", null, "mu", List.of(on),
                List.of(new ParameterSpec("mu", null, new double[] {0, 10 * nOn}, null, null, false),
                        new ParameterSpec("k", null, new double[] {1e-6, 100}, null,
                                new ParameterSpec.Poisson(1 / Math.sqrt(nOff)), true)),
                Map.of(), Map.of(), null);
    }
}
