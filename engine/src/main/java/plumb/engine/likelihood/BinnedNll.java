package plumb.engine.likelihood;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.NormInterpolation;
import plumb.engine.compile.ShapeInterpolation;
import plumb.engine.linalg.QuadraticForms;
import plumb.engine.linalg.TwoWay;
import plumb.engine.linalg.WeightedGram;
import plumb.engine.minimise.HingedObjective;
import plumb.engine.minimise.Hinges;
import plumb.engine.minimise.Objective;

import java.util.Arrays;

/**
 * −ln L of docs/model-format.md, constants included, with its analytic gradient and Hessian.
 *
 * <p>Two layouts of the variables. <b>Profiled</b> (default): the variables are the model
 * parameters only; each bin's MC-statistics parameter γ_b is set to its conditional minimum in
 * closed form inside every evaluation (docs/engine.md section 1, Conway arXiv:1103.0354), so the value is
 * the profiled −ln L, its gradient is the ordinary gradient at γ* (envelope theorem) and its
 * Hessian the Schur complement H_θθ − Σ_b h_b h_bᵀ / H_γbγb. <b>Explicit</b>: the γ_b follow the
 * model parameters as ordinary variables (indices nParams .. nAll−1).
 *
 * <p>Structure of the expectation used throughout: ν_sb = base_sb(θ) · C_s(θ) · γ_b, where
 * base_sb = max(0, n_sb + Σ shape terms) depends on the bin and C_s = Π (norm terms, factors)
 * does not. So the gradient with respect to a norm parameter needs one sum per sample, and a shape
 * entry costs two multiply-adds in the value pass and two in the gradient pass.
 *
 * <p>Not thread-safe: one instance per thread; all work arrays are allocated here, none per
 * evaluation.
 */
public final class BinnedNll implements HingedObjective {

    /** Floor of a channel's expectation in a bin (docs/model-format.md). */
    public static final double NU_FLOOR = 1e-10;

    /**
     * Least Σ_c bins_c · L_c² (L_c: parameters acting on channel c) for which the Hessian's channel
     * blocks are made two at a time on two threads: about 10 ms of work, far above the cost of
     * handing one over. Small models (the toys' medium and large ones) stay on one thread.
     */
    static final double PARALLEL_WORK = 2e7;

    private final CompiledModel model;
    /** The model's arrays, read by the loops below. */
    private final ModelTables m;
    private final boolean explicitGamma;
    private final int dim;
    private final int[] channelSampleStart;
    private DataSet data;

    /** Held value of each γ in the profiled layout, NaN where it is solved. */
    private final double[] gammaHeld;

    // ---- work arrays, sized once ----
    private final double[] base;
    private final boolean[] clipped;
    /** Per sample: whether any of its entries is clipped. */
    private final boolean[] sampleClipped;
    private final double[] mulValue;   // g, g', g'' per multiplicative term
    private final double[] dC;         // ∂C_s/∂(term k) per term
    private final double[] sampleC;
    private final double[] shapeP;     // P, P', P'' per shape term
    private final double[] aPart;      // per bin: expectation of samples outside the MC-statistics term
    private final double[] cPart;      // per bin: expectation of samples inside it (γ = 1)
    private final double[] binGammaValue; // γ used per bin (1 where none)
    private final double[] w;          // 1 − n/ν, 0 where the bin does not count
    private final double[] q;          // n/ν²
    private final double[] wGamma;     // w·γ: ∂(−ln L)/∂base·C for samples in the MC-statistics term
    private final double[] gammaValue; // per γ
    private final boolean[] gammaInterior; // solved and inside its range: Schur term applies
    private final double[] tmp3 = new double[3];
    /** Work arrays of {@link #hingesAlong}: one sample's u_e and ∇u_eᵀd, one entry's sparse ∇u_e. */
    private final double[] hingeU;
    private final double[] hingeAlong;
    private final int[] hingeIndex;
    private final double[] hingeValue;
    private final double[] prefix;
    private final double[] suffix;
    private final double[] extended;
    private final double[] extendedGrad;
    /** Channels whose samples all take part in the MC-statistics term: their Hessian is one rank-one term per bin. */
    private final boolean[] channelAllMc;
    /** Most multiplicative terms of a sample, and most bins of a channel whose samples all take part in the MC-statistics term. */
    private final int maxMul, mostBins;
    /** Work space of the channel blocks of the Hessian: one, or two when they are made on two threads. */
    private final ChannelBlock first;
    private ChannelBlock second;
    /** Whether the channel blocks are big enough to be made two at a time ({@link #PARALLEL_WORK}). */
    private boolean parallelBlocks;
    /** Per-sample T_s and per-shape-term sums kept from the gradient pass for the Hessian. */
    private final double[] sampleT;
    private final double[] shapeDBase;
    private final double[] shapeU2;
    private final int stride;

    /**
     * While {@link #gammaBlocks} runs: where the explicit layout's γ terms go instead of the
     * Hessian (curvature d_g per γ, mixed derivatives per γ in its channel's local indices, stride
     * {@link #localStride()}); null otherwise.
     */
    private double[] sinkCurvature;
    private double[] sinkMixed;

    /**
     * While {@link #valueGradientCurvature} runs: the Hessian's terms weighted by w_b = 1 − n_b/ν_b
     * (those with second derivatives of ν) are left out.
     */
    private boolean gaussNewton;

    /** A likelihood in the profiled layout. */
    public BinnedNll(CompiledModel model, DataSet data) {
        this(model, data, false);
    }

