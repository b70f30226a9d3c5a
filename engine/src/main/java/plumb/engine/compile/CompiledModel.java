package plumb.engine.compile;

import plumb.engine.model.ParameterKind;

import java.util.List;
import java.util.Map;

/**
 * A model compiled to flat primitive arrays, read by the likelihood's hot loops. Built by
 * {@link ModelCompiler}; never modified afterwards (the arrays are public for speed and must be
 * treated as read-only).
 *
 * <p>Parameters are indexed 0 .. {@link #nAll}−1: first the {@link #nParams} model parameters in
 * order of first appearance in the file, then the {@link #nGamma} MC-statistics parameters γ in
 * channel and bin order. Bins are indexed globally: channel c owns bins
 * {@code channelBinStart[c] .. channelBinStart[c+1]−1}. Per (sample, bin) entries are stored
 * from {@code sampleEntryStart[s]}, one per bin of the sample's channel.
 */
public final class CompiledModel implements java.io.Serializable {

    private static final long serialVersionUID = 1L;


    // ---- model ----
    public final String name;
    /** Index of the parameter of interest, or −1 when the model names none. */
    public final int poi;
    public final Map<String, Object> labels;

    // ---- parameters (length nAll unless said otherwise) ----
    public final int nParams;
    public final int nGamma;
    public final int nAll;
    public final String[] parameterNames;
    public final ParameterKind[] kind;
    /** Nominal and initial values. */
    public final double[] nominal;
    public final double[] lower;
    public final double[] upper;
    public final boolean[] fixed;
    /** {@link ConstraintType} code per parameter. */
    public final int[] constraintType;
    /** Gaussian: centre of the constraint (the nominal auxiliary value); Poisson: the auxiliary count m. */
    public final double[] auxNominal;
    /** Gaussian width w. */
    public final double[] width;
    /** Poisson τ. */
    public final double[] tau;
    /** Gaussian width, or r of a Poisson constraint, or NaN for a free parameter. */
    public final double[] prefitWidth;
    /**
     * Parameters (length nParams) with a kink at θ = 0: a {@code linear} norm or shape term, or an
     * {@code exponential} norm term with κu·κd ≠ 1. The fitter treats each side as a smooth piece.
     */
    public final boolean[] kinked;
    /**
     * Parameters (length nParams) with a one-sided norm or shape term: up and down on the same side
     * of nominal in some bin, under any interpolation. Such a term turns back inside the range
     * (a turning point under smooth interpolation, a ridge at θ = 0 under linear or exponential),
     * so −ln L can have a minimum on each side; the fitter looks on the other side
     * ({@code OtherSideSearch}).
     */
    public final boolean[] oneSided;
    /** Global bin of each γ (length nGamma). */
    public final int[] gammaBin;
    /** γ index of each global bin, or −1 (length nBins). */
    public final int[] binGamma;

    // ---- channels ----
    public final int nChannels;
    public final int nBins;
    public final String[] channelNames;
    public final String[] observables;
    /** Bin edges per channel, or null. */
    public final double[][] edges;
    /** Observed counts per channel, or null for a blinded channel. */
    public final double[][] observed;
    /** Length nChannels + 1. */
    public final int[] channelBinStart;
    /** Sorted global indices (&lt; nParams) of the parameters acting on each channel. */
    public final int[][] channelParams;

    // ---- samples ----
    public final int nSamples;
    public final String[] sampleNames;
    public final int[] sampleChannel;
    /** Whether the sample takes part in the MC-statistics term. */
    public final boolean[] sampleMcStat;
    /** Length nSamples + 1; entries of sample s start here. */
    public final int[] sampleEntryStart;
    /** Nominal yield per entry. */
    public final double[] nominalYield;

    // ---- multiplicative terms (norm parts and factors) ----
    /** Length nSamples + 1. */
    public final int[] sampleMulStart;
    public final int[] mulParam;
    /** Index of the term's parameter within its channel's {@link #channelParams}. */
    public final int[] mulLocal;
    /** {@link NormInterpolation#COEFFS} coefficients per term. */
    public final double[] mulCoeffs;

    // ---- shape terms ----
    /** Length nSamples + 1. */
    public final int[] sampleShapeStart;
    public final int[] shapeParam;
    public final int[] shapeLocal;
    /** {@link ShapeInterpolation} mode per term. */
    public final int[] shapeMode;
    /** Per term, offset of its per-bin coefficients in {@link #shapeS} and {@link #shapeA}. */
    public final int[] shapeCoeffStart;
    public final double[] shapeS;
    public final double[] shapeA;

    // ---- bookkeeping for people ----
    public final String[] groupNames;
    /** Parameter indices of each group. */
    public final int[][] groupMembers;
    /** Variations dropped by {@code options.pruneBelow}, one line each. */
    public final List<String> pruned;
    /** Warnings for the analyst (one-sided or over-100 % variations, ...). */
    public final List<String> warnings;

