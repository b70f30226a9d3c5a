package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.linalg.QuadraticForms;

import java.util.ArrayList;
import java.util.List;

/**
 * Pre-fit and post-fit yields with their uncertainties by linear propagation, σ² = J C Jᵀ
 * (docs/cli-contract.md, {@code plumb yields}): J the derivative of each yield by the parameters,
 * C diagonal with each constrained parameter's pre-fit width squared (pre-fit, at the nominal
 * values; free and held parameters left out), or the full post-fit covariance with the
 * MC-statistics γ and all correlations (post-fit, at the best fit; {@link PostfitCovariance}).
 *
 * <p>Nothing of size (parameters × entries) or nAll² is formed. J is analytic, in the product form
 * of the likelihood ({@link BinnedNll#sampleDerivatives}): the derivative of ν_sb by the model
 * parameters is base_sb · ∂C_s/∂θ (one direction per sample, scaled per bin) plus one coefficient
 * per shape term, so the yields of a channel vary within the span of K = (samples + shape-term
 * parameters) vectors, and C restricted to that span is one K×K matrix G per channel. A yield's
 * variance is then a quadratic form in its K coefficients; the γ enter through the block form of
 * the covariance (for the bin's γ_b with curvature d_b and mixed derivatives h_b = Bᵀη_b in the same
 * span: var = zᵀGz + v_γ²/d_b with z = c − (v_γ/d_b)η_b, v_γ = ∂ν/∂γ_b). At a kink (a
 * {@code linear} term at θ = 0) the derivative is the mean of the two one-sided slopes.
 */
public final class Yields {

    private Yields() {
    }

    /**
     * Yields per bin with errors, and their sum over the channel's bins with its error (the
     * correlations between bins included).
     */
    public record Band(double[] values, double[] errors, double sum, double sumError) { }

    /** One sample of a channel, pre-fit and post-fit (postfit null when no fit was given). */
    public record SampleYields(String name, Band prefit, Band postfit) { }

    /**
     * One channel: its samples, their total, and the counts of the data set fitted (null for a
     * channel the data set leaves out, e.g. blinded).
     */
    public record ChannelYields(String name, double[] observed, List<SampleYields> samples, Band totalPrefit,
                                Band totalPostfit) { }

    /**
     * Pre-fit and post-fit yields of every channel of the problem around its best fit.
     *
     * @param best the converged best fit of the problem
     * @param post its post-fit covariance ({@link PostfitCovariance#of}), or null for NaN post-fit errors
     */
    public static List<ChannelYields> compute(Problem p, FitResult best, PostfitCovariance post) {
        return compute(p.model(), p.data(), p.startValues(), best.held(), best, post);
    }

    /**
     * Pre-fit and post-fit yields of every channel.
     *
     * @param data          the data set fitted (its counts are reported as observed)
     * @param prefitValues  nominal values, held ones applied (nAll)
     * @param held          parameters held in the fit (nAll): no pre-fit uncertainty either
     * @param best          the best fit, or null for pre-fit only
     * @param post          the post-fit covariance ({@link PostfitCovariance#of}); null gives NaN post-fit errors
     */
    public static List<ChannelYields> compute(CompiledModel m, DataSet data, double[] prefitValues, boolean[] held,
                                              FitResult best, PostfitCovariance post) {
        Propagation pre = new Propagation(m, data, prefitValues, prefitCovariance(m, held), null, held);
        Propagation postfit = best == null ? null
                : new Propagation(m, data, best.values(), post == null ? null : post.thetaBlock(), post, null);
        List<ChannelYields> out = new ArrayList<>(m.nChannels());
        for (int c = 0; c < m.nChannels(); c++) {
            int b0 = m.channelBinStart(c), nb = m.bins(c);
            double[] observed = null;
            if (data.channelIncluded()[c]) {
                observed = new double[nb];
                System.arraycopy(data.counts(), b0, observed, 0, nb);
            }
            pre.channel(c);
            if (postfit != null) postfit.channel(c);
            List<SampleYields> samples = new ArrayList<>();
            List<Integer> members = new ArrayList<>();
            for (int s = 0; s < m.nSamples(); s++) {
                if (m.sampleChannel(s) != c) continue;
                members.add(s);
                samples.add(new SampleYields(m.sampleNames(s), pre.band(new int[] {s}),
                        postfit == null ? null : postfit.band(new int[] {s})));
            }
            int[] all = members.stream().mapToInt(Integer::intValue).toArray();
            out.add(new ChannelYields(m.channelNames(c), observed, List.copyOf(samples), pre.band(all),
                    postfit == null ? null : postfit.band(all)));
        }
        return out;
    }

