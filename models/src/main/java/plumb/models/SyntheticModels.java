package plumb.models;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.PoissonSampler;
import org.apache.commons.rng.simple.RandomSource;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Synthetic models of any size for benchmarks and scale tests, reproducible by seed.
 *
 * <p>Every channel is a falling spectrum over 100–500 GeV: a narrow Gaussian {@code signal} (times
 * the POI {@code mu}) on top of background samples {@code bkg1}, {@code bkg2}, … with exponential
 * and power-law shapes; {@code bkg1} and {@code bkg2} carry the free factors {@code k_bkg1} and
 * {@code k_bkg2}, shared by all channels. About 10% of the nuisance parameters are global (named
 * {@code glob_*}, acting on most samples of every channel, like a luminosity or energy scale); the
 * others ({@code np_*}) act on one or two samples in one to three channels, the sparsity of real
 * models. Variations mix norm-only, shape-only and norm+shape, with some asymmetric and some
 * one-sided ones. Every sample has {@code mcError} (1–10% relative). The observed counts are one
 * Poisson draw from the model at mu = 1 and nominal nuisance parameters.
 *
 * <p>All random numbers come from one xoroshiro128++ stream seeded with the seed, drawn in a fixed
 * order, and generated numbers are rounded to six significant digits: the same seed gives the same
 * model and the same file.
 */
public final class SyntheticModels {

    /** Size of the medium benchmark model. */
    public static final int MEDIUM_CHANNELS = 5, MEDIUM_BINS = 40, MEDIUM_SAMPLES = 6, MEDIUM_NUISANCES = 50;
    /** Size of the large benchmark model. */
    public static final int LARGE_CHANNELS = 20, LARGE_BINS = 50, LARGE_SAMPLES = 8, LARGE_NUISANCES = 300;

    /** Upper bounds that keep a generated model within memory; far above any realistic model. */
    public static final int MAX_CHANNELS = 1000, MAX_BINS = 10_000, MAX_SAMPLES = 100, MAX_NUISANCES = 100_000;
    /** Upper bound on channels × bins × samples. */
    public static final long MAX_CELLS = 10_000_000L;

    /** Mass range of every channel, GeV (invented). */
    private static final double LO = 100.0, HI = 500.0;
    /** Fraction of nuisance parameters that are global (about 10%, as in a typical analysis). */
    private static final double GLOBAL_FRACTION = 0.1;
    /** Chance that a global parameter acts on a given sample of a channel ("most samples"). */
    private static final double GLOBAL_COVERAGE = 0.85;

    private SyntheticModels() {
    }

    /** The medium benchmark model: 5 channels × 40 bins, 6 samples, 50 nuisance parameters. */
    public static Model medium(long seed) {
        return generate(MEDIUM_CHANNELS, MEDIUM_BINS, MEDIUM_SAMPLES, MEDIUM_NUISANCES, seed);
    }

    /** The large benchmark model: 20 channels × 50 bins, 8 samples, 300 nuisance parameters. */
    public static Model large(long seed) {
        return generate(LARGE_CHANNELS, LARGE_BINS, LARGE_SAMPLES, LARGE_NUISANCES, seed);
    }

    /**
     * Generates a model of the given size and writes it to {@code out} (gzip when it ends in
     * {@code .json.gz}); what {@code plumb generate} does. The sizes are checked before anything
     * is written.
     *
     * @throws IllegalArgumentException naming the option ({@code --bins must be >= 1}) of a bad size
     * @throws IOException              if the file cannot be written (nothing is left behind)
     */
    public static void generateFile(int channels, int bins, int samples, int nuisances, long seed, Path out)
            throws IOException {
        if (out == null) throw new IllegalArgumentException("--out is required");
        ModelWriter.write(generate(channels, bins, samples, nuisances, seed), out);
    }

