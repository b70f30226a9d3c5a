package plumb.engine;

import plumb.engine.model.Channel;
import plumb.engine.model.Interpolation;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;

/** Small models built in code for engine tests. */
public final class TestModels {

    private TestModels() {
    }

    /**
     * Two channels, three samples each, every kind of variation and interpolation, MC-statistics
     * errors on two samples, a free factor, the POI and a Poisson-constrained parameter.
     */
    public static Model mixed(long seed, ModelOptions.McStatConstraint mcStat) {
        Random r = new Random(seed);
        List<Channel> channels = new ArrayList<>();
        for (int c = 0; c < 2; c++) {
            int nb = 6 + 2 * c;
            double[] sig = new double[nb], b1 = new double[nb], b2 = new double[nb];
            for (int b = 0; b < nb; b++) {
                sig[b] = 5 * Math.exp(-0.5 * Math.pow((b - nb / 2.0) / 1.2, 2));
                b1[b] = 80 * Math.exp(-0.3 * b) + 1;
                b2[b] = 20 + 3 * r.nextDouble();
            }
            List<Variation> sigVars = List.of(
                    new Variation("lumi", new Variation.NormEffect(0.97, 1.03), null, null, null),
                    new Variation("scale", null, shape(sig, 0.10, -0.08, r), null, null),
                    new Variation("eff", new Variation.NormEffect(0.9, 1.12), null, Interpolation.EXPONENTIAL, null));
            List<Variation> b1Vars = List.of(
                    new Variation("lumi", new Variation.NormEffect(0.97, 1.03), null, null, null),
                    new Variation("shapeB", new Variation.NormEffect(0.95, 1.07), shape(b1, 0.15, -0.12, r), null, Interpolation.LINEAR),
                    new Variation("lin", new Variation.NormEffect(0.92, 1.05), null, Interpolation.LINEAR, null));
            List<Variation> b2Vars = List.of(
                    new Variation("scale", new Variation.NormEffect(0.98, 1.01), shape(b2, 0.05, 0.03, r), null, null),
                    new Variation("aux", new Variation.NormEffect(0.9, 1.1), null, null, null));
            double[] err1 = new double[nb], err2 = new double[nb];
            for (int b = 0; b < nb; b++) {
                err1[b] = 0.05 * b1[b] + 0.2;
                err2[b] = 0.08 * b2[b];
            }
            List<Sample> samples = List.of(
                    new Sample("signal", sig, null, List.of("mu"), sigVars),
                    new Sample("bkg1", b1, err1, List.of("k" + c), b1Vars),
                    new Sample("bkg2", b2, err2, List.of(), b2Vars));
            double[] obs = new double[nb];
            for (int b = 0; b < nb; b++) obs[b] = Math.round(sig[b] + b1[b] + b2[b] + 4 * r.nextGaussian());
            double[] edges = null;
            if (c == 0) {
                edges = new double[nb + 1];
                for (int b = 0; b <= nb; b++) edges[b] = 100 + 10 * b;
            }
            channels.add(new Channel("ch" + c, null, edges, obs, samples));
        }
        List<ParameterSpec> params = List.of(
                new ParameterSpec("aux", 1.0, new double[] {0.2, 3}, null, new ParameterSpec.Poisson(0.1), true),
                new ParameterSpec("mu", null, new double[] {-2, 10}, null, null, false));
        return new Model(Model.FORMAT, "mixed", null, "mu", channels, params, Map.of(), Map.of(),
                new ModelOptions(0, mcStat, 0));
    }

    private static Variation.ShapeEffect shape(double[] n, double up, double down, Random r) {
        double[] u = new double[n.length], d = new double[n.length];
        for (int b = 0; b < n.length; b++) {
            double tilt = (b - n.length / 2.0) / n.length;
            u[b] = Math.max(0, n[b] * (1 + up * tilt + 0.02 * r.nextGaussian()));
            d[b] = Math.max(0, n[b] * (1 + down * tilt + 0.02 * r.nextGaussian()));
        }
        return new Variation.ShapeEffect(d, u);
    }

    /** One bin, signal s·μ over a known background b (no nuisance parameters), n observed. */
    public static Model countingKnownBackground(double s, double b, double n) {
        Sample sig = new Sample("signal", new double[] {s}, null, List.of("mu"), List.of());
        Sample bkg = new Sample("background", new double[] {b}, null, List.of(), List.of());
        Channel ch = new Channel("sr", null, null, new double[] {n}, List.of(sig, bkg));
        List<ParameterSpec> params = List.of(new ParameterSpec("mu", null, new double[] {-10, 100}, null, null, false));
        return new Model(Model.FORMAT, "counting", null, "mu", List.of(ch), params, Map.of(), Map.of(), null);
    }
}
