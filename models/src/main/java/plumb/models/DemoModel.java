package plumb.models;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.PoissonSampler;
import org.apache.commons.rng.simple.RandomSource;
import plumb.engine.model.Channel;
import plumb.engine.model.Interpolation;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The built-in demonstration model, an invented scenario: a narrow resonance near 640 GeV decaying
 * to two photons, searched for in the Tamarind detector at the Lumen Ring collider (both fictional; the
 * yields are invented).
 *
 * <p>Three channels in m(γγ): the signal region {@code sr_tight} (20 bins of 15 GeV, 500–800 GeV),
 * a low-isolation control region {@code cr_loose_isolation} dominated by jets faking photons, and
 * a low-mass control region {@code cr_low_mass} rich in prompt diphotons. Samples: {@code signal}
 * (times the POI {@code mu}), {@code prompt_diphoton} (free factor {@code k_diphoton}),
 * {@code photon_jet_fakes} and {@code dijet_fakes} (free factor {@code k_fakes}, the latter also times
 * {@code r_dijet}, a transfer factor with a Poisson constraint). Seventeen nuisance parameters mix
 * norm-only, shape-only and norm+shape variations, in five groups.
 *
 * <p>The model file is stored as the class-path resource {@value #RESOURCE}; {@link #build()}
 * recomputes it exactly (StrictMath shapes, six significant digits, one seeded Poisson draw of the
 * observed counts at mu = 1), which a test checks.
 */
public final class DemoModel {

    /** Class-path name of the stored model file. */
    public static final String RESOURCE = "plumb/models/demo.json";

    /** Invented resonance mass and detector resolution, GeV. */
    static final double MASS = 640.0, RESOLUTION = 7.7;

    /**
     * Seed of the one draw of the observed counts. Picked among seeds 1 to 20 as one whose
     * signal-region excess is typical of the expected one (about 2.6 sigma and mu-hat near 1 with
     * the backgrounds held at nominal), so that the demonstration shows a modest excess.
     */
    private static final long DATA_SEED = 5L;

    /** Signal events at mu = 1 in the signal region: an excess of about 2-3 sigma on this background. */
    private static final double SIGNAL_EVENTS = 38.0;

    private static final String SR = "sr_tight", CR_ISO = "cr_loose_isolation", CR_LOW = "cr_low_mass";
    private static final String OBSERVABLE = "m(γγ) [GeV]";

    private DemoModel() {
    }

    /** Class-path name of the stored model file, for copying it out. */
    public static String resourcePath() {
        return RESOURCE;
    }

    /**
     * Opens the stored model file; the caller closes the stream.
     *
     * @throws IllegalStateException if the resource is missing from the class path (a broken build)
     */
    public static InputStream openStream() {
        InputStream in = DemoModel.class.getClassLoader().getResourceAsStream(RESOURCE);
        if (in == null) throw new IllegalStateException("class-path resource " + RESOURCE + " is missing");
        return in;
    }

    /**
     * The stored demonstration model, read from the class path.
     *
     * @throws IllegalStateException if the resource is missing or unreadable (a broken build)
     */
    public static Model load() {
        try (InputStream in = openStream()) {
            return ModelReader.parse(new String(in.readAllBytes(), java.nio.charset.StandardCharsets.UTF_8), RESOURCE);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read class-path resource " + RESOURCE, e);
        }
    }

    /** Regenerates the stored file: {@code java plumb.models.DemoModel models/src/main/resources/plumb/models/demo.json}. */
    public static void main(String[] args) throws IOException {
        if (args.length != 1) throw new IllegalArgumentException("usage: DemoModel OUTPUT_FILE");
        ModelWriter.write(build(), Path.of(args[0]));
    }

    /** Builds the demonstration model from its recipe; equal, byte for byte once written, to the stored file. */
    public static Model build() {
        double[] srEdges = Spectra.uniformEdges(500, 800, 20);
        double[] isoEdges = Spectra.uniformEdges(500, 800, 6);
        double[] lowEdges = Spectra.uniformEdges(300, 500, 8);

        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(DATA_SEED);
        List<Channel> channels = List.of(
                channel(SR, srEdges, signalRegion(srEdges), rng),
                channel(CR_ISO, isoEdges, looseIsolation(isoEdges), rng),
                channel(CR_LOW, lowEdges, lowMass(lowEdges), rng));

        List<ParameterSpec> parameters = List.of(
                new ParameterSpec("mu", null, new double[] {0, 20}, null, null, false),
                // The dijet/photon+jet ratio comes from a counting measurement of ~16 events: Poisson.
                new ParameterSpec("r_dijet", 1.0, new double[] {0.01, 5}, null, new ParameterSpec.Poisson(0.25), true));

        Map<String, List<String>> groups = new LinkedHashMap<>();
        groups.put("photon", List.of("photon_identification", "photon_isolation", "photon_energy_scale",
                "photon_energy_resolution"));
        groups.put("detector", List.of("trigger_efficiency", "pileup"));
        groups.put("luminosity", List.of("luminosity"));
        groups.put("background_modelling", List.of("diphoton_generator_shape", "fake_composition",
                "fake_extrapolation", "dijet_template", "spurious_signal", "low_mass_purity", "r_dijet"));
        groups.put("theory", List.of("diphoton_scale_variation", "signal_acceptance_theory", "signal_pdf",
                "photon_jet_fragmentation"));

        Map<String, Object> labels = new LinkedHashMap<>();
        labels.put("mass", MASS);
        labels.put("collider", "Lumen Ring");
        labels.put("detector", "Tamarind");

        String description = "Demonstration (fictional): search for a narrow resonance near 640 GeV decaying to two"
                + " photons in the Tamarind detector at the Lumen Ring collider. Invented yields; observed counts"
                + " drawn once from the model at mu = 1.";
        return new Model(Model.FORMAT, "lumen_ring_diphoton_demo", description, "mu", channels, parameters,
                groups, labels, null);
    }

    private static Channel channel(String name, double[] edges, List<Sample> samples, UniformRandomProvider rng) {
        double[] observed = new double[edges.length - 1];
        for (int b = 0; b < observed.length; b++) {
            double nu = 0;
            for (Sample s : samples) nu += s.yields()[b];    // mu, k_* and r_dijet are 1, nuisances nominal
            observed[b] = nu > 0 ? PoissonSampler.of(rng, nu).sample() : 0;
        }
        return new Channel(name, OBSERVABLE, edges, observed, samples);
    }

    // ---------------------------------------------------------------- the three regions

    private static List<Sample> signalRegion(double[] e) {
        double[] sig = signalShape(e, SIGNAL_EVENTS, 1.0, 1.0);
        double[] gg = diphoton(e, 1400, 1.0);
        double[] gj = photonJet(e, 520);
        double[] jj = dijet(e, 110);
        return List.of(
                new Sample("signal", sig, null, List.of("mu"), List.of(
                        norm("luminosity", 0.983, 1.017),
                        norm("trigger_efficiency", 0.99, 1.01),
                        norm("photon_identification", 0.972, 1.026),
                        norm("photon_isolation", 0.98, 1.02),
                        shape("photon_energy_scale", signalShape(e, SIGNAL_EVENTS, 0.994, 1.0),
                                signalShape(e, SIGNAL_EVENTS, 1.006, 1.0)),
                        shape("photon_energy_resolution", signalShape(e, SIGNAL_EVENTS, 1.0, 0.85),
                                signalShape(e, SIGNAL_EVENTS, 1.0, 1.15)),
                        both("pileup", 0.988, 1.009, Spectra.sameTotal(Spectra.tilt(sig, 0.02), sig),
                                Spectra.sameTotal(Spectra.tilt(sig, -0.02), sig)),
                        norm("signal_acceptance_theory", 0.97, 1.025),
                        norm("signal_pdf", 0.985, 1.015))),
                new Sample("prompt_diphoton", gg, mcError(gg, 0.03, 0.08), List.of("k_diphoton"), List.of(
                        norm("photon_identification", 0.975, 1.024),
                        norm("photon_isolation", 0.985, 1.015),
                        shape("photon_energy_scale", diphoton(e, 1400, 0.994), diphoton(e, 1400, 1.006)),
                        norm("pileup", 0.996, 1.004),
                        // One-sided: the alternative generator against the nominal one.
                        shape("diphoton_generator_shape", gg.clone(), Spectra.sameTotal(Spectra.tilt(gg, 0.05), gg)),
                        both("diphoton_scale_variation", 0.94, 1.07,
                                Spectra.sameTotal(Spectra.bend(gg, -0.03), gg), Spectra.sameTotal(Spectra.bend(gg, 0.03), gg)),
                        spuriousSignal(e, gg))),
                new Sample("photon_jet_fakes", gj, mcError(gj, 0.05, 0.09), List.of("k_fakes"), List.of(
                        shape("fake_composition", Spectra.sameTotal(Spectra.tilt(gj, -0.08), gj),
                                Spectra.sameTotal(Spectra.tilt(gj, 0.08), gj)),
                        norm("fake_extrapolation", 0.92, 1.09),
                        both("photon_jet_fragmentation", 0.96, 1.05,
                                Spectra.sameTotal(Spectra.bend(gj, -0.05), gj), Spectra.sameTotal(Spectra.bend(gj, 0.05), gj)))),
                new Sample("dijet_fakes", jj, mcError(jj, 0.07, 0.1), List.of("k_fakes", "r_dijet"), List.of(
                        norm("fake_extrapolation", 0.9, 1.12),
                        shape("dijet_template", jj.clone(), Spectra.sameTotal(Spectra.tilt(jj, 0.12), jj)))));
    }

    private static List<Sample> looseIsolation(double[] e) {
        double[] sig = signalShape(e, 0.03 * SIGNAL_EVENTS, 1.0, 1.0); // a little signal leaks in
        double[] gg = diphoton(e, 260, 1.0);
        double[] gj = photonJet(e, 2300);
        double[] jj = dijet(e, 800);
        return List.of(
                new Sample("signal", sig, null, List.of("mu"), List.of(
                        norm("luminosity", 0.983, 1.017),
                        norm("trigger_efficiency", 0.99, 1.01),
                        // Migration: what the tight selection loses, this region gains.
                        norm("photon_isolation", 1.25, 0.75),
                        shape("photon_energy_resolution", signalShape(e, 0.03 * SIGNAL_EVENTS, 1.0, 0.85),
                                signalShape(e, 0.03 * SIGNAL_EVENTS, 1.0, 1.15)))),
                new Sample("prompt_diphoton", gg, mcError(gg, 0.04, 0.09), List.of("k_diphoton"), List.of(
                        norm("photon_isolation", 1.06, 0.94),
                        both("diphoton_scale_variation", 0.95, 1.06,
                                Spectra.sameTotal(Spectra.bend(gg, -0.03), gg), Spectra.sameTotal(Spectra.bend(gg, 0.03), gg)))),
                new Sample("photon_jet_fakes", gj, mcError(gj, 0.02, 0.05), List.of("k_fakes"), List.of(
                        shape("fake_composition", Spectra.sameTotal(Spectra.tilt(gj, -0.06), gj),
                                Spectra.sameTotal(Spectra.tilt(gj, 0.06), gj)))),
                new Sample("dijet_fakes", jj, mcError(jj, 0.03, 0.06), List.of("k_fakes", "r_dijet"), List.of(
                        shape("dijet_template", jj.clone(), Spectra.sameTotal(Spectra.tilt(jj, 0.12), jj)))));
    }

    private static List<Sample> lowMass(double[] e) {
        double[] gg = diphoton(e, 5200, 1.0);
        double[] gj = photonJet(e, 1500);
        double[] jj = dijet(e, 300);
        return List.of(
                new Sample("prompt_diphoton", gg, mcError(gg, 0.015, 0.03), List.of("k_diphoton"), List.of(
                        norm("photon_identification", 0.975, 1.024),
                        shape("photon_energy_scale", diphoton(e, 5200, 0.994), diphoton(e, 5200, 1.006)),
                        shape("diphoton_generator_shape", gg.clone(), Spectra.sameTotal(Spectra.tilt(gg, 0.03), gg)),
                        norm("low_mass_purity", 0.97, 1.03))),
                new Sample("photon_jet_fakes", gj, mcError(gj, 0.03, 0.05), List.of("k_fakes"), List.of(
                        both("photon_jet_fragmentation", 0.95, 1.06,
                                Spectra.sameTotal(Spectra.bend(gj, -0.04), gj), Spectra.sameTotal(Spectra.bend(gj, 0.04), gj)))),
                new Sample("dijet_fakes", jj, mcError(jj, 0.05, 0.08), List.of("k_fakes", "r_dijet"), List.of(
                        shape("dijet_template", jj.clone(), Spectra.sameTotal(Spectra.tilt(jj, 0.10), jj)))));
    }

    // ---------------------------------------------------------------- shapes and variations

    /** Signal peak with the mass scaled by {@code scale} and the resolution by {@code smear}. */
    private static double[] signalShape(double[] e, double events, double scale, double smear) {
        return Spectra.round(Spectra.gaussian(e, events, MASS * scale, RESOLUTION * smear));
    }

    /** Prompt diphotons: m^-4.5, normalised at the nominal energy scale. */
    private static double[] diphoton(double[] e, double events, double scale) {
        return Spectra.round(Spectra.powerLaw(e, events, 4.5, scale));
    }

    /** Photon+jet fakes: steeper than prompt diphotons. */
    private static double[] photonJet(double[] e, double events) {
        return Spectra.round(Spectra.powerLaw(e, events, 5.5, 1.0));
    }

    /** Dijet fakes: steepest, exponential. */
    private static double[] dijet(double[] e, double events) {
        return Spectra.round(Spectra.exponential(e, events, 70.0, 1.0));
    }

    /**
     * Spurious signal: a signal-shaped bump of ±6 events that the background shape may fake, added
     * to the prompt diphotons; linear, since it is an additive number of events.
     */
    private static Variation spuriousSignal(double[] e, double[] gg) {
        double[] bump = Spectra.gaussian(e, 6.0, MASS, RESOLUTION);
        double[] up = new double[gg.length], down = new double[gg.length];
        for (int b = 0; b < gg.length; b++) {
            up[b] = gg[b] + bump[b];
            down[b] = Math.max(0.0, gg[b] - bump[b]);
        }
        return new Variation("spurious_signal", null,
                new Variation.ShapeEffect(Spectra.round(down), Spectra.round(up)), null, Interpolation.LINEAR);
    }

    /**
     * Relative simulation error growing linearly from {@code first} (first bin) to {@code last}
     * (last bin): fewer simulated events in the falling tail.
     */
    private static double[] mcError(double[] y, double first, double last) {
        double[] err = new double[y.length];
        for (int b = 0; b < y.length; b++) {
            double t = y.length == 1 ? 0 : (double) b / (y.length - 1);
            err[b] = Spectra.round(y[b] * (first + (last - first) * t));
        }
        return err;
    }

    private static Variation norm(String parameter, double down, double up) {
        return new Variation(parameter, new Variation.NormEffect(down, up), null, null, null);
    }

    private static Variation shape(String parameter, double[] down, double[] up) {
        return new Variation(parameter, null, new Variation.ShapeEffect(Spectra.round(down), Spectra.round(up)), null, null);
    }

    private static Variation both(String parameter, double kDown, double kUp, double[] down, double[] up) {
        return new Variation(parameter, new Variation.NormEffect(kDown, kUp),
                new Variation.ShapeEffect(Spectra.round(down), Spectra.round(up)), null, null);
    }
}
