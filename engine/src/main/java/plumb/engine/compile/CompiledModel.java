package plumb.engine.compile;

import plumb.engine.model.ParameterKind;

import java.util.List;
import java.util.Map;

/**
 * A model compiled to flat primitive arrays, read by the likelihood's hot loops. Built by
 * {@link ModelCompiler}; never modified afterwards. Read-only from outside: an element accessor
 * {@code lower(i)} per array, and {@code lower()} for a copy of the whole array (the likelihood
 * takes its copies once, when it is built).
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
    final String name;
    /** Index of the parameter of interest, or −1 when the model names none. */
    final int poi;
    final Map<String, Object> labels;

    // ---- parameters (length nAll unless said otherwise) ----
    final int nParams;
    final int nGamma;
    final int nAll;
    final String[] parameterNames;
    final ParameterKind[] kind;
    /** Nominal and initial values. */
    final double[] nominal;
    final double[] lower;
    final double[] upper;
    final boolean[] fixed;
    /** {@link ConstraintType} code per parameter. */
    final int[] constraintType;
    /** Gaussian: centre of the constraint (the nominal auxiliary value); Poisson: the auxiliary count m. */
    final double[] auxNominal;
    /** Gaussian width w. */
    final double[] width;
    /** Poisson τ. */
    final double[] tau;
    /** Gaussian width, or r of a Poisson constraint, or NaN for a free parameter. */
    final double[] prefitWidth;
    /**
     * Parameters (length nParams) with a kink at θ = 0: a {@code linear} norm or shape term, or an
     * {@code exponential} norm term with κu·κd ≠ 1. The fitter treats each side as a smooth piece.
     */
    final boolean[] kinked;
    /**
     * Parameters (length nParams) with a one-sided norm or shape term: up and down on the same side
     * of nominal in some bin, under any interpolation. Such a term turns back inside the range
     * (a turning point under smooth interpolation, a ridge at θ = 0 under linear or exponential),
     * so −ln L can have a minimum on each side; the fitter looks on the other side
     * ({@code OtherSideSearch}).
     */
    final boolean[] oneSided;
    /** Global bin of each γ (length nGamma). */
    final int[] gammaBin;
    /** γ index of each global bin, or −1 (length nBins). */
    final int[] binGamma;

    // ---- channels ----
    final int nChannels;
    final int nBins;
    final String[] channelNames;
    final String[] observables;
    /** Bin edges per channel, or null. */
    final double[][] edges;
    /** Observed counts per channel, or null for a blinded channel. */
    final double[][] observed;
    /** Length nChannels + 1. */
    final int[] channelBinStart;
    /** Sorted global indices (&lt; nParams) of the parameters acting on each channel. */
    final int[][] channelParams;

    // ---- samples ----
    final int nSamples;
    final String[] sampleNames;
    final int[] sampleChannel;
    /** Whether the sample takes part in the MC-statistics term. */
    final boolean[] sampleMcStat;
    /** Length nSamples + 1; entries of sample s start here. */
    final int[] sampleEntryStart;
    /** Nominal yield per entry. */
    final double[] nominalYield;

    // ---- multiplicative terms (norm parts and factors) ----
    /** Length nSamples + 1. */
    final int[] sampleMulStart;
    final int[] mulParam;
    /** Index of the term's parameter within its channel's {@link #channelParams}. */
    final int[] mulLocal;
    /** {@link NormInterpolation#COEFFS} coefficients per term. */
    final double[] mulCoeffs;

    // ---- shape terms ----
    /** Length nSamples + 1. */
    final int[] sampleShapeStart;
    final int[] shapeParam;
    final int[] shapeLocal;
    /** {@link ShapeInterpolation} mode per term. */
    final int[] shapeMode;
    /** Per term, offset of its per-bin coefficients in {@link #shapeS} and {@link #shapeA}. */
    final int[] shapeCoeffStart;
    final double[] shapeS;
    final double[] shapeA;

    // ---- bookkeeping for people ----
    final String[] groupNames;
    /** Parameter indices of each group. */
    final int[][] groupMembers;
    /** Variations dropped by {@code options.pruneBelow}, one line each. */
    final List<String> pruned;
    /** Warnings for the analyst (one-sided or over-100 % variations, ...). */
    final List<String> warnings;

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

    /** Number of bins of channel c. */
    public int bins(int c) {
        return channelBinStart[c + 1] - channelBinStart[c];
    }

    /** Whether channel c is blinded (has no observed counts). */
    public boolean blinded(int c) {
        return observed[c] == null;
    }

    /** Whether parameter i (&lt; nParams) acts on channel c; no copy of {@code channelParams} is made. */
    public boolean actsOn(int c, int i) {
        return java.util.Arrays.binarySearch(channelParams[c], i) >= 0;
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

    // ---- read-only accessors: element access, or a copy of the whole array ----

    public String name() {
        return name;
    }

    public int poi() {
        return poi;
    }

    public Map<String, Object> labels() {
        return labels;
    }

    public int nParams() {
        return nParams;
    }

    public int nGamma() {
        return nGamma;
    }

    public int nAll() {
        return nAll;
    }

    public String parameterNames(int i) {
        return parameterNames[i];
    }

    /** A copy of {@code parameterNames}. */
    public String[] parameterNames() {
        return parameterNames.clone();
    }

    public ParameterKind kind(int i) {
        return kind[i];
    }

    /** A copy of {@code kind}. */
    public ParameterKind[] kind() {
        return kind.clone();
    }

    public double nominal(int i) {
        return nominal[i];
    }

    /** A copy of {@code nominal}. */
    public double[] nominal() {
        return nominal.clone();
    }

    public double lower(int i) {
        return lower[i];
    }

    /** A copy of {@code lower}. */
    public double[] lower() {
        return lower.clone();
    }

    public double upper(int i) {
        return upper[i];
    }

    /** A copy of {@code upper}. */
    public double[] upper() {
        return upper.clone();
    }

    public boolean fixed(int i) {
        return fixed[i];
    }

    /** A copy of {@code fixed}. */
    public boolean[] fixed() {
        return fixed.clone();
    }

    public int constraintType(int i) {
        return constraintType[i];
    }

    /** A copy of {@code constraintType}. */
    public int[] constraintType() {
        return constraintType.clone();
    }

    public double auxNominal(int i) {
        return auxNominal[i];
    }

    /** A copy of {@code auxNominal}. */
    public double[] auxNominal() {
        return auxNominal.clone();
    }

    public double width(int i) {
        return width[i];
    }

    /** A copy of {@code width}. */
    public double[] width() {
        return width.clone();
    }

    public double tau(int i) {
        return tau[i];
    }

    /** A copy of {@code tau}. */
    public double[] tau() {
        return tau.clone();
    }

    public double prefitWidth(int i) {
        return prefitWidth[i];
    }

    /** A copy of {@code prefitWidth}. */
    public double[] prefitWidth() {
        return prefitWidth.clone();
    }

    public boolean kinked(int i) {
        return kinked[i];
    }

    /** A copy of {@code kinked}. */
    public boolean[] kinked() {
        return kinked.clone();
    }

    public boolean oneSided(int i) {
        return oneSided[i];
    }

    /** A copy of {@code oneSided}. */
    public boolean[] oneSided() {
        return oneSided.clone();
    }

    public int gammaBin(int i) {
        return gammaBin[i];
    }

    /** A copy of {@code gammaBin}. */
    public int[] gammaBin() {
        return gammaBin.clone();
    }

    public int binGamma(int i) {
        return binGamma[i];
    }

    /** A copy of {@code binGamma}. */
    public int[] binGamma() {
        return binGamma.clone();
    }

    public int nChannels() {
        return nChannels;
    }

    public int nBins() {
        return nBins;
    }

    public String channelNames(int i) {
        return channelNames[i];
    }

    /** A copy of {@code channelNames}. */
    public String[] channelNames() {
        return channelNames.clone();
    }

    public String observables(int i) {
        return observables[i];
    }

    /** A copy of {@code observables}. */
    public String[] observables() {
        return observables.clone();
    }

    /** Row {@code i} of {@code edges} (a copy; null where the row is null). */
    public double[] edges(int i) {
        return edges[i] == null ? null : edges[i].clone();
    }

    /** A copy of {@code edges}, rows copied too. */
    public double[][] edges() {
        double[][] out = new double[edges.length][];
        for (int i = 0; i < out.length; i++) out[i] = edges(i);
        return out;
    }

    /** Row {@code i} of {@code observed} (a copy; null where the row is null). */
    public double[] observed(int i) {
        return observed[i] == null ? null : observed[i].clone();
    }

    /** A copy of {@code observed}, rows copied too. */
    public double[][] observed() {
        double[][] out = new double[observed.length][];
        for (int i = 0; i < out.length; i++) out[i] = observed(i);
        return out;
    }

    public int channelBinStart(int i) {
        return channelBinStart[i];
    }

    /** A copy of {@code channelBinStart}. */
    public int[] channelBinStart() {
        return channelBinStart.clone();
    }

    /** Row {@code i} of {@code channelParams} (a copy; null where the row is null). */
    public int[] channelParams(int i) {
        return channelParams[i] == null ? null : channelParams[i].clone();
    }

    /** A copy of {@code channelParams}, rows copied too. */
    public int[][] channelParams() {
        int[][] out = new int[channelParams.length][];
        for (int i = 0; i < out.length; i++) out[i] = channelParams(i);
        return out;
    }

    public int nSamples() {
        return nSamples;
    }

    public String sampleNames(int i) {
        return sampleNames[i];
    }

    /** A copy of {@code sampleNames}. */
    public String[] sampleNames() {
        return sampleNames.clone();
    }

    public int sampleChannel(int i) {
        return sampleChannel[i];
    }

    /** A copy of {@code sampleChannel}. */
    public int[] sampleChannel() {
        return sampleChannel.clone();
    }

    public boolean sampleMcStat(int i) {
        return sampleMcStat[i];
    }

    /** A copy of {@code sampleMcStat}. */
    public boolean[] sampleMcStat() {
        return sampleMcStat.clone();
    }

    public int sampleEntryStart(int i) {
        return sampleEntryStart[i];
    }

    /** A copy of {@code sampleEntryStart}. */
    public int[] sampleEntryStart() {
        return sampleEntryStart.clone();
    }

    /** Number of (sample, bin) entries: the length of {@code nominalYield}. */
    public int nEntries() {
        return nominalYield.length;
    }

    public double nominalYield(int i) {
        return nominalYield[i];
    }

    /** A copy of {@code nominalYield}. */
    public double[] nominalYield() {
        return nominalYield.clone();
    }

    public int sampleMulStart(int i) {
        return sampleMulStart[i];
    }

    /** A copy of {@code sampleMulStart}. */
    public int[] sampleMulStart() {
        return sampleMulStart.clone();
    }

    public int mulParam(int i) {
        return mulParam[i];
    }

    /** A copy of {@code mulParam}. */
    public int[] mulParam() {
        return mulParam.clone();
    }

    public int mulLocal(int i) {
        return mulLocal[i];
    }

    /** A copy of {@code mulLocal}. */
    public int[] mulLocal() {
        return mulLocal.clone();
    }

    public double mulCoeffs(int i) {
        return mulCoeffs[i];
    }

    /** A copy of {@code mulCoeffs}. */
    public double[] mulCoeffs() {
        return mulCoeffs.clone();
    }

    public int sampleShapeStart(int i) {
        return sampleShapeStart[i];
    }

    /** A copy of {@code sampleShapeStart}. */
    public int[] sampleShapeStart() {
        return sampleShapeStart.clone();
    }

    public int shapeParam(int i) {
        return shapeParam[i];
    }

    /** A copy of {@code shapeParam}. */
    public int[] shapeParam() {
        return shapeParam.clone();
    }

    public int shapeLocal(int i) {
        return shapeLocal[i];
    }

    /** A copy of {@code shapeLocal}. */
    public int[] shapeLocal() {
        return shapeLocal.clone();
    }

    public int shapeMode(int i) {
        return shapeMode[i];
    }

    /** A copy of {@code shapeMode}. */
    public int[] shapeMode() {
        return shapeMode.clone();
    }

    public int shapeCoeffStart(int i) {
        return shapeCoeffStart[i];
    }

    /** A copy of {@code shapeCoeffStart}. */
    public int[] shapeCoeffStart() {
        return shapeCoeffStart.clone();
    }

    public double shapeS(int i) {
        return shapeS[i];
    }

    /** A copy of {@code shapeS}. */
    public double[] shapeS() {
        return shapeS.clone();
    }

    public double shapeA(int i) {
        return shapeA[i];
    }

    /** A copy of {@code shapeA}. */
    public double[] shapeA() {
        return shapeA.clone();
    }

    /** Number of parameter groups. */
    public int nGroups() {
        return groupNames.length;
    }

    public String groupNames(int i) {
        return groupNames[i];
    }

    /** A copy of {@code groupNames}. */
    public String[] groupNames() {
        return groupNames.clone();
    }

    /** Row {@code i} of {@code groupMembers} (a copy; null where the row is null). */
    public int[] groupMembers(int i) {
        return groupMembers[i] == null ? null : groupMembers[i].clone();
    }

    /** A copy of {@code groupMembers}, rows copied too. */
    public int[][] groupMembers() {
        int[][] out = new int[groupMembers.length][];
        for (int i = 0; i < out.length; i++) out[i] = groupMembers(i);
        return out;
    }

    public List<String> pruned() {
        return pruned;
    }

    public List<String> warnings() {
        return warnings;
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
