package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelVariants;
import plumb.engine.likelihood.DataSet;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * Which uncertainty limits the search: the expected median CLs limit and the expected discovery
 * significance (both on Asimov data sets, Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554)
 * as the model is, and with each nuisance parameter and each group held at its generating value
 * ("removed") or with its pre-fit width scaled by a factor.
 *
 * <p>Fast path: σ_μ from the Asimov Fisher information with the constraint changed
 * ({@link AsimovFisher}), applied to the exact values as the Gaussian scaling says: the median
 * limit is proportional to σ_μ (μ_up = σ Φ⁻¹(1 − α/2)) and Z_A to 1/σ_μ. The Fisher information of
 * the Asimov set at μ = 0 gives the limit's σ, the one at μ = 1 the significance's. Exact path: the
 * full asymptotic computation again (q0 and the CLs limit with every fit redone) on the changed
 * model, for the top entries of the fast ranking.
 */
public final class Sensitivity {

    private Sensitivity() {
    }

    /**
     * What to compute.
     *
     * @param held       parameters held in every fit (--fix) with {@code heldValues}
     * @param postfit    Asimov nuisance values from a fit to the observed data (else the nominal values)
     * @param cl         confidence level of the limits
     * @param scales     width factors to try besides removal (each &gt; 0)
     * @param exactTop   parameters (and groups) recomputed exactly, from the top of the fast ranking
     * @param threads    worker threads of the exact path
     */
    public record Request(CompiledModel model, int[] held, double[] heldValues, FitSettings settings, boolean postfit,
                          double cl, double[] scales, int exactTop, int threads) { }

    /** A request from a problem (its data set is not used: everything runs on Asimov data sets). */
    public static Request request(Problem p, boolean postfit, double cl, double[] scales, int exactTop, int threads) {
        return new Request(p.model(), p.heldIndices(), p.heldValues(), p.settings(), postfit, cl, scales.clone(),
                exactTop, threads);
    }

    /**
     * One change of one target. {@code scale} 0 means removed (held at its generating value).
     * Exact values are NaN when not computed; {@code exactError} says why a computed one failed.
     *
     * @param fastSigma0  σ_μ of the μ = 0 Asimov set (limits), fast path
     * @param fastSigma1  σ_μ of the μ = 1 Asimov set (significance), fast path
     * @param exactSigma1 σ_μ of a fit to the μ = 1 Asimov set of the changed model
     */
    public record Variant(double scale, double fastSigma0, double fastSigma1, double fastLimit, double fastZ,
                          double exactSigma1, double exactLimit, double exactZ, String exactError) {
        public boolean exact() {
            return !Double.isNaN(exactLimit) || !Double.isNaN(exactZ) || exactError != null;
        }
    }

    /**
     * A parameter or a group, its changes in the order removed, then {@link Request#scales}.
     *
     * @param members parameter indices (γ included for the MC-statistics and all-systematics groups)
     */
    public record Target(String name, boolean group, int[] members, List<Variant> variants) {
        public Variant removed() {
            return variants.get(0);
        }
    }

    /**
     * The ranking.
     *
     * @param limit      expected median CLs limit of the model as it is
     * @param z          expected discovery significance Z_A of the model as it is
     * @param sigma0     σ_μ of the μ = 0 Asimov set (Fisher information)
     * @param sigma1     σ_μ of the μ = 1 Asimov set
     * @param parameters nuisance parameters ranked by the gain in the limit when removed, fast path
     * @param groups     the model's groups, then MC statistics and all systematics, ranked the same way
     */
    public record Result(String poi, double cl, double[] scales, double limit, double z, double sigma0,
                         double sigma1, List<Target> parameters, List<Target> groups, int exactTop, int fits,
                         double fastSeconds, double exactSeconds) { }

    /** The Asimov data sets at μ = 0 and μ = 1 with their generating values. */
    public record AsimovPair(DataSets.Generated zero, DataSets.Generated one) {
        public static AsimovPair of(CompiledModel m, int[] held, double[] heldValues, boolean postfit,
                                    FitSettings settings) {
            AsimovPair p = new AsimovPair(DataSets.asimovAt(m, 0, held, heldValues, postfit, settings),
                    DataSets.asimovAt(m, 1, held, heldValues, postfit, settings));
            for (DataSets.Generated g : List.of(p.zero, p.one)) {
                if (g.conditionalFit() != null && !g.conditionalFit().converged()) {
                    throw new InferenceException("the fit to the observed data that sets the Asimov data set did not"
                            + " converge (" + g.conditionalFit().status() + ")");
                }
            }
            return p;
        }
    }

