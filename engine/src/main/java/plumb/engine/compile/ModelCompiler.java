package plumb.engine.compile;

import plumb.engine.model.BinFactors;
import plumb.engine.model.Channel;
import plumb.engine.model.McStatBins;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ParameterKind;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeSet;

/**
 * Compiles a validated {@link Model} into a {@link CompiledModel}: defaults applied, parameters
 * numbered, MC-statistics parameters generated, variations turned into per-bin coefficients and
 * negligible ones pruned (docs/model-format.md).
 */
public final class ModelCompiler {

    private ModelCompiler() {
    }

    /** Compiles a model the reader has validated. */
    public static CompiledModel compile(Model model) {
        CompiledModel.Builder b = new CompiledModel.Builder();
        b.name = model.name();
        b.labels = model.labels();
        b.pruned = new ArrayList<>();
        b.warnings = new ArrayList<>();
        ModelOptions options = model.options();

        // 1. Parameters in order of first appearance, then one γ per bin that gets one.
        Map<String, ParameterKind> kinds = ParameterKind.of(model);
        List<String> names = new ArrayList<>(kinds.keySet());
        int nChannels = model.channels().size();
        b.channelBinStart = new int[nChannels + 1];
        for (int c = 0; c < nChannels; c++) {
            b.channelBinStart[c + 1] = b.channelBinStart[c] + model.channels().get(c).bins();
        }
        int nBins = b.channelBinStart[nChannels];
        b.binGamma = new int[nBins];
        Arrays.fill(b.binGamma, -1);
        List<Integer> gammaBins = new ArrayList<>();
        List<Double> gammaDelta = new ArrayList<>();
        for (int c = 0; c < nChannels; c++) {
            Channel ch = model.channels().get(c);
            double[] delta = McStatBins.relativeErrors(ch);
            for (int bin = 0; bin < ch.bins(); bin++) {
                if (McStatBins.exists(ch, bin, options)) {
                    int global = b.channelBinStart[c] + bin;
                    b.binGamma[global] = gammaBins.size();
                    gammaBins.add(global);
                    gammaDelta.add(delta[bin]);
                }
            }
        }
        b.nGamma = gammaBins.size();
        b.nParams = names.size() - b.nGamma;
        b.gammaBin = gammaBins.stream().mapToInt(Integer::intValue).toArray();
        int nAll = names.size();
        b.parameterNames = names.toArray(new String[0]);
        allocateParameters(b, nAll);
        for (int i = 0; i < nAll; i++) {
            ParameterKind k = kinds.get(names.get(i));
            b.kind[i] = k;
            int constraint = switch (k) {
                case FACTOR, BIN_FACTOR -> ConstraintType.NONE;
                case VARIATION -> ConstraintType.GAUSSIAN;
                case MC_STATISTICS -> options.mcStatConstraint() == ModelOptions.McStatConstraint.POISSON
                        ? ConstraintType.POISSON : ConstraintType.GAUSSIAN;
            };
            double width = k == ParameterKind.MC_STATISTICS ? gammaDelta.get(i - b.nParams) : 1;
            setDefaults(b, i, k.defaultValue(), k.defaultLow(), k.defaultHigh(), constraint, width);
        }
        Map<String, Integer> index = new LinkedHashMap<>();
        for (int i = 0; i < nAll; i++) index.put(names.get(i), i);
        for (ParameterSpec spec : model.parameters()) {
            Integer i = index.get(spec.name());
            if (i != null) applyOverride(b, i, spec);
        }
        b.poi = model.poi() == null ? -1 : index.getOrDefault(model.poi(), -1);

        // 3. Channels, samples and their terms.
        compileChannels(model, b, index, options.pruneBelow());

        // 4. Groups.
        b.groupNames = model.groups().keySet().toArray(new String[0]);
        b.groupMembers = new int[b.groupNames.length][];
        for (int gi = 0; gi < b.groupNames.length; gi++) {
            List<String> members = model.groups().get(b.groupNames[gi]);
            b.groupMembers[gi] = members.stream().mapToInt(n -> index.getOrDefault(n, -1)).filter(i -> i >= 0).toArray();
        }
        return new CompiledModel(b);
    }

    private static void allocateParameters(CompiledModel.Builder b, int n) {
        b.kind = new ParameterKind[n];
        b.nominal = new double[n];
        b.lower = new double[n];
        b.upper = new double[n];
        b.fixed = new boolean[n];
        b.constraintType = new int[n];
        b.auxNominal = new double[n];
        b.width = new double[n];
        b.tau = new double[n];
        b.prefitWidth = new double[n];
    }

