package plumb.engine.compile;

/**
 * What-if variants of a compiled model, for sensitivity studies and projections: the same model
 * with its expected yields scaled (more integrated luminosity) or with the pre-fit widths of some
 * constraints scaled. Arrays that do not change are shared with the original (both are read-only).
 */
public final class ModelVariants {

    private ModelVariants() {
    }

    /**
     * Every expected yield times {@code factor}: nominal yields and both shape coefficients (a
     * shape term is an absolute yield change, so it scales with the yield), and the observed
     * counts. Norm terms and factors are relative and stay; so do the MC-statistics widths δ_b,
     * which are relative errors of the simulation.
     */
    public static CompiledModel yieldsScaled(CompiledModel m, double factor) {
        if (!(factor > 0 && Double.isFinite(factor))) throw new IllegalArgumentException("yield factor " + factor);
        CompiledModel.Builder b = m.toBuilder();
        b.nominalYield = times(m.nominalYield, factor);
        b.shapeS = times(m.shapeS, factor);
        b.shapeA = times(m.shapeA, factor);
        double[][] observed = new double[m.nChannels][];
        for (int c = 0; c < m.nChannels; c++) observed[c] = m.observed[c] == null ? null : times(m.observed[c], factor);
        b.observed = observed;
        return new CompiledModel(b);
    }

    /**
     * The constraints of {@code params} (indices &lt; nAll) with their pre-fit width times
     * {@code factor}: a Gaussian's width w becomes factor·w; a Poisson term's relative width r
     * becomes factor·r, i.e. τ becomes τ/factor² and its nominal auxiliary count m = τ follows.
     * Free parameters are left as they are.
     */
    public static CompiledModel constraintsScaled(CompiledModel m, int[] params, double factor) {
        if (!(factor > 0 && Double.isFinite(factor))) throw new IllegalArgumentException("width factor " + factor);
        CompiledModel.Builder b = m.toBuilder();
        b.width = m.width.clone();
        b.tau = m.tau.clone();
        b.prefitWidth = m.prefitWidth.clone();
        b.auxNominal = m.auxNominal.clone();
        for (int i : params) {
            if (m.constraintType[i] == ConstraintType.GAUSSIAN) {
                b.width[i] *= factor;
                b.prefitWidth[i] *= factor;
            } else if (m.constraintType[i] == ConstraintType.POISSON) {
                b.tau[i] /= factor * factor;
                b.prefitWidth[i] *= factor;
                b.auxNominal[i] = b.tau[i] * m.auxNominal[i] / m.tau[i];
            }
        }
        return new CompiledModel(b);
    }

    private static double[] times(double[] a, double f) {
        double[] out = new double[a.length];
        for (int i = 0; i < a.length; i++) out[i] = a[i] * f;
        return out;
    }
}