    /** A likelihood in the profiled ({@code explicitGamma = false}) or explicit layout. */
    public BinnedNll(CompiledModel model, DataSet data, boolean explicitGamma) {
        this.model = model;
        this.m = ModelTables.of(model);
        this.data = data;
        this.explicitGamma = explicitGamma;
        this.dim = explicitGamma ? m.nAll : m.nParams;
        channelSampleStart = new int[m.nChannels + 1];
        for (int s = 0, c = 0; c < m.nChannels; c++) {
            channelSampleStart[c] = s;
            while (s < m.nSamples && m.sampleChannel[s] == c) s++;
            channelSampleStart[c + 1] = s;
        }
        gammaHeld = new double[m.nGamma];
        Arrays.fill(gammaHeld, Double.NaN);
        for (int g = 0; g < m.nGamma; g++) {
            if (m.fixed[m.nParams + g]) gammaHeld[g] = m.nominal[m.nParams + g];
        }
        int entries = m.nominalYield.length;
        base = new double[entries];
        clipped = new boolean[entries];
        sampleClipped = new boolean[m.nSamples];
        int nMul = m.mulParam.length;
        mulValue = new double[3 * nMul];
        dC = new double[nMul];
        sampleC = new double[m.nSamples];
        shapeP = new double[3 * m.shapeParam.length];
        aPart = new double[m.nBins];
        cPart = new double[m.nBins];
        binGammaValue = new double[m.nBins];
        w = new double[m.nBins];
        q = new double[m.nBins];
        wGamma = new double[m.nBins];
        gammaValue = new double[m.nGamma];
        gammaInterior = new boolean[m.nGamma];
        int mostMul = 0;
        for (int s = 0; s < m.nSamples; s++) {
            mostMul = Math.max(mostMul, m.sampleMulStart[s + 1] - m.sampleMulStart[s]);
        }
        maxMul = mostMul;
        prefix = new double[maxMul + 1];
        suffix = new double[maxMul + 1];
        int maxLocal = 0;
        for (int[] p : m.channelParams) maxLocal = Math.max(maxLocal, p.length);
        extended = new double[m.nAll];
        extendedGrad = new double[m.nAll];
        channelAllMc = new boolean[m.nChannels];
        for (int c = 0; c < m.nChannels; c++) {
            boolean all = true;
            for (int s = channelSampleStart[c]; s < channelSampleStart[c + 1]; s++) all &= m.sampleMcStat[s];
            channelAllMc[c] = all;
        }
        stride = maxLocal;
        int most = 0;
        double work = 0;
        for (int c = 0; c < m.nChannels; c++) {
            int bins = m.channelBinStart[c + 1] - m.channelBinStart[c], L = m.channelParams[c].length;
            if (channelAllMc[c]) most = Math.max(most, bins);
            work += (double) bins * L * L;
        }
        mostBins = most;
        first = new ChannelBlock();
        parallelBlocks = m.nChannels > 1 && work >= PARALLEL_WORK;
        sampleT = new double[m.nSamples];
        shapeDBase = new double[m.shapeParam.length];
        shapeU2 = new double[m.shapeParam.length];
        int mostEntries = 0, mostShapes = 0;
        for (int s = 0; s < m.nSamples; s++) {
            mostEntries = Math.max(mostEntries, m.sampleEntryStart[s + 1] - m.sampleEntryStart[s]);
            mostShapes = Math.max(mostShapes, m.sampleShapeStart[s + 1] - m.sampleShapeStart[s]);
        }
        hingeU = new double[mostEntries];
        hingeAlong = new double[mostEntries];
        hingeIndex = new int[mostShapes];
        hingeValue = new double[mostShapes];
    }

    /** Makes the channel blocks two at a time whatever the model's size (tests: the Hessian must not change). */
    void blocksOnTwoThreads(boolean on) {
        parallelBlocks = on && m.nChannels > 1;
    }

    public CompiledModel model() {
        return model;
    }

    public DataSet data() {
        return data;
    }

    /** Evaluates on other data from now on (toys): the work arrays are reused. */
    public void setData(DataSet data) {
        this.data = data;
    }

    public boolean explicitGamma() {
        return explicitGamma;
    }

    /** Holds γ number g at a value (profiled layout), or releases it with NaN. */
    public void holdGamma(int g, double value) {
        gammaHeld[g] = value;
    }

    /** Whether γ number g is held (profiled layout: fixed in the model or by {@link #holdGamma}). */
    public boolean gammaHeld(int g) {
        return !Double.isNaN(gammaHeld[g]);
    }

    @Override
    public int dimension() {
        return dim;
    }

    @Override
    public double value(double[] x) {
        return evaluate(x, null, null, explicitGamma);
    }

    @Override
    public double valueAndGradient(double[] x, double[] gradient) {
        return evaluate(x, gradient, null, explicitGamma);
    }

    @Override
    public double valueGradientHessian(double[] x, double[] gradient, double[] hessian) {
        return evaluate(x, gradient, hessian, explicitGamma);
    }

    /**
     * −ln L, its gradient, and the Gauss–Newton form of its Hessian: Σ_b (n_b/ν_b²) ∇ν_b ∇ν_bᵀ plus
     * the constraint terms, without the terms w_b ∇²ν_b (w_b = 1 − n_b/ν_b) that make the exact
     * Hessian indefinite far from the minimum; in the profiled layout the γ are eliminated from
     * that matrix by the same Schur complement. Positive semidefinite everywhere, equal to the
     * Hessian where the model matches the data (w_b = 0), and about as costly.
     */
    @Override
    public double valueGradientCurvature(double[] x, double[] gradient, double[] curvature) {
        gaussNewton = true;
        try {
            return evaluate(x, gradient, curvature, explicitGamma);
        } finally {
            gaussNewton = false;
        }
    }

    /**
     * The Hessian over all nAll parameters (γ included as ordinary coordinates) at the model
     * parameters x (profiled layout: γ at their conditional minimum; explicit: as in x). Used for
     * the full post-fit covariance, e.g. the errors of γ and of post-fit yields.
     *
     * @return −ln L at that point
     */
    public double fullHessian(double[] x, double[] hessian) {
        if (!explicitGamma) {
            evaluate(x, null, null, false);
            System.arraycopy(x, 0, extended, 0, m.nParams);
            System.arraycopy(gammaValue, 0, extended, m.nParams, m.nGamma);
        } else {
            System.arraycopy(x, 0, extended, 0, m.nAll);
        }
        return evaluate(extended, extendedGrad, hessian, true);
    }

    /**
     * The blocks of {@link #fullHessian} without its nAll² matrix: the Hessian
     * over the model parameters with γ held at their values (nParams², row-major, no Schur terms),
     * and per γ its curvature d_g = ∂²f/∂γ_g² and mixed derivatives h_g = ∂²f/∂θ∂γ_g over its
     * channel's parameters ({@code CompiledModel.channelParams} order, row g of {@code mixed} with
     * stride {@link #localStride()}; zero in a channel the data set leaves out). The γ block of the
     * full Hessian is diagonal, so these are all of it.
     *
     * @return −ln L at x
     */
    public double gammaBlocks(double[] x, double[] thetaHessian, double[] curvature, double[] mixed) {
        if (!explicitGamma) {
            evaluate(x, null, null, false);
            System.arraycopy(x, 0, extended, 0, m.nParams);
            System.arraycopy(gammaValue, 0, extended, m.nParams, m.nGamma);
        } else {
            System.arraycopy(x, 0, extended, 0, m.nAll);
        }
        java.util.Arrays.fill(curvature, 0, m.nGamma, 0);
        java.util.Arrays.fill(mixed, 0, m.nGamma * stride, 0);
        sinkCurvature = curvature;
        sinkMixed = mixed;
        try {
            return evaluate(extended, extendedGrad, thetaHessian, true);
        } finally {
            sinkCurvature = null;
            sinkMixed = null;
        }
    }