    /** For Gaussian: {@code w} is the width; for Poisson: the relative error r. */
    private static void setDefaults(CompiledModel.Builder b, int i, double value, double lo, double hi,
                                    int constraint, double w) {
        b.nominal[i] = value;
        b.lower[i] = lo;
        b.upper[i] = hi;
        setConstraint(b, i, constraint, value, w);
    }

    private static void setConstraint(CompiledModel.Builder b, int i, int constraint, double center, double w) {
        b.constraintType[i] = constraint;
        b.width[i] = Double.NaN;
        b.tau[i] = Double.NaN;
        b.auxNominal[i] = Double.NaN;
        b.prefitWidth[i] = Double.NaN;
        if (constraint == ConstraintType.GAUSSIAN) {
            b.width[i] = w;
            b.auxNominal[i] = center;
            b.prefitWidth[i] = w;
        } else if (constraint == ConstraintType.POISSON) {
            double tau = 1 / (w * w);
            b.tau[i] = tau;
            b.auxNominal[i] = tau; // m = τ: the parameter's nominal value 1 times τ
            b.prefitWidth[i] = w;
        }
    }

    private static void applyOverride(CompiledModel.Builder b, int i, ParameterSpec spec) {
        if (spec.value() != null) b.nominal[i] = spec.value();
        if (spec.range() != null) {
            b.lower[i] = spec.range()[0];
            b.upper[i] = spec.range()[1];
        }
        if (spec.fixed() != null) b.fixed[i] = spec.fixed();
        if (spec.constraintGiven()) {
            ParameterSpec.Constraint c = spec.constraint();
            if (c == null) {
                setConstraint(b, i, ConstraintType.NONE, 0, 0);
            } else if (c instanceof ParameterSpec.Gaussian g) {
                double center = g.center() == null ? b.nominal[i] : g.center();
                double width = g.width() == null ? 1 : g.width();
                setConstraint(b, i, ConstraintType.GAUSSIAN, center, width);
            } else if (c instanceof ParameterSpec.Poisson p) {
                setConstraint(b, i, ConstraintType.POISSON, 0, p.relative());
            }
        } else if (spec.value() != null && b.constraintType[i] == ConstraintType.GAUSSIAN
                   && b.kind[i] != ParameterKind.MC_STATISTICS) {
            // A default Gaussian constraint is centred on the parameter's value.
            b.auxNominal[i] = b.nominal[i];
        }
    }

