package plumb.validation.bench;

import plumb.engine.compile.CompiledModel;

/**
 * The likelihood's bound: only the arithmetic a value + gradient pass must do per (sample, bin,
 * variation) entry, over the compiled model's own arrays in their own layout. Per sample the
 * nominal yields are copied, each shape term adds S·θ + A·θ² to them (the value pass), the bin
 * weights ρ are summed against them, and each shape term sums ρ·S and ρ·A (the gradient pass).
 * Left out: clipping at zero, interpolation, the multiplicative terms' products, MC statistics,
 * the Poisson logarithms and the constraints. Its time per entry is what
 * {@code LikelihoodBenchmark.valueAndGradient} is compared with.
 */
public final class BareLoop {

    private final double[] nominal;
    private final double[] shapeS;
    private final double[] shapeA;
    private final int[] sampleEntryStart;
    private final int[] sampleShapeStart;
    private final int[] shapeCoeffStart;
    private final int[] shapeParam;
    private final int[] sampleBinStart;
    private final double[] base;

    public BareLoop(CompiledModel m) {
        nominal = m.nominalYield();
        shapeS = m.shapeS();
        shapeA = m.shapeA();
        sampleEntryStart = m.sampleEntryStart();
        sampleShapeStart = m.sampleShapeStart();
        shapeCoeffStart = m.shapeCoeffStart();
        shapeParam = m.shapeParam();
        int[] channelBinStart = m.channelBinStart();
        sampleBinStart = new int[m.nSamples()];
        for (int s = 0; s < sampleBinStart.length; s++) sampleBinStart[s] = channelBinStart[m.sampleChannel(s)];
        base = new double[nominal.length];
    }

    /**
     * One pass at the parameters x with bin weights rho (one per bin of the model); adds each shape
     * term's Σ_b ρ_b (S_b + 2 A_b θ) to gradient[its parameter].
     *
     * @return Σ over samples and bins of ρ_b · yield
     */
    public double pass(double[] x, double[] rho, double[] gradient) {
        double total = 0;
        for (int s = 0; s < sampleBinStart.length; s++) {
            int e0 = sampleEntryStart[s], len = sampleEntryStart[s + 1] - e0, b0 = sampleBinStart[s];
            System.arraycopy(nominal, e0, base, e0, len);
            for (int k = sampleShapeStart[s]; k < sampleShapeStart[s + 1]; k++) {
                double p1 = x[shapeParam[k]], p2 = p1 * p1;
                int so = shapeCoeffStart[k];
                for (int b = 0; b < len; b++) base[e0 + b] += shapeS[so + b] * p1 + shapeA[so + b] * p2;
            }
            for (int b = 0; b < len; b++) total += rho[b0 + b] * base[e0 + b];
            for (int k = sampleShapeStart[s]; k < sampleShapeStart[s + 1]; k++) {
                int so = shapeCoeffStart[k];
                double u1 = 0, u2 = 0;
                for (int b = 0; b < len; b++) {
                    u1 += rho[b0 + b] * shapeS[so + b];
                    u2 += rho[b0 + b] * shapeA[so + b];
                }
                gradient[shapeParam[k]] += u1 + 2 * u2 * x[shapeParam[k]];
            }
        }
        return total;
    }
}