    /**
     * The Fisher information of both Asimov sets at the minimum and half-way to the point their
     * test statistic is taken at: the μ = 0 set at μ = 0 and at half the median limit, the μ = 1 set
     * at μ = 1 and at μ = ½ (nuisance parameters at their conditional fit there). A statistic
     * 2[−ln L(μ_far) + ln L(μ_min)] is ∫ 2 |t − μ_far| I(t) dt over the profile curvature
     * I = 1/σ_μ² between the two (Taylor with integral remainder); Simpson's rule on that integral
     * gives (μ_far − μ_min)² [⅓ I(min) + ⅔ I(mid)], the end point itself having weight 0. The fast
     * path scales the exact values by the change of that weighted curvature.
     */
    public record Fisher(AsimovFisher zeroAtMin, AsimovFisher zeroAtMid, AsimovFisher oneAtMin,
                         AsimovFisher oneAtMid) {

        /**
         * The four information matrices, after the exact values of the model as it is. The points
         * half-way are the conditional fits to first order ({@link AsimovFisher#conditionalPoint}):
         * no fit is made, and the curvature there changes by second-order terms only.
         */
        public static Fisher of(CompiledModel m, AsimovPair asimov, int[] held, double[] heldValues, double limit,
                                FitSettings settings) {
            AsimovFisher zero = new AsimovFisher(m, asimov.zero().data(), asimov.zero().values(), held);
            AsimovFisher one = new AsimovFisher(m, asimov.one().data(), asimov.one().values(), held);
            return new Fisher(zero, halfWay(m, asimov.zero(), zero, held, heldValues, limit / 2, settings), one,
                    halfWay(m, asimov.one(), one, held, heldValues, 0.5, settings));
        }

        /** The information at the first-order conditional point, or at a conditional fit where that is not positive definite. */
        private static AsimovFisher halfWay(CompiledModel m, DataSets.Generated g, AsimovFisher atMin, int[] held,
                                            double[] heldValues, double mu, FitSettings settings) {
            AsimovFisher f = new AsimovFisher(m, g.data(), atMin.conditionalPoint(g.values(), mu), held);
            return f.valid() ? f : new AsimovFisher(m, g.data(), conditional(m, g, held, heldValues, mu, settings), held);
        }

        private static double[] conditional(CompiledModel m, DataSets.Generated g, int[] held, double[] heldValues,
                                            double mu, FitSettings settings) {
            Fitter f = Fitter.valuesOnly(m, g.data(), settings, held, heldValues);
            FitResult r = f.fit(java.util.Arrays.copyOf(g.values(), f.dimension()), m.poi(), mu);
            if (!PoiProfile.minimumFound(r)) {
                throw new InferenceException("the fit to the Asimov data set with the POI held at " + mu
                        + " did not converge (" + r.status() + ")");
            }
            return r.values();
        }

        boolean valid() {
            return zeroAtMin.valid() && zeroAtMid.valid() && oneAtMin.valid() && oneAtMid.valid();
        }
    }

    /** 1/σ_eff² = ⅓/V(min) + ⅔/V(mid) ({@link Fisher}). */
    private static double effective(double vMin, double vMid) {
        return 1 / (1.0 / 3 / vMin + 2.0 / 3 / vMid);
    }

    /** A variance of each of the four information matrices under one change. */
    private interface Change {
        double variance(AsimovFisher f);
    }

    private static Variant fastVariant(double k, Fisher f, Change c, double limit, double z, double base0, double base1) {
        double v0 = c.variance(f.zeroAtMin()), v1 = c.variance(f.oneAtMin());
        double e0 = effective(v0, c.variance(f.zeroAtMid())), e1 = effective(v1, c.variance(f.oneAtMid()));
        return new Variant(k, Math.sqrt(v0), Math.sqrt(v1), limit * Math.sqrt(e0 / base0), z * Math.sqrt(base1 / e1),
                Double.NaN, Double.NaN, Double.NaN, null);
    }