    private static void compileChannels(Model model, CompiledModel.Builder b, Map<String, Integer> index,
                                        double pruneBelow) {
        List<Channel> channels = model.channels();
        int nChannels = channels.size();
        b.channelNames = new String[nChannels];
        b.observables = new String[nChannels];
        b.edges = new double[nChannels][];
        b.observed = new double[nChannels][];
        b.channelParams = new int[nChannels][];

        List<String> sampleNames = new ArrayList<>();
        IntList sampleChannel = new IntList();
        List<Boolean> sampleMc = new ArrayList<>();
        IntList entryStart = new IntList();
        // The big tables sized once from the model (a shape's entries counted even if pruned
        // below): growing them by doubling copied hundreds of megabytes on a big model.
        long entries = 0, shapeEntries = 0;
        for (Channel ch : channels) {
            for (Sample s : ch.samples()) {
                entries += ch.bins();
                for (Variation v : s.variations()) if (v.shape() != null) shapeEntries += ch.bins();
            }
        }
        DoubleList nominal = new DoubleList(capacity(entries));
        IntList mulStart = new IntList();
        IntList mulParam = new IntList();
        IntList mulLocal = new IntList();
        DoubleList mulCoeffs = new DoubleList();
        IntList shapeStart = new IntList();
        IntList shapeParam = new IntList();
        IntList shapeLocal = new IntList();
        IntList shapeMode = new IntList();
        IntList shapeCoeffStart = new IntList();
        DoubleList shapeS = new DoubleList(capacity(shapeEntries));
        DoubleList shapeA = new DoubleList(capacity(shapeEntries));
        double[] coeffs = new double[NormInterpolation.COEFFS];
        TreeSet<Integer> oneSided = new TreeSet<>();

        for (int c = 0; c < nChannels; c++) {
            Channel ch = channels.get(c);
            b.channelNames[c] = ch.name();
            b.observables[c] = ch.observable();
            b.edges[c] = ch.edges() == null ? null : ch.edges().clone();
            b.observed[c] = ch.observed() == null ? null : ch.observed().clone();
            int nb = ch.bins();

            // First pass: which terms survive pruning, and so which parameters act on the channel.
            TreeSet<Integer> params = new TreeSet<>();
            for (Sample s : ch.samples()) {
                for (String f : s.factors()) params.add(index.get(f));
                for (int bin = 0; bin < nb; bin++) {
                    if (BinFactors.active(s, bin)) params.add(index.get(BinFactors.name(s.binFactors(), bin)));
                }
                for (Variation v : s.variations()) {
                    if (keepNorm(v, pruneBelow) || keepShape(v, s, pruneBelow)) params.add(index.get(v.parameter()));
                }
            }
            int[] local = params.stream().mapToInt(Integer::intValue).toArray();
            b.channelParams[c] = local;

            for (Sample s : ch.samples()) {
                sampleNames.add(s.name());
                sampleChannel.add(c);
                sampleMc.add(s.mcError() != null);
                entryStart.add(nominal.size());
                // per-bin factors: the nominal yield moves into one term n_b·φ_b per bin (below)
                for (int bin = 0; bin < nb; bin++) nominal.add(s.binFactors() == null ? s.yields()[bin] : 0);
                mulStart.add(mulParam.size());
                shapeStart.add(shapeParam.size());
                String where = ch.name() + "/" + s.name();
                for (Variation v : s.variations()) {
                    int p = index.get(v.parameter());
                    warnAbout(b.warnings, where, v, s);
                    if (v.norm() != null) {
                        if (keepNorm(v, pruneBelow)) {
                            if (turnsBack(v.norm().up() - 1, v.norm().down() - 1, 1)) oneSided.add(p);
                            NormInterpolation.coefficients(normMode(v), v.norm().up(), v.norm().down(), coeffs, 0);
                            mulParam.add(p);
                            mulLocal.add(Arrays.binarySearch(local, p));
                            mulCoeffs.addAll(coeffs);
                        } else {
                            b.pruned.add(String.format(Locale.ROOT, "%s: norm part of %s (largest effect %.3g)",
                                    where, v.parameter(), normEffect(v)));
                        }
                    }
                    if (v.shape() != null) {
                        if (keepShape(v, s, pruneBelow)) {
                            if (turningBins(v, s) > 0) oneSided.add(p);
                            shapeParam.add(p);
                            shapeLocal.add(Arrays.binarySearch(local, p));
                            shapeMode.add(v.shapeMode() == plumb.engine.model.Interpolation.LINEAR
                                    ? ShapeInterpolation.LINEAR : ShapeInterpolation.SMOOTH);
                            shapeCoeffStart.add(shapeS.size());
                            double[] n = s.yields(), up = v.shape().up(), down = v.shape().down();
                            for (int bin = 0; bin < nb; bin++) {
                                shapeS.add((up[bin] - down[bin]) / 2);
                                shapeA.add((up[bin] + down[bin] - 2 * n[bin]) / 16);
                            }
                        } else {
                            b.pruned.add(String.format(Locale.ROOT, "%s: shape part of %s (largest effect %.3g)",
                                    where, v.parameter(), shapeEffect(v, s)));
                        }
                    }
                }
                addBinFactorTerms(s, nb, index, local, shapeParam, shapeLocal, shapeMode, shapeCoeffStart, shapeS, shapeA);
                for (String f : s.factors()) {
                    int p = index.get(f);
                    Arrays.fill(coeffs, 0);
                    coeffs[0] = NormInterpolation.FACTOR;
                    mulParam.add(p);
                    mulLocal.add(Arrays.binarySearch(local, p));
                    mulCoeffs.addAll(coeffs);
                }
            }
        }
        entryStart.add(nominal.size());
        mulStart.add(mulParam.size());
        shapeStart.add(shapeParam.size());

        b.oneSided = new boolean[b.nParams];
        for (int p : oneSided) b.oneSided[p] = true;
        b.kinked = new boolean[b.nParams];
        for (int t = 0; t < mulParam.size(); t++) {
            int mode = (int) mulCoeffs.get(t * NormInterpolation.COEFFS);
            double lu = mulCoeffs.get(t * NormInterpolation.COEFFS + 3), ld = mulCoeffs.get(t * NormInterpolation.COEFFS + 4);
            double ku = mulCoeffs.get(t * NormInterpolation.COEFFS + 1), kd = mulCoeffs.get(t * NormInterpolation.COEFFS + 2);
            boolean kink = (mode == NormInterpolation.LINEAR && ku - 1 != 1 - kd)
                    || (mode == NormInterpolation.EXPONENTIAL && lu != -ld);
            if (kink) b.kinked[mulParam.get(t)] = true;
        }
        for (int k = 0; k < shapeParam.size(); k++) {
            if (shapeMode.get(k) != ShapeInterpolation.LINEAR) continue;
            int from = shapeCoeffStart.get(k);
            int to = k + 1 < shapeParam.size() ? shapeCoeffStart.get(k + 1) : shapeA.size();
            for (int e = from; e < to; e++) if (shapeA.get(e) != 0) b.kinked[shapeParam.get(k)] = true;
        }
        b.sampleNames = sampleNames.toArray(new String[0]);
        b.sampleChannel = sampleChannel.toArray();
        b.sampleMcStat = new boolean[sampleMc.size()];
        for (int s = 0; s < sampleMc.size(); s++) b.sampleMcStat[s] = sampleMc.get(s);
        b.sampleEntryStart = entryStart.toArray();
        b.nominalYield = nominal.toArray();
        b.sampleMulStart = mulStart.toArray();
        b.mulParam = mulParam.toArray();
        b.mulLocal = mulLocal.toArray();
        b.mulCoeffs = mulCoeffs.toArray();
        b.sampleShapeStart = shapeStart.toArray();
        b.shapeParam = shapeParam.toArray();
        b.shapeLocal = shapeLocal.toArray();
        b.shapeMode = shapeMode.toArray();
        b.shapeCoeffStart = shapeCoeffStart.toArray();
        b.shapeS = shapeS.toArray();
        b.shapeA = shapeA.toArray();
    }