    /** The pre-fit covariance of the model parameters: diagonal, constrained and not held ones only (nParams²). */
    private static double[] prefitCovariance(CompiledModel m, boolean[] held) {
        int nP = m.nParams();
        MemoryBudget.requireSquares(nP, 1, "the pre-fit yield errors of " + nP + " parameters");
        double[] cov = new double[nP * nP];
        for (int i = 0; i < nP; i++) {
            if (m.constrained(i) && !held[i]) cov[i * nP + i] = m.prefitWidth(i) * m.prefitWidth(i);
        }
        return cov;
    }

    /**
     * The yields at one point and what their errors need, one channel at a time: per sample the
     * product-form derivatives, the channel's span basis and G = B S Bᵀ, and per bin the γ terms.
     */
    private static final class Propagation {
        final CompiledModel m;
        final DataSet data;
        /** Σ_θθ (nParams²), or null for NaN errors. */
        final double[] cov;
        /** Post-fit: the block covariance (γ terms with their coupling); null pre-fit. */
        final PostfitCovariance post;
        /** Pre-fit: parameters held (the γ get their pre-fit width unless held); null post-fit. */
        final boolean[] prefitHeld;
        final BinnedNll nll;
        final BinnedNll other;
        final double[] w, q;
        /** ν_sb of every entry at the point. */
        final double[] nu;

        // ---- the current channel ----
        int[] samples;
        int nb;
        /** Per sample of the channel: along[b], gammaFactor[b], byGamma[b], shape[j·nb + b]; each shape term's basis index. */
        double[][] along, gammaFactor, byGamma, shape;
        int[][] shapeBasis;
        int K;
        double[] g;
        /** Per bin: the γ term's variance factor 1/d (post) or width² (pre), 0 without; and η_b, u_b = Gη_b, ηᵀGη (post). */
        double[] gammaVar;
        double[][] eta, u;
        double[] etaGEta;
        double[] values;

        Propagation(CompiledModel m, DataSet data, double[] point, double[] cov, PostfitCovariance post,
                    boolean[] prefitHeld) {
            this.m = m;
            this.data = data;
            this.cov = cov;
            this.post = post;
            this.prefitHeld = prefitHeld;
            this.nll = new BinnedNll(m, data, true);   // explicit layout: γ taken from the point
            double[] x = point.clone();
            this.w = new double[m.nBins()];
            this.q = new double[m.nBins()];
            this.nu = new double[m.nEntries()];
            nll.expectedEntries(x, nu);
            nll.binWeights(w, q);
            // At a kink of a linear term the one-sided slopes differ: a second likelihood sits on
            // the left-hand side of every kinked parameter at its kink, and the slopes are averaged.
            double[] left = x.clone();
            boolean anyKink = false;
            for (int i = 0; i < m.nParams(); i++) {
                if (m.kinked(i) && x[i] == 0) {
                    left[i] = -Double.MIN_VALUE;
                    anyKink = true;
                } else if (m.kinked(i) && x[i] == -Double.MIN_VALUE) {
                    x[i] = 0;
                    anyKink = true;
                }
            }
            if (anyKink) {
                nll.value(x);
                other = new BinnedNll(m, data, true);
                other.value(left);
            } else {
                other = null;
            }
        }