    /**
     * The fast ranking: every constrained parameter, every group, MC statistics and all
     * systematics, removed and scaled by each factor, with the fast limit and Z_A from the exact
     * values {@code limit} and {@code z} of the model as it is. This is the part benchmarked.
     */
    public static List<Target> fast(CompiledModel m, Fisher f, int[] held, double[] scales, double limit, double z) {
        if (!f.valid()) throw new InferenceException("the Fisher information of the Asimov data set is not positive definite");
        AsimovFisher f1 = f.oneAtMin();
        double base0 = effective(f.zeroAtMin().variance(), f.zeroAtMid().variance());
        double base1 = effective(f1.variance(), f.oneAtMid().variance());
        double[] ks = withRemoval(scales);
        List<Target> out = new ArrayList<>();
        for (int i = 0; i < m.nParams(); i++) {
            if (i == m.poi() || !f1.free(i) || !m.constrained(i)) continue;
            final int p = i;
            List<Variant> vs = new ArrayList<>();
            for (double k : ks) vs.add(fastVariant(k, f, a -> a.variance(p, k), limit, z, base0, base1));
            out.add(new Target(m.parameterNames(i), false, new int[] {i}, vs));
        }
        for (int g = 0; g < m.nGroups(); g++) {
            int[] members = Arrays.stream(m.groupMembers(g)).filter(i -> i != m.poi() && f1.free(i) && m.constrained(i))
                    .toArray();
            if (members.length == 0) continue;
            List<Variant> vs = new ArrayList<>();
            for (double k : ks) vs.add(fastVariant(k, f, a -> a.variance(members, k), limit, z, base0, base1));
            out.add(new Target(m.groupNames(g), true, members, vs));
        }
        int[] gammas = java.util.stream.IntStream.range(m.nParams(), m.nAll()).filter(f1::free).toArray();
        int[] constrained = java.util.stream.IntStream.range(0, m.nParams())
                .filter(i -> i != m.poi() && f1.free(i) && m.constrained(i)).toArray();
        if (gammas.length > 0) {
            List<Variant> vs = new ArrayList<>();
            for (double k : ks) vs.add(fastVariant(k, f, a -> a.varianceRebuilt(new int[0], true, k), limit, z, base0, base1));
            out.add(new Target(Impacts.MC_STATISTICS, true, gammas, vs));
        }
        if (constrained.length + gammas.length > 0) {
            int[] all = java.util.stream.IntStream.concat(Arrays.stream(constrained), Arrays.stream(gammas)).toArray();
            List<Variant> vs = new ArrayList<>();
            for (double k : ks) vs.add(fastVariant(k, f, a -> a.varianceRebuilt(constrained, true, k), limit, z, base0, base1));
            out.add(new Target(Impacts.ALL_SYSTEMATICS, true, all, vs));
        }
        return out;
    }

    private static double[] withRemoval(double[] scales) {
        double[] ks = new double[scales.length + 1];
        System.arraycopy(scales, 0, ks, 1, scales.length);
        return ks;
    }