    /**
     * Derivatives of sample s's expected yields at the point of the last evaluation, in the
     * product form ν_sb = base_sb(θ) · C_s(θ) · γ_b: ∂(base_sb C_s)/∂θ = along[b] · direction +
     * Σ_j shape[j·bins + b] · e_(shape term j's parameter), with direction (over the channel's
     * parameters, {@code CompiledModel.channelParams} order) = ∂C_s/∂θ and along = base_sb; ν_sb
     * is that times {@code gammaFactor[b]} (γ_b for a sample in the MC-statistics term, else 1),
     * and ∂ν_sb/∂γ_b = {@code byGamma[b]} (base_sb C_s, or 0). Shape term j is the sample's j-th
     * ({@code CompiledModel.sampleShapeStart[s] + j}); a clipped entry has no shape derivative.
     */
    public void sampleDerivatives(int s, double[] direction, double[] along, double[] shape, double[] gammaFactor,
                                  double[] byGamma) {
        final int c = m.sampleChannel[s];
        final int L = m.channelParams[c].length;
        final int b0 = m.channelBinStart[c];
        final int e0 = m.sampleEntryStart[s], len = m.sampleEntryStart[s + 1] - e0;
        Arrays.fill(direction, 0, L, 0);
        for (int k = m.sampleMulStart[s]; k < m.sampleMulStart[s + 1]; k++) direction[m.mulLocal[k]] += dC[k];
        final double cs = sampleC[s];
        final boolean mc = m.sampleMcStat[s];
        for (int b = 0; b < len; b++) {
            along[b] = base[e0 + b];
            gammaFactor[b] = mc ? binGammaValue[b0 + b] : 1;
            byGamma[b] = mc ? base[e0 + b] * cs : 0;
        }
        final double[] shapeS = m.shapeS, shapeA = m.shapeA;
        for (int k = m.sampleShapeStart[s], j = 0; k < m.sampleShapeStart[s + 1]; k++, j++) {
            int so = m.shapeCoeffStart[k];
            double p1 = shapeP[3 * k + 1];
            for (int b = 0; b < len; b++) {
                shape[j * len + b] = clipped[e0 + b] ? 0 : cs * (shapeS[so + b] + shapeA[so + b] * p1);
            }
        }
    }

    /**
     * w_b = 1 − n_b/ν_b and q_b = n_b/ν_b² of every bin at the point of the last evaluation (0 in a
     * bin that does not count or sits on the floor): the bin's weights in the Hessian.
     */
    public void binWeights(double[] wOut, double[] qOut) {
        System.arraycopy(w, 0, wOut, 0, m.nBins);
        System.arraycopy(q, 0, qOut, 0, m.nBins);
    }

    /** Row stride of the per-γ mixed derivatives of {@link #gammaBlocks}: the most parameters of a channel. */
    public int localStride() {
        return stride;
    }

    /**
     * Values of all nAll parameters at x: the model parameters copied, the γ as solved (profiled
     * layout) or taken from x (explicit).
     */
    public void allValues(double[] x, double[] out) {
        evaluate(x, null, null, explicitGamma);
        System.arraycopy(x, 0, out, 0, m.nParams);
        System.arraycopy(gammaValue, 0, out, m.nParams, m.nGamma);
    }

    /** Expected yield ν_sb of every (sample, bin) entry at x, γ applied, into {@code out}. */
    public void expectedEntries(double[] x, double[] out) {
        evaluate(x, null, null, explicitGamma);
        for (int s = 0; s < m.nSamples; s++) {
            int from = m.sampleEntryStart[s], to = m.sampleEntryStart[s + 1];
            int gb = m.channelBinStart[m.sampleChannel[s]] - from;
            double cs = sampleC[s];
            boolean mc = m.sampleMcStat[s];
            for (int e = from; e < to; e++) out[e] = base[e] * cs * (mc ? binGammaValue[gb + e] : 1);
        }
    }

    /** Expected count ν_b of every bin at x (floored as in the likelihood), into {@code out}. */
    public void expectedBins(double[] x, double[] out) {
        evaluate(x, null, null, explicitGamma);
        for (int c = 0; c < m.nChannels; c++) {
            for (int b = m.channelBinStart[c]; b < m.channelBinStart[c + 1]; b++) {
                out[b] = Math.max(aPart[b] + binGammaValue[b] * cPart[b], NU_FLOOR);
            }
        }
    }

    /**
     * The (sample, bin) entries at x whose unclipped yield n + Σ shape terms lies within
     * {@code tolerance}·(1 + n) of zero and that some shape term moves: where the clip max(0, ·)
     * puts a kink in −ln L. Only entries of channels that count are considered. Writes at most
     * {@code out.length} entry indices; returns how many there are in all.
     */
    public int entriesAtClip(double[] x, double tolerance, int[] out) {
        int found = 0;
        for (int s = 0; s < m.nSamples; s++) {
            if (!data.channelIncluded()[m.sampleChannel[s]] || m.sampleShapeStart[s] == m.sampleShapeStart[s + 1]) continue;
            int e0 = m.sampleEntryStart[s];
            for (int e = e0; e < m.sampleEntryStart[s + 1]; e++) {
                double raw = unclippedBase(x, s, e - e0, null);
                if (Math.abs(raw) <= tolerance * (1 + m.nominalYield[e]) && movesWithShape(s, e - e0)) {
                    if (found < out.length) out[found] = e;
                    found++;
                }
            }
        }
        return found;
    }

