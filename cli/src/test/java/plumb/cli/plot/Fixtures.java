package plumb.cli.plot;

import java.util.ArrayList;
import java.util.List;

/**
 * Small hand-made inputs for every figure, in the project's demo scenario: a narrow resonance
 * in a two-photon mass spectrum at a fictional collider, invented yields.
 */
public final class Fixtures {

    private Fixtures() {
    }

    /** The demo's invented window: a resonance near 640 GeV, 4 GeV bins. */
    static final double[] EDGES = {620, 624, 628, 632, 636, 640, 644, 648, 652, 656, 660};

    /** Linear-scale channel with edges, three samples, observed counts including a zero. */
    public static StackedYields diphoton(String stage) {
        int n = EDGES.length - 1;
        double[] continuum = new double[n];
        double[] fakes = new double[n];
        double[] resonance = new double[n];
        double[] error = new double[n];
        double[] observed = {412, 361, 322, 371, 352, 238, 199, 187, 160, 151};
        for (int b = 0; b < n; b++) {
            double x = 0.5 * (EDGES[b] + EDGES[b + 1]);
            continuum[b] = 380 * Math.exp(-(x - 620) / 30.0);
            fakes[b] = 45 * Math.exp(-(x - 620) / 45.0);
            resonance[b] = 95 * Math.exp(-0.5 * Math.pow((x - 638) / 3.0, 2));
            error[b] = 0.05 * (continuum[b] + fakes[b] + resonance[b]);
        }
        return new StackedYields("sr_diphoton", stage, "m(γγ) [GeV]", EDGES,
                List.of(new StackedYields.Layer("resonance", resonance, true),
                        new StackedYields.Layer("continuum γγ", continuum, false),
                        new StackedYields.Layer("γ + jet fakes", fakes, false)), error, observed);
    }

    /** Steeply falling channel without edges (numbered bins), spanning four decades: log scale. */
    public static StackedYields falling(boolean blinded) {
        int n = 8;
        double[] main = new double[n];
        double[] minor = new double[n];
        double[] signal = new double[n];
        double[] error = new double[n];
        double[] observed = new double[n];
        for (int b = 0; b < n; b++) {
            main[b] = 20000 * Math.exp(-1.3 * b);
            minor[b] = 300 * Math.exp(-0.6 * b);
            signal[b] = b == 4 ? 40 : 2;
            error[b] = 0.08 * (main[b] + minor[b] + signal[b]);
            observed[b] = Math.round(main[b] + minor[b] + signal[b] * 0.5);
        }
        observed[n - 1] = 0;
        return new StackedYields("ctrl_highpt", "pre-fit", null, null,
                List.of(new StackedYields.Layer("continuum γγ", main, false),
                        new StackedYields.Layer("detector noise <&>", minor, false),
                        new StackedYields.Layer("resonance", signal, true)), error, blinded ? null : observed);
    }

    public static PullMarks pulls() {
        List<PullMarks.Mark> e = new ArrayList<>();
        String[] names = {"photon_energy_scale", "photon_resolution", "lumi", "trigger_eff", "isolation_eff",
                "continuum_shape", "fake_rate", "pileup_model", "vertex_choice", "beam_spread"};
        double[] pulls = {0.42, -0.31, 0.05, 1.3, -0.8, -2.2, 0.2, 0.0, -0.15, 0.6};
        double[] cons = {0.71, 0.92, 0.98, 0.85, 0.99, 0.55, 1.0, 0.97, 0.93, Double.NaN};
        for (int i = 0; i < names.length; i++) e.add(new PullMarks.Mark(names[i], pulls[i], cons[i]));
        return new PullMarks(null, e);
    }

    public static ImpactBars impacts() {
        List<ImpactBars.Bar> e = new ArrayList<>();
        PullMarks p = pulls();
        double[] scale = {0.09, 0.06, 0.035, 0.02, 0.025, 0.11, 0.015, 0.004, 0.01, 0.008};
        for (int i = 0; i < p.entries().size(); i++) {
            PullMarks.Mark pe = p.entries().get(i);
            double s = scale[i];
            double c = Double.isNaN(pe.constraint()) ? 1 : pe.constraint();
            // Parameter 3 moves the POI the same way up and down (a non-linear case).
            double down = i == 3 ? 0.4 * s : -0.9 * s;
            e.add(new ImpactBars.Bar(pe.name(), pe.pull(), pe.constraint(), s, down, s * c, down * c));
        }
        e.add(new ImpactBars.Bar("bkg_norm_free", Double.NaN, Double.NaN, Double.NaN, Double.NaN, 0.05, -0.045));
        return new ImpactBars("mu_res", 1.08, 0.27, e);
    }

    public static CorrelationMatrix correlation(int n) {
        List<String> names = new ArrayList<>();
        double[][] m = new double[n][n];
        for (int i = 0; i < n; i++) {
            names.add(i == 0 ? "mu_res" : "theta_" + i);
            for (int j = 0; j < n; j++) {
                m[i][j] = i == j ? 1 : Math.sin(0.7 * i + 1.3 * j) * Math.sin(0.7 * j + 1.3 * i) * 0.9;
            }
        }
        return new CorrelationMatrix(null, names, m);
    }

    public static ScanCurve scan() {
        int n = 31;
        double[] v = new double[n];
        double[] d = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = i * 0.1;
            double z = (v[i] - 1.1) / (v[i] < 1.1 ? 0.35 : 0.45);
            d[i] = 0.5 * z * z;
        }
        return new ScanCurve("mu_res", v, d, 1.1, new double[] {0.75, 1.55},
                new double[] {0.414, 1.982});
    }

    public static LimitBands limits(boolean observed) {
        List<LimitBands.Point> p = new ArrayList<>();
        for (int m = 0; m <= 8; m++) {
            double mass = 500 + 250 * m;
            double med = 0.3 * Math.exp(-m / 3.0) + 0.02;
            double obs = observed ? med * (1 + 0.25 * Math.sin(1.9 * m)) : Double.NaN;
            p.add(new LimitBands.Point(mass, obs, med * 0.54, med * 0.72, med, med * 1.39, med * 1.87));
        }
        return new LimitBands("σ × B [fb]", "resonance mass [GeV]", 0.95, p);
    }

    public static Linearity linearity() {
        return new Linearity("mu_res", List.of(
                new Linearity.Point(0, 0.03, 0.05), new Linearity.Point(0.5, 0.52, 0.05),
                new Linearity.Point(1, 1.04, 0.06), new Linearity.Point(2, 2.02, 0.07),
                new Linearity.Point(4, 3.91, 0.09)));
    }
}