        /** Prepares channel c: derivatives of its samples, the span basis and G. */
        void channel(int c) {
            int[] local = m.channelParams(c);
            int L = local.length;
            int b0 = m.channelBinStart(c);
            nb = m.bins(c);
            List<Integer> list = new ArrayList<>();
            for (int s = 0; s < m.nSamples(); s++) if (m.sampleChannel(s) == c) list.add(s);
            samples = list.stream().mapToInt(Integer::intValue).toArray();
            int ns = samples.length;
            along = new double[ns][nb];
            gammaFactor = new double[ns][nb];
            byGamma = new double[ns][nb];
            shape = new double[ns][];
            shapeBasis = new int[ns][];
            double[][] direction = new double[ns][L];
            int[] basisOfLocal = new int[L];
            java.util.Arrays.fill(basisOfLocal, -1);
            List<Integer> shapeLocals = new ArrayList<>();
            double[] dir2 = new double[L], along2 = new double[nb], gf2 = new double[nb], bg2 = new double[nb];
            for (int k = 0; k < ns; k++) {
                int s = samples[k];
                int nShape = m.sampleShapeStart(s + 1) - m.sampleShapeStart(s);
                shape[k] = new double[nShape * nb];
                nll.sampleDerivatives(s, direction[k], along[k], shape[k], gammaFactor[k], byGamma[k]);
                if (other != null) {
                    double[] shape2 = new double[nShape * nb];
                    other.sampleDerivatives(s, dir2, along2, shape2, gf2, bg2);
                    for (int i = 0; i < L; i++) direction[k][i] = 0.5 * (direction[k][i] + dir2[i]);
                    for (int i = 0; i < shape2.length; i++) shape[k][i] = 0.5 * (shape[k][i] + shape2[i]);
                }
                shapeBasis[k] = new int[nShape];
                for (int j = 0; j < nShape; j++) {
                    int l = m.shapeLocal(m.sampleShapeStart(s) + j);
                    if (basisOfLocal[l] < 0) {
                        basisOfLocal[l] = ns + shapeLocals.size();
                        shapeLocals.add(l);
                    }
                    shapeBasis[k][j] = basisOfLocal[l];
                }
            }
            K = ns + shapeLocals.size();
            gammaVar = new double[nb];
            eta = null;
            u = null;
            etaGEta = null;
            if (cov == null) return;
            // S over the channel's parameters, S r_s, and G = B S Bᵀ over the basis (r_s, then e_l).
            int nP = m.nParams();
            double[] sc = new double[L * L];
            for (int i = 0; i < L; i++) for (int j = 0; j < L; j++) sc[i * L + j] = cov[local[i] * nP + local[j]];
            double[][] sr = new double[ns][L];
            for (int k = 0; k < ns; k++) QuadraticForms.times(sc, L, direction[k], sr[k]);
            g = new double[K * K];
            for (int a = 0; a < ns; a++) {
                for (int b = 0; b < ns; b++) {
                    double acc = 0;
                    for (int i = 0; i < L; i++) acc += direction[a][i] * sr[b][i];
                    g[a * K + b] = acc;
                }
                for (int e = ns; e < K; e++) {
                    g[a * K + e] = sr[a][shapeLocals.get(e - ns)];
                    g[e * K + a] = g[a * K + e];
                }
            }
            for (int e = ns; e < K; e++) {
                int le = shapeLocals.get(e - ns);
                for (int f = ns; f < K; f++) g[e * K + f] = sc[le * L + shapeLocals.get(f - ns)];
            }
            boolean included = data.channelIncluded()[c];
            for (int b = 0; b < nb; b++) {
                int gi = m.binGamma(b0 + b);
                if (gi < 0) continue;
                int idx = nP + gi;
                if (post == null) {
                    if (m.constrained(idx) && !prefitHeld[idx]) gammaVar[b] = m.prefitWidth(idx) * m.prefitWidth(idx);
                    continue;
                }
                if (post.held(idx)) continue;
                gammaVar[b] = 1 / post.gammaCurvature(gi);
                if (!included) continue;
                // h_b = w ∇c_b + q c_b ∇ν_b, as the likelihood forms it, in basis coefficients
                if (eta == null) {
                    eta = new double[nb][];
                    u = new double[nb][];
                    etaGEta = new double[nb];
                }
                double wb = w[b0 + b], qb = q[b0 + b], cb = 0;
                for (int k = 0; k < ns; k++) cb += byGamma[k][b];
                double[] e = new double[K];
                for (int k = 0; k < ns; k++) {
                    boolean mc = m.sampleMcStat(samples[k]);
                    double f = (mc ? wb : 0) + qb * cb * gammaFactor[k][b];
                    if (f == 0) continue;
                    e[k] += f * along[k][b];
                    double[] sh = shape[k];
                    int[] sb = shapeBasis[k];
                    for (int j = 0; j < sb.length; j++) e[sb[j]] += f * sh[j * nb + b];
                }
                double[] ub = new double[K];
                QuadraticForms.times(g, K, e, ub);
                double quad = 0;
                for (int a = 0; a < K; a++) quad += e[a] * ub[a];
                eta[b] = e;
                u[b] = ub;
                etaGEta[b] = quad;
            }
        }