    /**
     * A sample with per-bin factors gets, for each bin b with n_b &gt; 0, the shape term n_b·φ_b in
     * bin b (S = n_b there and 0 elsewhere, A = 0) over a compiled nominal of 0: the expectation
     * n_b·φ_b·C_s·γ_b exactly, with the likelihood's ordinary shape-term derivatives. Its samples
     * carry no shape variations (validator), so no other shape term is added to these bins.
     */
    private static void addBinFactorTerms(Sample s, int nb, Map<String, Integer> index, int[] local,
                                          IntList shapeParam, IntList shapeLocal, IntList shapeMode,
                                          IntList shapeCoeffStart, DoubleList shapeS, DoubleList shapeA) {
        if (s.binFactors() == null) return;
        for (int bin = 0; bin < nb; bin++) {
            if (!BinFactors.active(s, bin)) continue;
            int p = index.get(BinFactors.name(s.binFactors(), bin));
            shapeParam.add(p);
            shapeLocal.add(Arrays.binarySearch(local, p));
            shapeMode.add(ShapeInterpolation.LINEAR);   // with A = 0: no kink, Δ = S·φ
            shapeCoeffStart.add(shapeS.size());
            for (int k = 0; k < nb; k++) {
                shapeS.add(k == bin ? s.yields()[bin] : 0);
                shapeA.add(0);
            }
        }
    }

    private static int normMode(Variation v) {
        return switch (v.normMode()) {
            case EXPONENTIAL -> NormInterpolation.EXPONENTIAL;
            case LINEAR -> NormInterpolation.LINEAR;
            case SMOOTH -> NormInterpolation.SMOOTH;
        };
    }

    private static double normEffect(Variation v) {
        return Math.max(Math.abs(v.norm().up() - 1), Math.abs(v.norm().down() - 1));
    }

    private static double shapeEffect(Variation v, Sample s) {
        double largest = 0;
        double[] n = s.yields();
        for (int bin = 0; bin < n.length; bin++) {
            if (n[bin] > 0) {
                largest = Math.max(largest, Math.abs(v.shape().up()[bin] - n[bin]) / n[bin]);
                largest = Math.max(largest, Math.abs(v.shape().down()[bin] - n[bin]) / n[bin]);
            }
        }
        return largest;
    }

    private static boolean keepNorm(Variation v, double pruneBelow) {
        return v.norm() != null && !(normEffect(v) < pruneBelow);
    }

    private static boolean keepShape(Variation v, Sample s, double pruneBelow) {
        return v.shape() != null && !(shapeEffect(v, s) < pruneBelow);
    }

    /**
     * Smallest turn back, relative to the nominal yield, that counts as one-sided for the fitter: a
     * term whose up and down effects lie on the same side of nominal turns back by about the
     * smaller of the two, and a turn of less than 0.1 % of the yield (rounding of a variation meant
     * to stay at nominal on one side) cannot outweigh the constraint and make a second minimum.
     */
    static final double TURN_BACK_MIN = 1e-3;

    /** Whether effects up and down of a yield {@code nominal} lie on the same side and both matter. */
    static boolean turnsBack(double up, double down, double nominal) {
        return up * down > 0 && Math.min(Math.abs(up), Math.abs(down)) >= TURN_BACK_MIN * Math.abs(nominal);
    }

