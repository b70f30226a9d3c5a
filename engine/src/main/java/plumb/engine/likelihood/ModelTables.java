package plumb.engine.likelihood;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;

import java.util.Map;
import java.util.WeakHashMap;

/**
 * The arrays of a compiled model that the likelihood's loops read, copied once per model and
 * shared by every likelihood of that model (one per thread). The copies never leave this package,
 * so {@link CompiledModel} can stay read-only without the hot loops paying for an accessor call
 * or a copy per evaluation.
 */
final class ModelTables {

    private static final Map<CompiledModel, ModelTables> CACHE = new WeakHashMap<>();

    final String name;
    final int poi;
    final int nParams;
    final int nGamma;
    final int nAll;
    final double[] nominal;
    final double[] lower;
    final double[] upper;
    final boolean[] fixed;
    final int[] constraintType;
    final double[] auxNominal;
    final double[] width;
    final double[] tau;
    final boolean[] kinked;
    final int[] gammaBin;
    final int[] binGamma;
    final int nChannels;
    final int nBins;
    final int[] channelBinStart;
    final int[][] channelParams;
    final int nSamples;
    final int[] sampleChannel;
    final boolean[] sampleMcStat;
    final int[] sampleEntryStart;
    final double[] nominalYield;
    final int[] sampleMulStart;
    final int[] mulParam;
    final int[] mulLocal;
    final double[] mulCoeffs;
    final int[] sampleShapeStart;
    final int[] shapeParam;
    final int[] shapeLocal;
    final int[] shapeMode;
    final int[] shapeCoeffStart;
    final double[] shapeS;
    final double[] shapeA;

    private ModelTables(CompiledModel m) {
        name = m.name();
        poi = m.poi();
        nParams = m.nParams();
        nGamma = m.nGamma();
        nAll = m.nAll();
        nominal = m.nominal();
        lower = m.lower();
        upper = m.upper();
        fixed = m.fixed();
        constraintType = m.constraintType();
        auxNominal = m.auxNominal();
        width = m.width();
        tau = m.tau();
        kinked = m.kinked();
        gammaBin = m.gammaBin();
        binGamma = m.binGamma();
        nChannels = m.nChannels();
        nBins = m.nBins();
        channelBinStart = m.channelBinStart();
        channelParams = m.channelParams();
        nSamples = m.nSamples();
        sampleChannel = m.sampleChannel();
        sampleMcStat = m.sampleMcStat();
        sampleEntryStart = m.sampleEntryStart();
        nominalYield = m.nominalYield();
        sampleMulStart = m.sampleMulStart();
        mulParam = m.mulParam();
        mulLocal = m.mulLocal();
        mulCoeffs = m.mulCoeffs();
        sampleShapeStart = m.sampleShapeStart();
        shapeParam = m.shapeParam();
        shapeLocal = m.shapeLocal();
        shapeMode = m.shapeMode();
        shapeCoeffStart = m.shapeCoeffStart();
        shapeS = m.shapeS();
        shapeA = m.shapeA();
    }

    /** The tables of {@code m}, made on first use. */
    static ModelTables of(CompiledModel m) {
        synchronized (CACHE) {
            return CACHE.computeIfAbsent(m, ModelTables::new);
        }
    }

    /** Number of bins of channel c. */
    int bins(int c) {
        return channelBinStart[c + 1] - channelBinStart[c];
    }

    /** Whether the parameter has a constraint term. */
    boolean constrained(int i) {
        return constraintType[i] != ConstraintType.NONE;
    }
}