    CompiledModel(Builder b) {
        name = b.name;
        poi = b.poi;
        labels = b.labels;
        nParams = b.nParams;
        nGamma = b.nGamma;
        nAll = nParams + nGamma;
        parameterNames = b.parameterNames;
        kind = b.kind;
        nominal = b.nominal;
        lower = b.lower;
        upper = b.upper;
        fixed = b.fixed;
        constraintType = b.constraintType;
        auxNominal = b.auxNominal;
        width = b.width;
        tau = b.tau;
        prefitWidth = b.prefitWidth;
        gammaBin = b.gammaBin;
        kinked = b.kinked;
        oneSided = b.oneSided;
        binGamma = b.binGamma;
        nChannels = b.channelNames.length;
        channelNames = b.channelNames;
        observables = b.observables;
        edges = b.edges;
        observed = b.observed;
        channelBinStart = b.channelBinStart;
        nBins = channelBinStart[nChannels];
        channelParams = b.channelParams;
        nSamples = b.sampleNames.length;
        sampleNames = b.sampleNames;
        sampleChannel = b.sampleChannel;
        sampleMcStat = b.sampleMcStat;
        sampleEntryStart = b.sampleEntryStart;
        nominalYield = b.nominalYield;
        sampleMulStart = b.sampleMulStart;
        mulParam = b.mulParam;
        mulLocal = b.mulLocal;
        mulCoeffs = b.mulCoeffs;
        sampleShapeStart = b.sampleShapeStart;
        shapeParam = b.shapeParam;
        shapeLocal = b.shapeLocal;
        shapeMode = b.shapeMode;
        shapeCoeffStart = b.shapeCoeffStart;
        shapeS = b.shapeS;
        shapeA = b.shapeA;
        groupNames = b.groupNames;
        groupMembers = b.groupMembers;
        pruned = List.copyOf(b.pruned);
        warnings = List.copyOf(b.warnings);
    }

    /** Index of the named parameter (γ included), or −1. */
    public int indexOf(String parameterName) {
        for (int i = 0; i < nAll; i++) if (parameterNames[i].equals(parameterName)) return i;
        return -1;
    }

    /** Index of the named channel, or −1. */
    public int channelIndex(String channelName) {
        for (int c = 0; c < nChannels; c++) if (channelNames[c].equals(channelName)) return c;
        return -1;
    }

    /** Number of bins of channel c. */
    public int bins(int c) {
        return channelBinStart[c + 1] - channelBinStart[c];
    }

    /** Whether any channel is blinded (has no observed counts). */
    public boolean anyBlinded() {
        for (double[] o : observed) if (o == null) return true;
        return false;
    }

    /** Whether any parameter has a one-sided term ({@link #oneSided}): −ln L may have several minima. */
    public boolean anyOneSided() {
        for (boolean b : oneSided) if (b) return true;
        return false;
    }

    /** Whether the parameter has a constraint term (a nuisance parameter in the narrow sense). */
    public boolean constrained(int i) {
        return constraintType[i] != ConstraintType.NONE;
    }

    /** Number of (sample, bin, variation) entries the likelihood walks: the benchmarks' unit of cost. */
    public long entries() {
        long n = 0;
        for (int s = 0; s < nSamples; s++) {
            int bins = sampleEntryStart[s + 1] - sampleEntryStart[s];
            int terms = sampleMulStart[s + 1] - sampleMulStart[s] + sampleShapeStart[s + 1] - sampleShapeStart[s];
            n += (long) bins * Math.max(1, terms);
        }
        return n;
    }

    /** A builder holding this model's arrays (shared, not copied): the start of a what-if variant. */
    Builder toBuilder() {
        Builder b = new Builder();
        b.name = name;
        b.poi = poi;
        b.labels = labels;
        b.nParams = nParams;
        b.nGamma = nGamma;
        b.parameterNames = parameterNames;
        b.kind = kind;
        b.nominal = nominal;
        b.lower = lower;
        b.upper = upper;
        b.auxNominal = auxNominal;
        b.width = width;
        b.tau = tau;
        b.prefitWidth = prefitWidth;
        b.fixed = fixed;
        b.kinked = kinked;
        b.oneSided = oneSided;
        b.constraintType = constraintType;
        b.gammaBin = gammaBin;
        b.binGamma = binGamma;
        b.channelNames = channelNames;
        b.observables = observables;
        b.edges = edges;
        b.observed = observed;
        b.channelBinStart = channelBinStart;
        b.channelParams = channelParams;
        b.sampleNames = sampleNames;
        b.sampleChannel = sampleChannel;
        b.sampleEntryStart = sampleEntryStart;
        b.sampleMcStat = sampleMcStat;
        b.nominalYield = nominalYield;
        b.sampleMulStart = sampleMulStart;
        b.mulParam = mulParam;
        b.mulLocal = mulLocal;
        b.mulCoeffs = mulCoeffs;
        b.sampleShapeStart = sampleShapeStart;
        b.shapeParam = shapeParam;
        b.shapeLocal = shapeLocal;
        b.shapeMode = shapeMode;
        b.shapeCoeffStart = shapeCoeffStart;
        b.shapeS = shapeS;
        b.shapeA = shapeA;
        b.groupNames = groupNames;
        b.groupMembers = groupMembers;
        b.pruned = pruned;
        b.warnings = warnings;
        return b;
    }

    /** Mutable holder the compiler fills; keeps the constructor readable. */
    static final class Builder {
        String name;
        int poi = -1;
        Map<String, Object> labels;
        int nParams;
        int nGamma;
        String[] parameterNames;
        ParameterKind[] kind;
        double[] nominal, lower, upper, auxNominal, width, tau, prefitWidth;
        boolean[] fixed, kinked, oneSided;
        int[] constraintType, gammaBin, binGamma;
        String[] channelNames, observables;
        double[][] edges, observed;
        int[] channelBinStart;
        int[][] channelParams;
        String[] sampleNames;
        int[] sampleChannel, sampleEntryStart;
        boolean[] sampleMcStat;
        double[] nominalYield;
        int[] sampleMulStart, mulParam, mulLocal;
        double[] mulCoeffs;
        int[] sampleShapeStart, shapeParam, shapeLocal, shapeMode, shapeCoeffStart;
        double[] shapeS, shapeA;
        String[] groupNames;
        int[][] groupMembers;
        List<String> pruned;
        List<String> warnings;
    }
}