        /** The summed yield of the given samples (of the current channel) per bin and over the bins, with errors. */
        Band band(int[] set) {
            int[] pos = new int[set.length];
            for (int i = 0; i < set.length; i++) pos[i] = java.util.Arrays.binarySearch(samples, set[i]);
            // the basis indices this set's coefficients use
            boolean[] used = new boolean[K];
            for (int k : pos) {
                used[k] = true;
                for (int e : shapeBasis[k]) used[e] = true;
            }
            int n = 0;
            int[] index = new int[K], slot = new int[K];
            for (int a = 0; a < K; a++) if (used[a]) { slot[a] = n; index[n++] = a; }
            boolean haveCov = cov != null;
            double[] gs = null;
            if (haveCov) {
                gs = new double[n * n];
                for (int a = 0; a < n; a++) for (int b = 0; b < n; b++) gs[a * n + b] = g[index[a] * K + index[b]];
            }
            double[] values = new double[nb], errors = new double[nb];
            // each bin's coefficients c (row b), its γ derivative v_γ, then all cᵀGc at once
            double[] cs = new double[nb * n];
            double[] vgs = new double[nb];
            double sum = 0;
            for (int b = 0; b < nb; b++) {
                int at = b * n;
                double y = 0, vg = 0;
                for (int k : pos) {
                    double gf = gammaFactor[k][b];
                    y += nu[m.sampleEntryStart(samples[k]) + b];
                    cs[at + slot[k]] += gf * along[k][b];
                    double[] sh = shape[k];
                    int[] sb = shapeBasis[k];
                    for (int j = 0; j < sb.length; j++) cs[at + slot[sb[j]]] += gf * sh[j * nb + b];
                    vg += byGamma[k][b];
                }
                values[b] = y;
                vgs[b] = vg;
                sum += y;
            }
            if (!haveCov) {
                java.util.Arrays.fill(errors, Double.NaN);
                return new Band(values, errors, sum, Double.NaN);
            }
            double[] quads = new double[nb];
            new QuadraticForms(n).symmetric(gs, n, cs, n, nb, quads);
            double[] zSum = new double[K];
            double gammaSum = 0;
            for (int b = 0; b < nb; b++) {
                int at = b * n;
                double vg = vgs[b];
                double var = quads[b] + vg * vg * gammaVar[b];
                for (int a = 0; a < n; a++) zSum[index[a]] += cs[at + a];
                if (eta != null && eta[b] != null && vg != 0) {
                    double t = vg * gammaVar[b];   // v_γ / d_b
                    double cu = 0;
                    for (int a = 0; a < n; a++) cu += cs[at + a] * u[b][index[a]];
                    var += -2 * t * cu + t * t * etaGEta[b];
                    double[] e = eta[b];
                    for (int a = 0; a < K; a++) zSum[a] -= t * e[a];
                }
                gammaSum += vg * vg * gammaVar[b];
                errors[b] = Math.sqrt(Math.max(var, 0));
            }
            double[] sumQuad = new double[1];
            new QuadraticForms(K).symmetric(g, K, zSum, K, 1, sumQuad);
            double sumError = Math.sqrt(Math.max(sumQuad[0] + gammaSum, 0));
            return new Band(values, errors, sum, sumError);
        }
    }
}