    /** Bins where the shape part of v turns back ({@link #turnsBack}). */
    static int turningBins(Variation v, Sample s) {
        double[] n = s.yields();
        int count = 0;
        for (int bin = 0; bin < n.length; bin++) {
            if (turnsBack(v.shape().up()[bin] - n[bin], v.shape().down()[bin] - n[bin], n[bin])) count++;
        }
        return count;
    }

    /** Warnings an analyst wants to see before fitting: one-sided and over-100 % variations. */
    private static void warnAbout(List<String> warnings, String where, Variation v, Sample s) {
        if (v.norm() != null) {
            double up = v.norm().up() - 1, down = v.norm().down() - 1;
            if (up * down > 0) {
                warnings.add(String.format(Locale.ROOT, "%s: norm variation of %s is one-sided (up %.3g, down %.3g)%s",
                        where, v.parameter(), v.norm().up(), v.norm().down(),
                        turnsBack(up, down, 1) ? severalMinima(v.parameter(), v.normMode()) : ""));
            }
            if (Math.abs(up) > 1 || Math.abs(down) > 1) {
                warnings.add(String.format(Locale.ROOT, "%s: norm variation of %s exceeds 100%%", where, v.parameter()));
            }
        }
        if (v.shape() != null) {
            double[] n = s.yields();
            int sameSide = 0, moving = 0;
            for (int bin = 0; bin < n.length; bin++) {
                double up = v.shape().up()[bin] - n[bin], down = v.shape().down()[bin] - n[bin];
                if (up != 0 || down != 0) moving++;
                if (up * down > 0) sameSide++;
            }
            int turning = turningBins(v, s);
            if (turning > 0 || (moving > 0 && 2 * sameSide > moving)) {
                warnings.add(String.format(Locale.ROOT, "%s: shape variation of %s is one-sided in %d of %d bins%s",
                        where, v.parameter(), sameSide, moving,
                        turning > 0 ? severalMinima(v.parameter(), v.shapeMode()) : ""));
            }
            // Over 100 % in a bin that holds a real part of the sample (1 % of its total or more):
            // far tails of a narrow peak move by large factors without mattering.
            double total = 0;
            for (double y : n) total += y;
            int over = 0;
            for (int bin = 0; bin < n.length; bin++) {
                if (n[bin] <= 0 || n[bin] < 0.01 * total) continue;
                double rel = Math.max(Math.abs(v.shape().up()[bin] - n[bin]), Math.abs(v.shape().down()[bin] - n[bin])) / n[bin];
                if (rel > 1) over++;
            }
            if (over > 0) {
                warnings.add(String.format(Locale.ROOT, "%s: shape variation of %s exceeds 100%% in %d bin%s",
                        where, v.parameter(), over, over == 1 ? "" : "s"));
            }
        }
    }

    /** The clause a one-sided warning ends with: why it matters for the fit. */
    private static String severalMinima(String parameter, plumb.engine.model.Interpolation mode) {
        return String.format(Locale.ROOT, "; with %s interpolation the yield turns back, so -ln L may have several"
                + " minima in %s (the fit also looks on the other side)", mode.jsonName(), parameter);
    }

    /** Growable int array for the compiler (not used in hot paths). */
    static final class IntList {
        private int[] data = new int[16];
        private int size;

        void add(int v) {
            if (size == data.length) data = Arrays.copyOf(data, size * 2);
            data[size++] = v;
        }

        int size() {
            return size;
        }

        int get(int i) {
            return data[i];
        }

        int[] toArray() {
            return Arrays.copyOf(data, size);
        }
    }

    /** Growable double array for the compiler (not used in hot paths). */
    /** An initial capacity: the count, within the largest array (beyond it adding fails as it would anyway). */
    private static int capacity(long count) {
        return (int) Math.min(Math.max(count, 16), Integer.MAX_VALUE - 8);
    }

    static final class DoubleList {
        private double[] data;
        private int size;

        DoubleList() {
            this(16);
        }

        DoubleList(int capacity) {
            data = new double[Math.max(capacity, 1)];
        }

        void add(double v) {
            if (size == data.length) data = Arrays.copyOf(data, size * 2);
            data[size++] = v;
        }

        void addAll(double[] v) {
            for (double x : v) add(x);
        }

        int size() {
            return size;
        }

        double get(int i) {
            return data[i];
        }

        /** The values; the list's own array when full (the list is not used after). */
        double[] toArray() {
            return size == data.length ? data : Arrays.copyOf(data, size);
        }
    }
}