    /**
     * The clip kinks a step crosses ({@link HingedObjective}): entries whose unclipped yield
     * u_e = n_e + Σ shape terms changes sign between x and x + d (to first order), with slope
     * a_e = ∂(−ln L)/∂base_e = C_s·(1 − n_b/ν_b)·γ_b &gt; 0 (with γ at its conditional minimum in the
     * profiled layout: the envelope theorem) and gradient ∇u_e over the model parameters. Channels
     * the data leave out have a_e = 0 and are skipped.
     */
    @Override
    public void hingesAlong(double[] x, double[] d, Hinges out) {
        boolean slopesAtX = false;
        for (int s = 0; s < m.nSamples; s++) {
            final int c = m.sampleChannel[s];
            final int k0 = m.sampleShapeStart[s], k1 = m.sampleShapeStart[s + 1];
            if (!data.channelIncluded()[c] || k0 == k1) continue;
            final int e0 = m.sampleEntryStart[s], len = m.sampleEntryStart[s + 1] - e0;
            System.arraycopy(m.nominalYield, e0, hingeU, 0, len);
            Arrays.fill(hingeAlong, 0, len, 0);
            for (int k = k0; k < k1; k++) {
                final int p = m.shapeParam[k], so = m.shapeCoeffStart[k];
                ShapeInterpolation.evaluate(m.shapeMode[k], x[p], tmp3);
                final double t = x[p], pv = tmp3[0], p1 = tmp3[1], dp = d[p];
                for (int b = 0; b < len; b++) {
                    hingeU[b] += m.shapeS[so + b] * t + m.shapeA[so + b] * pv;
                    hingeAlong[b] += (m.shapeS[so + b] + m.shapeA[so + b] * p1) * dp;
                }
            }
            for (int b = 0; b < len; b++) {
                final double u = hingeU[b];
                if ((u >= 0) == (u + hingeAlong[b] >= 0) || out.contains(e0 + b)) continue;
                if (!slopesAtX) {
                    evaluate(x, null, null, explicitGamma); // w, γ and C_s at x
                    slopesAtX = true;
                }
                final int bin = m.channelBinStart[c] + b;
                final double a = sampleC[s] * (m.sampleMcStat[s] ? wGamma[bin] : w[bin]);
                if (!(a > 0)) continue; // a ridge: crossing it only helps the step
                int nz = 0;
                for (int k = k0; k < k1; k++) {
                    final int p = m.shapeParam[k], so = m.shapeCoeffStart[k];
                    ShapeInterpolation.evaluate(m.shapeMode[k], x[p], tmp3);
                    final double v = m.shapeS[so + b] + m.shapeA[so + b] * tmp3[1];
                    if (v == 0) continue;
                    int at = 0;
                    while (at < nz && hingeIndex[at] != p) at++;
                    if (at == nz) {
                        hingeIndex[nz] = p;
                        hingeValue[nz++] = v;
                    } else {
                        hingeValue[at] += v;
                    }
                }
                out.add(e0 + b, u, a, hingeIndex, hingeValue, nz);
            }
        }
    }