    /**
     * A model with {@code channels} channels of {@code bins} bins each, {@code samples} samples in
     * every channel (the signal and {@code samples − 1} backgrounds) and exactly {@code nuisances}
     * distinct nuisance parameters (besides the POI, the free factors and the MC-statistics ones).
     *
     * @param channels  1 to {@link #MAX_CHANNELS}
     * @param bins      1 to {@link #MAX_BINS}
     * @param samples   2 (signal and one background) to {@link #MAX_SAMPLES}
     * @param nuisances 0 to {@link #MAX_NUISANCES}
     * @param seed      any value; equal seeds give equal models
     * @throws IllegalArgumentException naming the {@code plumb generate} option that is out of range
     */
    public static Model generate(int channels, int bins, int samples, int nuisances, long seed) {
        checkRange("--channels", channels, 1, MAX_CHANNELS);
        checkRange("--bins", bins, 1, MAX_BINS);
        checkRange("--samples", samples, 2, MAX_SAMPLES);
        checkRange("--nuisances", nuisances, 0, MAX_NUISANCES);
        long cells = (long) channels * bins * samples;
        if (cells > MAX_CELLS) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "--channels × --bins × --samples is %d, must be <= %d", cells, MAX_CELLS));
        }
        return new Builder(channels, bins, samples, nuisances, seed).build();
    }

    private static void checkRange(String option, int value, int min, int max) {
        if (value < min) {
            String why = option.equals("--samples") ? " (the signal and at least one background)" : "";
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "%s must be >= %d%s, got %d", option, min, why, value));
        }
        if (value > max) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "%s must be <= %d, got %d", option, max, value));
        }
    }

    /** How a variation is split between its two sides. */
    private enum Sides { SYMMETRIC, ASYMMETRIC, ONE_SIDED }

    /** What a nuisance parameter varies. */
    private enum Kind { NORM, SHAPE, NORM_AND_SHAPE }

    /** One generation run: the random stream and the model under construction. */
    private static final class Builder {
        private final int nChannels, nBins, nSamples, nNuisances;
        private final long seed;
        private final UniformRandomProvider rng;

        private final double[] edges;
        private double mass;
        private final double[] resolution;               // signal width per channel, GeV
        private final double[] signalTotal;              // signal events per channel (whole peak)
        private final double[][][] nominal;              // [channel][sample][bin]
        private final List<List<List<Variation>>> variations = new ArrayList<>(); // [channel][sample]

        Builder(int channels, int bins, int samples, int nuisances, long seed) {
            this.nChannels = channels;
            this.nBins = bins;
            this.nSamples = samples;
            this.nNuisances = nuisances;
            this.seed = seed;
            this.rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
            this.edges = Spectra.uniformEdges(LO, HI, bins);
            this.resolution = new double[channels];
            this.signalTotal = new double[channels];
            this.nominal = new double[channels][samples][];
        }

        Model build() {
            mass = Spectra.round(LO + (HI - LO) * uniform(0.3, 0.7));
            for (int c = 0; c < nChannels; c++) {
                buildNominal(c);
                List<List<Variation>> perSample = new ArrayList<>();
                for (int s = 0; s < nSamples; s++) perSample.add(new ArrayList<>());
                variations.add(perSample);
            }
            int nGlobal = nNuisances == 0 ? 0 : Math.max(1, (int) Math.round(GLOBAL_FRACTION * nNuisances));
            List<String> globals = new ArrayList<>();
            for (int i = 0; i < nNuisances; i++) {
                boolean global = i < nGlobal;
                String name = global ? name("glob_", i, nGlobal) : name("np_", i - nGlobal, nNuisances - nGlobal);
                if (global) globals.add(name);
                addNuisance(name, global, global ? i : i - nGlobal);
            }
            List<Channel> channels = new ArrayList<>();
            for (int c = 0; c < nChannels; c++) channels.add(channel(c));
            Map<String, List<String>> groups = new LinkedHashMap<>();
            if (!globals.isEmpty()) groups.put("global", globals);
            Map<String, Object> labels = new LinkedHashMap<>();
            labels.put("mass", mass);
            String description = String.format(Locale.ROOT,
                    "Synthetic model: %d channels x %d bins, %d samples, %d nuisance parameters, seed %d",
                    nChannels, nBins, nSamples, nNuisances, seed);
            return new Model(Model.FORMAT, "synthetic", description, "mu", channels, List.of(), groups,
                    labels, null);
        }

        /** Signal and background yields of one channel. */
        private void buildNominal(int c) {
            double background = nBins * uniform(5.0, 60.0);     // mean events per bin 5..60
            resolution[c] = mass * uniform(0.008, 0.02);          // narrow: 0.8–2% of the mass
            signalTotal[c] = background * uniform(0.003, 0.012);  // a few sigma over the whole model
            nominal[c][0] = Spectra.round(Spectra.gaussian(edges, signalTotal[c], mass, resolution[c]));
            // Background shares fall with the sample index: bkg1 dominates, later ones are small.
            double[] share = new double[nSamples];
            double sum = 0;
            for (int s = 1; s < nSamples; s++) {
                share[s] = StrictMath.exp(-0.7 * (s - 1)) * uniform(0.6, 1.4);
                sum += share[s];
            }
            for (int s = 1; s < nSamples; s++) {
                double total = background * share[s] / sum;
                double[] y = s % 2 == 1
                        ? Spectra.exponential(edges, total, (HI - LO) * uniform(0.15, 0.6), 1.0)
                        : Spectra.powerLaw(edges, total, uniform(1.5, 5.0), 1.0);
                nominal[c][s] = Spectra.round(y);
            }
        }

        private void addNuisance(String name, boolean global, int index) {
            Kind kind;
            Sides sides;
            if (global && index == 0) {                 // luminosity-like: norm only, symmetric
                kind = Kind.NORM;
                sides = Sides.SYMMETRIC;
            } else if (global && index == 1) {          // energy-scale-like: norm and shape
                kind = Kind.NORM_AND_SHAPE;
                sides = Sides.SYMMETRIC;
            } else {
                double k = rng.nextDouble();
                kind = k < 0.4 ? Kind.NORM : k < 0.7 ? Kind.SHAPE : Kind.NORM_AND_SHAPE;
                double a = rng.nextDouble();
                sides = a < 0.15 ? Sides.ASYMMETRIC : a < 0.22 ? Sides.ONE_SIDED : Sides.SYMMETRIC;
                // Guarantee both irregular forms in any model with a few local parameters.
                if (!global && index == 0) sides = Sides.ASYMMETRIC;
                if (!global && index == 1) sides = Sides.ONE_SIDED;
            }
            double normSize = global ? uniform(0.01, 0.04) : uniform(0.005, 0.1);
            double shapeSize = uniform(0.02, 0.15);
            double downRatio = sides == Sides.ASYMMETRIC ? uniform(0.4, 1.6) : 1.0;
            boolean altShape = rng.nextBoolean();       // tilt or bend; peak shift or width for the signal
            if (global && index == 1) altShape = true;   // the energy scale moves the peak

            if (global) {
                boolean any = false;
                for (int c = 0; c < nChannels; c++) {
                    for (int s = 0; s < nSamples; s++) {
                        if (rng.nextDouble() < GLOBAL_COVERAGE) {
                            attach(c, s, name, global, kind, sides, normSize, shapeSize, downRatio, altShape);
                            any = true;
                        }
                    }
                }
                if (!any) attach(0, 0, name, global, kind, sides, normSize, shapeSize, downRatio, altShape);
            } else {
                int[] chans = pick(nChannels, 1 + rng.nextInt(Math.min(3, nChannels)));
                int[] samps = pick(nSamples, 1 + rng.nextInt(Math.min(2, nSamples)));
                for (int c : chans) {
                    for (int s : samps) attach(c, s, name, global, kind, sides, normSize, shapeSize, downRatio, altShape);
                }
            }
        }

        /** One variation of sample s in channel c; each target gets its own jitter around the sizes. */
        private void attach(int c, int s, String name, boolean global, Kind kind, Sides sides, double normSize,
                            double shapeSize, double downRatio, boolean altShape) {
            double jitter = uniform(0.7, 1.3);
            double flip = rng.nextDouble();
            double sign = !global && flip < 0.2 ? -1.0 : 1.0;  // some local targets move the other way
            Variation.NormEffect norm = null;
            Variation.ShapeEffect shape = null;
            if (kind != Kind.SHAPE) {
                double up = 1.0 + sign * normSize * jitter;
                double down = switch (sides) {
                    case SYMMETRIC -> 1.0 / up;
                    case ASYMMETRIC -> 1.0 - sign * normSize * jitter * downRatio;
                    case ONE_SIDED -> 1.0;
                };
                norm = new Variation.NormEffect(Spectra.round(down), Spectra.round(up));
            }
            if (kind != Kind.NORM) {
                double[] n = nominal[c][s];
                double size = sign * shapeSize * jitter;
                double[] up = shifted(c, s, size, altShape);
                double[] down = sides == Sides.ONE_SIDED ? n.clone() : shifted(c, s, -size * downRatio, altShape);
                // The norm part, if any, carries the change of total: the shape keeps the nominal total.
                shape = new Variation.ShapeEffect(Spectra.emptyWhere(n, Spectra.round(Spectra.sameTotal(down, n))),
                        Spectra.emptyWhere(n, Spectra.round(Spectra.sameTotal(up, n))));
            }
            variations.get(c).get(s).add(new Variation(name, norm, shape, null, null));
        }

        /** Signal: peak moved by size/20 of the mass, or width scaled by 1 + size; backgrounds: tilt or bend. */
        private double[] shifted(int c, int s, double size, boolean alt) {
            if (s == 0) {
                double total = signalTotal[c];
                return alt ? Spectra.gaussian(edges, total, mass * (1.0 + 0.05 * size), resolution[c])
                        : Spectra.gaussian(edges, total, mass, resolution[c] * (1.0 + size));
            }
            return alt ? Spectra.tilt(nominal[c][s], size) : Spectra.bend(nominal[c][s], size);
        }

        private Channel channel(int c) {
            List<Sample> samples = new ArrayList<>(nSamples);
            double[] expected = new double[nBins];
            for (int s = 0; s < nSamples; s++) {
                double[] y = nominal[c][s];
                for (int b = 0; b < nBins; b++) expected[b] += y[b];
                List<String> factors = s == 0 ? List.of("mu") : s <= 2 ? List.of("k_bkg" + s) : List.of();
                samples.add(new Sample(s == 0 ? "signal" : "bkg" + s, y, mcError(y), factors,
                        variations.get(c).get(s)));
            }
            return new Channel(name("ch", c, nChannels), "m [GeV]", edges.clone(), observed(expected), samples);
        }

        /** Relative error 1–10%, larger where the sample is thin, as for weighted simulated events. */
        private double[] mcError(double[] y) {
            double base = uniform(0.01, 0.05);
            double mean = Spectra.sum(y) / y.length;
            double[] err = new double[y.length];
            for (int b = 0; b < y.length; b++) {
                if (y[b] <= 0) continue;
                double rel = Math.min(0.10, Math.max(0.01, base * StrictMath.sqrt(mean / y[b])));
                err[b] = Spectra.round(y[b] * rel);      // no cut-off: a tiny yield keeps its error
            }
            return err;
        }

        private double[] observed(double[] expected) {
            double[] n = new double[expected.length];
            for (int b = 0; b < n.length; b++) {
                n[b] = expected[b] > 0 ? PoissonSampler.of(rng, expected[b]).sample() : 0;
            }
            return n;
        }

        /** k distinct indices from 0..n-1, in increasing order (partial Fisher–Yates). */
        private int[] pick(int n, int k) {
            int[] all = new int[n];
            for (int i = 0; i < n; i++) all[i] = i;
            for (int i = 0; i < k; i++) {
                int j = i + rng.nextInt(n - i);
                int t = all[i];
                all[i] = all[j];
                all[j] = t;
            }
            int[] out = java.util.Arrays.copyOf(all, k);
            java.util.Arrays.sort(out);
            return out;
        }

        private double uniform(double lo, double hi) {
            return lo + (hi - lo) * rng.nextDouble();
        }
    }

    /** prefix + index zero-padded to the width of count − 1, so names sort in index order. */
    private static String name(String prefix, int index, int count) {
        int width = Integer.toString(Math.max(1, count - 1)).length();
        return prefix + String.format(Locale.ROOT, "%0" + width + "d", index);
    }
}