    /**
     * The whole computation: Asimov sets, the exact values as the model is, the fast ranking, and
     * the exact path for the top {@link Request#exactTop} parameters and groups.
     *
     * @param progress called with the number of exact recomputations finished, or null
     * @throws InferenceException when a fit of the model as it is fails
     */
    public static Result compute(Request r, IntConsumer progress) {
        CompiledModel m = r.model();
        if (m.poi() < 0) throw new IllegalArgumentException("the model names no parameter of interest");
        for (double k : r.scales()) {
            if (!(k > 0 && Double.isFinite(k))) throw new IllegalArgumentException("width factor " + k + " is not positive");
        }
        AsimovPair asimov = AsimovPair.of(m, r.held(), r.heldValues(), r.postfit(), r.settings());
        Exact base = exact(m, asimov, r, new int[0], 1);
        if (base.error != null) throw new InferenceException(base.error);
        long t0 = System.nanoTime();
        Fisher fisher = Fisher.of(m, asimov, r.held(), r.heldValues(), base.limit, r.settings());
        List<Target> scaled = fast(m, fisher, r.held(), r.scales(), base.limit, base.z);
        double sigma0 = Math.sqrt(fisher.zeroAtMin().variance()), sigma1 = Math.sqrt(fisher.oneAtMin().variance());
        Comparator<Target> byGain = Comparator.comparingDouble((Target t) -> t.removed().fastLimit())
                .thenComparing(Target::name);
        List<Target> params = scaled.stream().filter(t -> !t.group()).sorted(byGain).toList();
        List<Target> groups = scaled.stream().filter(Target::group).sorted(byGain).toList();
        double fastSeconds = (System.nanoTime() - t0) * 1e-9;

        long t1 = System.nanoTime();
        List<Target> chosen = new ArrayList<>();
        chosen.addAll(params.subList(0, Math.min(r.exactTop(), params.size())));
        chosen.addAll(groups.subList(0, Math.min(r.exactTop(), groups.size())));
        int nk = r.scales().length + 1;
        List<Exact> exact = ParallelRunner.run(chosen.size() * nk, r.threads(), () -> null, (w, task) -> {
            Target t = chosen.get(task / nk);
            return exact(m, asimov, r, t.members(), t.variants().get(task % nk).scale());
        }, progress);
        List<Target> doneParams = new ArrayList<>(), doneGroups = new ArrayList<>();
        int fits = base.fits;
        for (Target t : scaled.stream().sorted(byGain).toList()) {
            int c = chosen.indexOf(t);
            Target out = t;
            if (c >= 0) {
                List<Variant> vs = new ArrayList<>();
                for (int v = 0; v < nk; v++) {
                    Exact e = exact.get(c * nk + v);
                    Variant f = t.variants().get(v);
                    fits += e.fits;
                    vs.add(new Variant(f.scale(), f.fastSigma0(), f.fastSigma1(), f.fastLimit(), f.fastZ(), e.sigma1,
                            e.limit, e.z, e.error));
                }
                out = new Target(t.name(), t.group(), t.members(), vs);
            }
            (t.group() ? doneGroups : doneParams).add(out);
        }
        return new Result(m.parameterNames(m.poi()), r.cl(), r.scales().clone(), base.limit, base.z, sigma0, sigma1,
                doneParams, doneGroups, r.exactTop(), fits, fastSeconds, (System.nanoTime() - t1) * 1e-9);
    }

    /** An exact recomputation: the limit, Z_A, σ_μ of the μ = 1 Asimov fit, fits made, or why it failed. */
    private record Exact(double limit, double z, double sigma1, int fits, String error) { }

    /**
     * The asymptotic limit and Z_A of the model with {@code members} held at their generating
     * values (k = 0) or their widths scaled by k (k = 1 with no members: the model as it is).
     */
    private static Exact exact(CompiledModel m, AsimovPair asimov, Request r, int[] members, double k) {
        CompiledModel mk = k == 0 || k == 1 ? m : ModelVariants.constraintsScaled(m, members, k);
        try {
            DataSet a0 = rebuilt(mk, asimov.zero(), k), a1 = rebuilt(mk, asimov.one(), k);
            int[] held0 = held(r, k == 0 ? members : new int[0]);
            double[] values0 = heldValues(r, k == 0 ? members : new int[0], asimov.zero().values());
            double[] values1 = heldValues(r, k == 0 ? members : new int[0], asimov.one().values());
            Discovery.Significance d = Discovery.compute(mk, a1, r.settings(), held0, values1);
            LimitResult limit = AsymptoticUpperLimit.compute(mk, null, a0, r.settings(), held0, values0, r.cl());
            Fitter fitter = new Fitter(mk, a1, r.settings(), held0, values1);
            FitResult fit = fitter.fit();
            double sigma = fit.converged() ? fit.errors()[m.poi()] : Double.NaN;
            return new Exact(limit.expected().median(), d.z(), sigma, d.fits() + limit.fits() + 1, null);
        } catch (InferenceException e) {
            return new Exact(Double.NaN, Double.NaN, Double.NaN, 0, e.getMessage());
        }
    }

    /** The Asimov set with the auxiliary values the changed model generates at the same point. */
    private static DataSet rebuilt(CompiledModel mk, DataSets.Generated g, double k) {
        if (k == 0 || k == 1) return g.data();
        DataSet d = g.data();
        return DataSet.of(mk, d.kind(), d.counts(), d.channelIncluded(), DataSets.generatingAux(mk, g.values()));
    }

    private static int[] held(Request r, int[] more) {
        int[] out = Arrays.copyOf(r.held(), r.held().length + more.length);
        System.arraycopy(more, 0, out, r.held().length, more.length);
        return out;
    }

    private static double[] heldValues(Request r, int[] more, double[] values) {
        double[] out = Arrays.copyOf(r.heldValues(), r.heldValues().length + more.length);
        for (int a = 0; a < more.length; a++) out[r.heldValues().length + a] = values[more[a]];
        return out;
    }
}