    /** Whether some shape term of sample s changes its yield in the bin (else no kink can sit there). */
    private boolean movesWithShape(int s, int bin) {
        for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
            int so = m.shapeCoeffStart[k] + bin;
            if (m.shapeS[so] != 0 || m.shapeA[so] != 0) return true;
        }
        return false;
    }

    /** The sample owning entry e. */
    public int sampleOfEntry(int e) {
        int s = 0;
        while (m.sampleEntryStart[s + 1] <= e) s++;
        return s;
    }

    /**
     * n_e + Σ_k Δ_k(θ) of one entry without the clip, and (when {@code gradient} is not null) its
     * gradient over the model parameters (length nParams, overwritten).
     */
    public double unclippedBase(double[] x, int s, int bin, double[] gradient) {
        if (gradient != null) Arrays.fill(gradient, 0, m.nParams, 0);
        double raw = m.nominalYield[m.sampleEntryStart[s] + bin];
        for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
            int p = m.shapeParam[k], so = m.shapeCoeffStart[k] + bin;
            ShapeInterpolation.evaluate(m.shapeMode[k], x[p], tmp3);
            raw += m.shapeS[so] * x[p] + m.shapeA[so] * tmp3[0];
            if (gradient != null) gradient[p] += m.shapeS[so] + m.shapeA[so] * tmp3[1];
        }
        return raw;
    }

    private double evaluate(double[] x, double[] grad, double[] hess, boolean explicit) {
        final ModelTables m = this.m;
        final double[] counts = data.counts();
        final double[] aux = data.aux();
        final int nP = m.nParams;
        final int n = explicit ? m.nAll : nP;
        // the Hessian's row stride: nParams when the γ terms go to the sinks of gammaBlocks
        final int hs = sinkCurvature != null ? nP : n;
        if (grad != null) Arrays.fill(grad, 0, n, 0);
        if (hess != null) Arrays.fill(hess, 0, hs * hs, 0);

        multiplicativeTerms(x);
        shapeTerms(x);
        baseYields(x);

        double nll = data.constant();
        for (int c = 0; c < m.nChannels; c++) {
            nll += channelTerms(c, x, explicit);
        }
        nll += constraintTerms(x, grad, hess, explicit, hs);

        if (grad != null) {
            gradientTerms(grad, hess != null, explicit);
            if (hess != null) channelBlocks(hess, hs, explicit);
        }
        return nll;
    }

    /** g, g', g'' of every multiplicative term; C_s and ∂C_s/∂(term) without division (g may be 0). */
    private void multiplicativeTerms(double[] x) {
        final int[] mulParam = m.mulParam;
        final double[] coeffs = m.mulCoeffs;
        for (int s = 0; s < m.nSamples; s++) {
            int from = m.sampleMulStart[s], to = m.sampleMulStart[s + 1];
            int len = to - from;
            prefix[0] = 1;
            for (int k = 0; k < len; k++) {
                int t = from + k;
                NormInterpolation.evaluate(coeffs, t * NormInterpolation.COEFFS, x[mulParam[t]], tmp3);
                mulValue[3 * t] = tmp3[0];
                mulValue[3 * t + 1] = tmp3[1];
                mulValue[3 * t + 2] = tmp3[2];
                prefix[k + 1] = prefix[k] * tmp3[0];
            }
            suffix[len] = 1;
            for (int k = len - 1; k >= 0; k--) suffix[k] = suffix[k + 1] * mulValue[3 * (from + k)];
            sampleC[s] = prefix[len];
            for (int k = 0; k < len; k++) dC[from + k] = mulValue[3 * (from + k) + 1] * prefix[k] * suffix[k + 1];
        }
    }

    private void shapeTerms(double[] x) {
        final int[] shapeParam = m.shapeParam;
        for (int k = 0; k < shapeParam.length; k++) {
            ShapeInterpolation.evaluate(m.shapeMode[k], x[shapeParam[k]], tmp3);
            shapeP[3 * k] = tmp3[0];
            shapeP[3 * k + 1] = tmp3[1];
            shapeP[3 * k + 2] = tmp3[2];
        }
    }

    /** base_sb = max(0, n_sb + Σ_k S·θ_k + A·P(θ_k)). */
    private void baseYields(double[] x) {
        final double[] shapeS = m.shapeS, shapeA = m.shapeA;
        for (int s = 0; s < m.nSamples; s++) {
            int from = m.sampleEntryStart[s], len = m.sampleEntryStart[s + 1] - from;
            System.arraycopy(m.nominalYield, from, base, from, len);
            for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
                double p1 = x[m.shapeParam[k]], p2 = shapeP[3 * k];
                int so = m.shapeCoeffStart[k];
                for (int b = 0; b < len; b++) base[from + b] += shapeS[so + b] * p1 + shapeA[so + b] * p2;
            }
            boolean any = false;
            for (int e = from; e < from + len; e++) {
                boolean neg = base[e] < 0;
                clipped[e] = neg;
                any |= neg;
                if (neg) base[e] = 0;
            }
            sampleClipped[s] = any;
        }
    }

    /** Splits each bin's expectation, sets its γ, and returns the channel's Poisson terms. */
    private double channelTerms(int c, double[] x, boolean explicit) {
        final int b0 = m.channelBinStart[c], b1 = m.channelBinStart[c + 1];
        final boolean included = data.channelIncluded()[c];
        final double[] counts = data.counts();
        Arrays.fill(aPart, b0, b1, 0);
        Arrays.fill(cPart, b0, b1, 0);
        for (int s = channelSampleStart[c]; s < channelSampleStart[c + 1]; s++) {
            double cs = sampleC[s];
            int e0 = m.sampleEntryStart[s] - b0;
            double[] part = m.sampleMcStat[s] ? cPart : aPart;
            for (int b = b0; b < b1; b++) part[b] += base[e0 + b] * cs;
        }
        double sum = 0;
        for (int b = b0; b < b1; b++) {
            int g = m.binGamma[b];
            double gamma = 1;
            if (g >= 0) {
                gamma = gammaFor(g, b, x, explicit, included);
                gammaValue[g] = gamma;
            }
            binGammaValue[b] = gamma;
            double v = aPart[b] + gamma * cPart[b];
            if (!included) {
                w[b] = 0;
                q[b] = 0;
                wGamma[b] = 0;
                continue;
            }
            double nb = counts[b];
            if (v < NU_FLOOR) {
                v = NU_FLOOR;
                w[b] = 0;   // the floor does not move with the parameters
                q[b] = 0;
            } else {
                w[b] = 1 - nb / v;
                q[b] = nb / (v * v);
            }
            wGamma[b] = w[b] * gamma;
            // ν − n ln ν minus its value at ν = n (which sits in the data constant): no cancellation.
            sum += nb > 0 ? v - nb - nb * Math.log(v / nb) : v;
        }
        return sum;
    }

    private double gammaFor(int g, int b, double[] x, boolean explicit, boolean included) {
        int idx = m.nParams + g;
        if (explicit) {
            gammaInterior[g] = false;
            return x[idx];
        }
        if (!Double.isNaN(gammaHeld[g])) {
            gammaInterior[g] = false;
            return gammaHeld[g];
        }
        double gamma = included
                ? solveGamma(aPart[b], cPart[b], data.counts()[b], idx)
                : constraintMinimum(idx);
        double lo = m.lower[idx], hi = m.upper[idx];
        boolean inside = gamma > lo && gamma < hi;
        gammaInterior[g] = inside;
        return inside ? gamma : (gamma <= lo ? lo : hi);
    }

    /**
     * The γ minimising the bin's terms plus its constraint, ν = a + γc: the positive root of
     * Aγ² + Bγ + C = 0 (docs/engine.md section 1), taken in the form without cancellation.
     */
    private double solveGamma(double a, double c, double n, int idx) {
        double aux = data.aux()[idx];
        if (!(c > 0)) return constraintMinimum(idx);
        double qa, qb, qc;
        switch (m.constraintType[idx]) {
            case ConstraintType.GAUSSIAN -> {
                double w2 = m.width[idx] * m.width[idx];
                qa = c;
                qb = c * c * w2 + a - aux * c;
                qc = c * w2 * (a - n) - aux * a;
            }
            case ConstraintType.POISSON -> {
                double tau = m.tau[idx];
                qa = c * (c + tau);
                qb = a * (c + tau) - c * (n + aux);
                qc = -aux * a;
            }
            default -> {
                return (n - a) / c;
            }
        }
        double disc = Math.max(qb * qb - 4 * qa * qc, 0);
        double root = Math.sqrt(disc);
        return qb > 0 ? 2 * qc / (-qb - root) : (-qb + root) / (2 * qa);
    }

    /** Where the constraint alone is smallest: a bin that does not count, or one γ cannot move. */
    private double constraintMinimum(int idx) {
        double aux = data.aux()[idx];
        return switch (m.constraintType[idx]) {
            case ConstraintType.GAUSSIAN -> aux;
            case ConstraintType.POISSON -> aux / m.tau[idx];
            default -> m.nominal[idx];
        };
    }

    private double constraintTerms(double[] x, double[] grad, double[] hess, boolean explicit, int n) {
        final double[] aux = data.aux();
        double sum = 0;
        for (int i = 0; i < m.nAll; i++) {
            int type = m.constraintType[i];
            if (type == ConstraintType.NONE) continue;
            boolean isGamma = i >= m.nParams;
            double v = isGamma ? gammaValue[i - m.nParams] : x[i];
            boolean derivatives = !isGamma || explicit;
            if (type == ConstraintType.GAUSSIAN) {
                double inv = 1 / (m.width[i] * m.width[i]);
                double d = v - aux[i];
                sum += 0.5 * d * d * inv;
                if (derivatives && grad != null) grad[i] += d * inv;
                if (derivatives && hess != null) addCurvature(hess, i, n, inv);
            } else {
                double mAux = aux[i], tau = m.tau[i];
                sum += tau * v - (mAux > 0 ? mAux * Math.log(v) : 0);
                if (derivatives && grad != null) grad[i] += tau - mAux / v;
                if (derivatives && hess != null) addCurvature(hess, i, n, mAux / (v * v));
            }
        }
        return sum;
    }

    /** The diagonal Hessian entry of parameter i += v, or the γ's curvature sink during {@link #gammaBlocks}. */
    private void addCurvature(double[] hess, int i, int n, double v) {
        if (sinkCurvature != null && i >= m.nParams) sinkCurvature[i - m.nParams] += v;
        else hess[i * n + i] += v;
    }

    /**
     * Gradient, and the per-sample sums the Hessian's w_b ∇²ν_b part needs (docs/engine.md section 2, split
     * by the product structure of ν_sb): T_s and, per shape term, Σ_b ρ ∂base/∂θ and Σ_b ρ A.
     */
    private void gradientTerms(double[] grad, boolean forHessian, boolean explicit) {
        final double[] shapeS = m.shapeS, shapeA = m.shapeA;
        for (int s = 0; s < m.nSamples; s++) {
            int c = m.sampleChannel[s];
            if (!data.channelIncluded()[c]) continue;
            int b0 = m.channelBinStart[c];
            int e0 = m.sampleEntryStart[s], len = m.sampleEntryStart[s + 1] - e0;
            boolean mc = m.sampleMcStat[s];
            double cs = sampleC[s];
            // ρ_b = w_b γ_sb; T_s = Σ_b ρ_b base_sb is the derivative of −ln L by C_s.
            final double[] rho = mc ? wGamma : w;
            double t = 0;
            for (int b = 0; b < len; b++) t += rho[b0 + b] * base[e0 + b];
            sampleT[s] = t;
            int mulFrom = m.sampleMulStart[s], mulTo = m.sampleMulStart[s + 1];
            for (int k = mulFrom; k < mulTo; k++) grad[m.mulParam[k]] += dC[k] * t;
            for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
                int so = m.shapeCoeffStart[k];
                double u1 = 0, u2 = 0;
                for (int b = 0; b < len; b++) {
                    if (clipped[e0 + b]) continue;
                    u1 += rho[b0 + b] * shapeS[so + b];
                    u2 += rho[b0 + b] * shapeA[so + b];
                }
                int p = m.shapeParam[k];
                double dBase = u1 + u2 * shapeP[3 * k + 1]; // Σ_b ρ ∂base/∂θ
                grad[p] += cs * dBase;
                if (forHessian) {
                    shapeDBase[k] = dBase;
                    shapeU2[k] = u2;
                }
            }
        }
        if (explicit) {
            for (int g = 0; g < m.nGamma; g++) {
                int b = m.gammaBin[g];
                grad[m.nParams + g] += w[b] * cPart[b];
            }
        }
    }

    /**
     * Each channel's block over its own parameters (upper triangle of a block's work matrix), added
     * to the Hessian once: the scattered writes stay within a block in cache. On a big model two
     * channels at a time, one per thread; the blocks are added in channel order either way, so
     * the Hessian is bit for bit the same.
     */
    private void channelBlocks(double[] hess, int hs, boolean explicit) {
        final boolean[] included = data.channelIncluded();
        if (!parallelBlocks) {
            for (int c = 0; c < m.nChannels; c++) {
                if (!included[c]) continue;
                first.make(c, hess, hs, explicit);
                first.scatter(m.channelParams[c], hess, hs);
            }
            return;
        }
        if (second == null) second = new ChannelBlock();
        int c = 0;
        while (true) {
            while (c < m.nChannels && !included[c]) c++;
            int d = c + 1;
            while (d < m.nChannels && !included[d]) d++;
            if (c >= m.nChannels) return;
            if (d >= m.nChannels) {
                first.make(c, hess, hs, explicit);
                first.scatter(m.channelParams[c], hess, hs);
                return;
            }
            final int one = c, other = d;
            TwoWay.run(() -> first.make(one, hess, hs, explicit), () -> second.make(other, hess, hs, explicit));
            first.scatter(m.channelParams[one], hess, hs);
            second.scatter(m.channelParams[other], hess, hs);
            c = d + 1;
        }
    }

    /**
     * Work space and code of one channel's block of the Hessian. It reads the evaluation's arrays
     * and writes only its own, except the explicit layout's γ entries and the sinks of
     * {@link #gammaBlocks}, which belong to the channel's own bins: two blocks of different
     * channels can be made at the same time.
     */
    private final class ChannelBlock {
        private final double[] hvec = new double[maxMul + 1];
        private final double[] prefix = new double[maxMul + 1];
        private final double[] suffix = new double[maxMul + 1];
        private final double[] gLoc = new double[stride];
        private final double[] gcLoc = new double[stride];
        private final double[] hLoc = new double[stride];
        private final double[] hMat = new double[stride * stride];
        /** Vectors ∇c_b (local indices, stride maxLocal) and weights of a channel's bins, for one {@link WeightedGram} update. */
        private final double[] gramVec = new double[mostBins * stride];
        private final double[] gramWeight = new double[mostBins];
        /** The same vectors for every bin of the channel, by parameter: row l holds ∂c_b/∂θ_l over the bins. */
        private final double[] gramByParam = new double[mostBins * stride];
        private final int[] gramBin = new int[mostBins];

        /** Channel c's block into hMat (upper triangle, stride L). */
        void make(int c, double[] hess, int hs, boolean explicit) {
            int L = m.channelParams[c].length;
            Arrays.fill(hMat, 0, L * L, 0);
            if (!gaussNewton) {
                for (int s = channelSampleStart[c]; s < channelSampleStart[c + 1]; s++) sampleSecondDerivatives(s);
            }
            binOuterProducts(c, hess, hs, explicit);
        }

        /**
         * The Hessian terms of sample s that need only its sums from {@link #gradientTerms}, into the
         * upper triangle of hMat (its channel's local indices): shape-term curvature, shape × norm
         * terms, and T_s · ∂²C_s.
         */
        private void sampleSecondDerivatives(int s) {
            final int L = m.channelParams[m.sampleChannel[s]].length;
            final double cs = sampleC[s];
            final int mulFrom = m.sampleMulStart[s], mulTo = m.sampleMulStart[s + 1];
            for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
                int a = m.shapeLocal[k];
                hMat[a * L + a] += cs * shapeU2[k] * shapeP[3 * k + 2];
                double dBase = shapeDBase[k];
                for (int l = mulFrom; l < mulTo; l++) {
                    int b = m.mulLocal[l];
                    double v = dBase * dC[l];
                    // the pair (θ_k, θ_l) and its mirror: one upper entry, or twice the diagonal
                    if (a == b) hMat[a * L + a] += 2 * v;
                    else hMat[Math.min(a, b) * L + Math.max(a, b)] += v;
                }
            }
            mulSecondDerivatives(s, sampleT[s], L);
        }

        /**
         * T_s · ∂²C_s/∂θ_k∂θ_l over the sample's multiplicative terms, without division, into the
         * upper triangle of hMat: each ordered pair (k, l) whose local indices are in order, the
         * mirror pair supplying the rest.
         */
        private void mulSecondDerivatives(int s, double t, int L) {
            int from = m.sampleMulStart[s], len = m.sampleMulStart[s + 1] - from;
            boolean anyZero = false;
            for (int j = 0; j < len; j++) anyZero |= mulValue[3 * (from + j)] == 0;
            if (!anyZero) {
                // No factor is zero: ∂²C/∂k∂l = C r_k r_l with r = g'/g, and C g_k''/g_k on the
                // diagonal, one pass instead of a product per pair.
                double tc = t * sampleC[s];
                for (int j = 0; j < len; j++) hvec[j] = mulValue[3 * (from + j) + 1] / mulValue[3 * (from + j)];
                for (int k = 0; k < len; k++) {
                    int ak = m.mulLocal[from + k];
                    double rk = tc * hvec[k];
                    for (int l = 0; l < len; l++) {
                        int al = m.mulLocal[from + l];
                        if (al < ak) continue;
                        hMat[ak * L + al] += l == k ? tc * mulValue[3 * (from + k) + 2] / mulValue[3 * (from + k)] : rk * hvec[l];
                    }
                }
                return;
            }
            for (int k = 0; k < len; k++) {
                int ak = m.mulLocal[from + k];
                // h_j = g_j with term k replaced by its derivative; ∂²C/∂k∂l = g_l' Π_{j≠l} h_j.
                for (int j = 0; j < len; j++) hvec[j] = j == k ? mulValue[3 * (from + j) + 1] : mulValue[3 * (from + j)];
                prefix[0] = 1;
                for (int j = 0; j < len; j++) prefix[j + 1] = prefix[j] * hvec[j];
                suffix[len] = 1;
                for (int j = len - 1; j >= 0; j--) suffix[j] = suffix[j + 1] * hvec[j];
                for (int l = 0; l < len; l++) {
                    int al = m.mulLocal[from + l];
                    if (al < ak) continue;
                    double d2;
                    if (l == k) {
                        d2 = mulValue[3 * (from + k) + 2] * productWithout(from, len, k);
                    } else {
                        d2 = mulValue[3 * (from + l) + 1] * prefix[l] * suffix[l + 1];
                    }
                    hMat[ak * L + al] += t * d2;
                }
            }
        }

        private double productWithout(int from, int len, int k) {
            double p = 1;
            for (int j = 0; j < len; j++) if (j != k) p *= mulValue[3 * (from + j)];
            return p;
        }

        /**
         * Σ_b (n_b/ν_b²) ∇ν_b ∇ν_bᵀ over the channel's bins, into hMat in the channel's local parameter
         * indices, minus the Schur terms of the profiled γ_b (profiled layout) or plus the γ rows and
         * columns (explicit layout).
         */
        private void binOuterProducts(int c, double[] hess, int n, boolean explicit) {
            if (!explicit && channelAllMc[c]) {
                allMcOuterProducts(c, hess, n);
                return;
            }
            final int[] local = m.channelParams[c];
            final int L = local.length;
            final int b0 = m.channelBinStart[c], b1 = m.channelBinStart[c + 1];
            for (int b = b0; b < b1; b++) {
                double qb = q[b];
                double wb = gaussNewton ? 0 : w[b];
                if (qb == 0 && wb == 0) continue;
                binGradients(c, b);
                rankOne(gLoc, qb, L);
                int g = m.binGamma[b];
                if (g < 0) continue;
                double cb = cPart[b];
                for (int i = 0; i < L; i++) hLoc[i] = wb * gcLoc[i] + qb * cb * gLoc[i];
                int gi = m.nParams + g;
                if (explicit && sinkCurvature != null) {
                    sinkCurvature[g] += qb * cb * cb;
                    System.arraycopy(hLoc, 0, sinkMixed, g * stride, L);
                } else if (explicit) {
                    hess[gi * n + gi] += qb * cb * cb;
                    for (int i = 0; i < L; i++) {
                        int p = local[i];
                        hess[p * n + gi] += hLoc[i];
                        hess[gi * n + p] += hLoc[i];
                    }
                } else if (gammaInterior[g]) {
                    double hgg = qb * cb * cb + constraintCurvature(gi, gammaValue[g]);
                    if (hgg > 0) rankOne(hLoc, -1 / hgg, L);
                }
            }
        }

        /**
         * {@link #binOuterProducts} for a channel whose samples all take part in the MC-statistics term
         * (profiled layout). Then ∇ν_b = γ_b ∇c_b and the mixed derivative h_b = (w_b + q_b c_b γ_b) ∇c_b,
         * so the bin's two rank-one terms q_b ∇ν∇νᵀ − h_b h_bᵀ / H_γγ are one,
         * [q_b γ_b² − (w_b + q_b c_b γ_b)² / H_γγ] ∇c_b ∇c_bᵀ, with the cancellation in a scalar. The
         * channel's block then is Vᵀ·diag(weights)·V over its bins, summed by {@link WeightedGram} (four bins per pass, cache-blocked).
         */
        private void allMcOuterProducts(int c, double[] hess, int n) {
            final int[] local = m.channelParams[c];
            final int L = local.length;
            final int b0 = m.channelBinStart[c], b1 = m.channelBinStart[c + 1];
            int count = 0;
            for (int b = b0; b < b1; b++) {
                double qb = q[b];
                double wb = gaussNewton ? 0 : w[b];
                if (qb == 0 && wb == 0) continue;
                double gammaB = binGammaValue[b];
                double weight = qb * gammaB * gammaB;
                int g = m.binGamma[b];
                if (g >= 0 && gammaInterior[g]) {
                    double cb = cPart[b];
                    double hgg = qb * cb * cb + constraintCurvature(m.nParams + g, gammaValue[g]);
                    if (hgg > 0) {
                        double kappa = wb + qb * cb * gammaB;
                        weight -= kappa * kappa / hgg;
                    }
                }
                if (weight == 0) continue;
                gramBin[count] = b - b0;
                gramWeight[count++] = weight;
            }
            if (count == 0) return;
            mcGradients(c);
            // one row per bin kept, as the Gram update reads them
            final int nb = b1 - b0;
            for (int r = 0; r < count; r++) {
                final int b = gramBin[r], at = r * stride;
                for (int l = 0; l < L; l++) gramVec[at + l] = gramByParam[l * nb + b];
            }
            WeightedGram.addUpper(gramVec, stride, gramWeight, count, L, hMat);
        }

        /**
         * ∇c_b of every bin of channel c into {@link #gramByParam} (row l: the derivatives by the
         * channel's l-th parameter over its bins), a loop over the bins per term: the same sums, in the
         * same order, as a pass over the samples bin by bin would make, in contiguous passes.
         */
        private void mcGradients(int c) {
            final int L = m.channelParams[c].length;
            final int b0 = m.channelBinStart[c], nb = m.channelBinStart[c + 1] - b0;
            final double[] shapeS = m.shapeS, shapeA = m.shapeA, out = gramByParam;
            Arrays.fill(out, 0, L * nb, 0);
            for (int s = channelSampleStart[c]; s < channelSampleStart[c + 1]; s++) {
                final int e0 = m.sampleEntryStart[s];
                for (int k = m.sampleMulStart[s]; k < m.sampleMulStart[s + 1]; k++) {
                    final int row = m.mulLocal[k] * nb;
                    final double d = dC[k];
                    for (int b = 0; b < nb; b++) out[row + b] += base[e0 + b] * d;
                }
                final double cs = sampleC[s];
                final boolean anyClipped = sampleClipped[s];
                for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
                    final int row = m.shapeLocal[k] * nb, so = m.shapeCoeffStart[k];
                    final double p1 = shapeP[3 * k + 1];
                    if (!anyClipped) {
                        for (int b = 0; b < nb; b++) out[row + b] += cs * (shapeS[so + b] + shapeA[so + b] * p1);
                    } else {
                        for (int b = 0; b < nb; b++) {
                            if (!clipped[e0 + b]) out[row + b] += cs * (shapeS[so + b] + shapeA[so + b] * p1);
                        }
                    }
                }
            }
        }

        /** hess += the symmetric block held in hMat's upper triangle, at the channel's parameters. */
        private void scatter(int[] local, double[] hess, int n) {
            final int L = local.length;
            for (int i = 0; i < L; i++) {
                int pi = local[i];
                for (int j = i; j < L; j++) {
                    double v = hMat[i * L + j];
                    int pj = local[j];
                    hess[pi * n + pj] += v;
                    if (i != j) hess[pj * n + pi] += v;
                }
            }
        }

        /** Fills gLoc with ∇ν_b and gcLoc with ∇c_b (c_b: the part γ_b scales) in local indices. */
        private void binGradients(int c, int b) {
            final int L = m.channelParams[c].length;
            final int b0 = m.channelBinStart[c];
            final double[] shapeS = m.shapeS, shapeA = m.shapeA;
            Arrays.fill(gLoc, 0, L, 0);
            Arrays.fill(gcLoc, 0, L, 0);
            double gammaB = binGammaValue[b];
            for (int s = channelSampleStart[c]; s < channelSampleStart[c + 1]; s++) {
                boolean mc = m.sampleMcStat[s];
                int e = m.sampleEntryStart[s] + (b - b0);
                double bs = base[e];
                double scale = mc ? gammaB : 1;
                for (int k = m.sampleMulStart[s]; k < m.sampleMulStart[s + 1]; k++) {
                    double d = bs * dC[k];
                    gLoc[m.mulLocal[k]] += scale * d;
                    if (mc) gcLoc[m.mulLocal[k]] += d;
                }
                if (clipped[e]) continue;
                double cs = sampleC[s];
                for (int k = m.sampleShapeStart[s]; k < m.sampleShapeStart[s + 1]; k++) {
                    int so = m.shapeCoeffStart[k] + (b - b0);
                    double d = cs * (shapeS[so] + shapeA[so] * shapeP[3 * k + 1]);
                    gLoc[m.shapeLocal[k]] += scale * d;
                    if (mc) gcLoc[m.shapeLocal[k]] += d;
                }
            }
        }

        /** Upper triangle of hMat += f · v vᵀ. */
        private void rankOne(double[] v, double f, int L) {
            if (f == 0) return;
            for (int i = 0; i < L; i++) {
                double vi = f * v[i];
                if (vi == 0) continue;
                final int row = i * L;
                for (int j = i; j < L; j++) hMat[row + j] += vi * v[j];
            }
        }
    }

    /**
     * Variances of the profiled γ at the model parameters x, given the covariance of the model
     * parameters (nParams², row-major) from the profiled Hessian: with d_b = ∂²f/∂γ_b² and h_b the
     * mixed derivatives, the block inverse gives var γ_b = 1/d_b + h_bᵀ Σ h_b / d_b² (docs/engine.md
     * section 2). Held γ get 0. Writes nGamma values into {@code out}.
     */
    public void gammaVariances(double[] x, double[] covariance, double[] out) {
        evaluate(x, null, null, false);
        final int nP = m.nParams;
        // Per channel: its block of the covariance gathered once, then the quadratic forms of all
        // its bins' h_b against it, four at a time (QuadraticForms).
        double[] block = null, vectors = null, quads = null;
        int[] bins = null;
        QuadraticForms forms = null;
        for (int c = 0; c < m.nChannels; c++) {
            final int[] local = m.channelParams[c];
            final int L = local.length;
            final int b0 = m.channelBinStart[c], b1 = m.channelBinStart[c + 1];
            final boolean included = data.channelIncluded()[c];
            if (included && block == null) {
                block = new double[stride * stride];
                int most = 0;
                for (int k = 0; k < m.nChannels; k++) most = Math.max(most, m.channelBinStart[k + 1] - m.channelBinStart[k]);
                vectors = new double[most * stride];
                quads = new double[most];
                bins = new int[most];
                forms = new QuadraticForms(stride);
            }
            if (included) {
                for (int i = 0; i < L; i++) {
                    final int row = local[i] * nP;
                    for (int j = 0; j < L; j++) block[i * L + j] = covariance[row + local[j]];
                }
            }
            int count = 0;
            for (int b = b0; b < b1; b++) {
                int g = m.binGamma[b];
                if (g < 0) continue;
                int gi = nP + g;
                if (!Double.isNaN(gammaHeld[g]) || (explicitGamma && m.fixed[gi])) {
                    out[g] = 0;
                    continue;
                }
                double cb = cPart[b];
                double d = q[b] * cb * cb + constraintCurvature(gi, gammaValue[g]);
                if (!(d > 0)) {
                    out[g] = Double.NaN;
                    continue;
                }
                out[g] = 1 / d;
                if (!included) continue;
                first.binGradients(c, b);
                final int at = count * L;
                for (int i = 0; i < L; i++) vectors[at + i] = w[b] * first.gcLoc[i] + q[b] * cb * first.gLoc[i];
                bins[count++] = b;
            }
            if (count == 0) continue;
            forms.symmetric(block, L, vectors, L, count, quads);
            for (int k = 0; k < count; k++) {
                int b = bins[k];
                int g = m.binGamma[b];
                double cb = cPart[b];
                double d = q[b] * cb * cb + constraintCurvature(nP + g, gammaValue[g]);
                out[g] = 1 / d + quads[k] / (d * d);
            }
        }
    }

    private double constraintCurvature(int idx, double v) {
        return switch (m.constraintType[idx]) {
            case ConstraintType.GAUSSIAN -> 1 / (m.width[idx] * m.width[idx]);
            case ConstraintType.POISSON -> data.aux()[idx] / (v * v);
            default -> 0;
        };
    }
}
