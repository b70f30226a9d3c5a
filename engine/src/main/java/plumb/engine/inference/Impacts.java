package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.MinimumStatus;
import plumb.engine.model.ParameterKind;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * Which uncertainties move the parameter of interest: impacts of nuisance parameters on the POI,
 * exact (refits) and linearised (post-fit covariance), and the grouped breakdown of the POI's
 * uncertainty. Built around one converged best fit; thread-safe to read, refits run on their own
 * {@link Fitter}s through {@link ParallelRunner}.
 *
 * <p>Exact impact of θ_k: the POI shift (refit value minus best fit) when θ_k is held at
 * θ̂_k ± σ_k (post-fit) or θ̂_k ± w_k (pre-fit width), clipped to θ_k's range, all other parameters
 * refitted. Linearised: Δμ = ρ(μ, θ_k) σ_μ Δθ_k/σ_k = Σ_μk/Σ_kk · Δθ_k (docs/engine.md section 5), exact for
 * a linear model with Gaussian terms (references.md item 10).
 */
public final class Impacts {

    /** Name of the built-in group of every MC-statistics parameter. */
    public static final String MC_STATISTICS = "MC statistics";
    /** Name of the built-in group of every constrained parameter (MC statistics included). */
    public static final String ALL_SYSTEMATICS = "all systematics";

    /**
     * POI shifts for one parameter held up and down. NaN where not computed or where the refit did
     * not converge; the statuses tell which (null for linearised shifts).
     */
    public record Shift(double up, double down, MinimumStatus upStatus, MinimumStatus downStatus) {
        /** The larger of |up| and |down|, NaN counting as 0. */
        public double size() {
            return Math.max(abs(up), abs(down));
        }

        /** True for a linearised shift, or when both refits converged. */
        public boolean converged() {
            return (upStatus == null || upStatus.isMinimum())
                    && (downStatus == null || downStatus.isMinimum());
        }

        private static double abs(double v) {
            return Double.isNaN(v) ? 0 : Math.abs(v);
        }
    }

    /**
     * The impacts of one parameter.
     *
     * @param parameter     index in the model
     * @param pull          (θ̂ − nominal)/pre-fit width
     * @param constraint    post-fit error / pre-fit width
     * @param postfit       exact shifts at θ̂ ± σ (null when not refitted)
     * @param prefit        exact shifts at θ̂ ± pre-fit width (null when not refitted)
     * @param linearPostfit linearised shifts at θ̂ ± σ
     * @param linearPrefit  linearised shifts at θ̂ ± pre-fit width
     */
    public record Entry(int parameter, String name, double pull, double constraint, Shift postfit, Shift prefit,
                        Shift linearPostfit, Shift linearPrefit) {
        /** Ranking key: the exact post-fit size when refitted, else the linearised one. */
        public double size() {
            return postfit != null ? postfit.size() : linearPostfit.size();
        }

        public boolean refitted() {
            return postfit != null;
        }
    }

    /**
     * One line of the grouped breakdown.
     *
     * @param fixedError   σ_μ with the group's parameters held at their best-fit values
     * @param contribution √(σ_μ² − fixedError²), the group's share in quadrature
     */
    public record Contribution(String group, int members, double fixedError, double contribution) { }

    /**
     * Grouped breakdown of σ_μ.
     *
     * @param total    σ_μ of the best fit
     * @param statOnly σ_μ with every constrained parameter held (free parameters still fitted: they
     *                 are measured by the data alone)
     * @param groups   the model's groups in file order, then {@link #MC_STATISTICS} and
     *                 {@link #ALL_SYSTEMATICS}
     */
    public record Breakdown(double total, double statOnly, List<Contribution> groups) { }

    private final CompiledModel m;
    private final DataSet data;
    private final FitSettings settings;
    private final int[] held;
    private final double[] heldValues;
    private final FitResult best;
    private final int dim;
    private final int[] candidates;
    private final Fitter probe;
    /** Post-fit covariance with the γ, in block form, computed on first need. */
    private PostfitCovariance post;
    private boolean postDone;

    /**
     * @param held, heldValues parameters held in the best fit beyond the model's fixed ones (as given to its Fitter)
     * @param best           the converged best fit, with covariance
     * @param includeMcStat  rank the MC-statistics γ too
     * @throws IllegalArgumentException when the model has no POI or the best fit has no covariance
     */
    public Impacts(CompiledModel m, DataSet data, FitSettings settings, int[] held, double[] heldValues,
                   FitResult best, boolean includeMcStat) {
        if (m.poi() < 0) throw new IllegalArgumentException("the model names no parameter of interest");
        if (!best.converged() || best.covariance() == null) {
            throw new IllegalArgumentException("impacts need a converged best fit with a covariance, got " + best.status());
        }
        this.m = m;
        this.data = data;
        this.settings = settings;
        this.held = held.clone();
        this.heldValues = heldValues.clone();
        this.best = best;
        this.probe = new Fitter(m, data, settings, held, heldValues);
        this.dim = probe.dimension();
        List<Integer> c = new ArrayList<>();
        for (int i = 0; i < m.nAll(); i++) {
            if (i == m.poi() || best.held()[i] || !m.constrained(i)) continue;
            if (m.kind(i) == ParameterKind.MC_STATISTICS && !includeMcStat) continue;
            c.add(i);
        }
        this.candidates = c.stream().mapToInt(Integer::intValue).toArray();
    }

    /**
     * @param best          the converged best fit of the problem, with covariance
     * @param includeMcStat rank the MC-statistics γ too
     */
    public Impacts(Problem p, FitResult best, boolean includeMcStat) {
        this(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues(), best, includeMcStat);
    }

    /**
     * The full post-fit covariance as a dense nAll² matrix, γ included, or null when not positive
     * definite. Only for small models and checks: the impacts use its block form
     * ({@link #postfitCovariance()}).
     */
    public double[] fullCovariance() {
        return Covariances.full(probe.likelihood(), best);
    }

    /** The post-fit covariance with the γ in block form, or null when not positive definite. */
    public synchronized PostfitCovariance postfitCovariance() {
        if (!postDone) {
            post = PostfitCovariance.of(probe.likelihood(), best);
            postDone = true;
        }
        return post;
    }

    private boolean anyGamma() {
        for (int k : candidates) if (k >= m.nParams()) return true;
        return false;
    }

    /** The best fit the impacts are relative to. */
    public FitResult best() {
        return best;
    }

    /** Indices of the parameters ranked: constrained, not held, not the POI (γ only when asked). */
    public int[] candidates() {
        return candidates.clone();
    }

    /** Σ(i, j) of the post-fit covariance: the fit's own for model parameters, the full one for γ. */
    private double cov(int i, int j) {
        if (i < m.nParams() && j < m.nParams()) return best.covariance()[i * m.nParams() + j];
        PostfitCovariance f = postfitCovariance();
        return f == null ? Double.NaN : f.covariance(i, j);
    }

    /** Linearised shifts of every candidate, sorted by size, largest first. Costs O(candidates). */
    public List<Entry> linearised() {
        List<Entry> out = new ArrayList<>(candidates.length);
        int poi = m.poi();
        Refits refits = new Refits(m, best, dim, null);
        for (int k : candidates) {
            double vk = cov(k, k);
            double slope = vk > 0 ? cov(poi, k) / vk : Double.NaN;
            double sigma = best.errors()[k], w = m.prefitWidth(k), v = best.values()[k];
            Shift post = new Shift(slope * (refits.clip(k, v + sigma) - v), slope * (refits.clip(k, v - sigma) - v), null, null);
            Shift pre = new Shift(slope * (refits.clip(k, v + w) - v), slope * (refits.clip(k, v - w) - v), null, null);
            out.add(new Entry(k, m.parameterNames(k), pull(k), best.errors()[k] / w, null, null, post, pre));
        }
        out.sort(Comparator.comparingDouble(Entry::size).reversed());
        return out;
    }

    /**
     * The ranking: every candidate linearised, and the {@code exactTop} largest of them (all when
     * negative) refitted four times each (±σ, ±pre-fit width) on {@code threads} threads. Sorted
     * with the refitted entries first by their exact size, then the others by their linearised one.
     *
     * @param progress called with the number of finished refits (from worker threads), or null
     */
    public List<Entry> rank(int exactTop, int threads, IntConsumer progress) {
        return rank(exactTop, WorkRunner.threads(threads), progress);
    }

    /** As {@link #rank(int, int, IntConsumer)}, the refits run by {@code runner} (threads or a cluster; the same numbers). */
    public List<Entry> rank(int exactTop, WorkRunner runner, IntConsumer progress) {
        List<Entry> lin = linearised();
        int n = exactTop < 0 ? lin.size() : Math.min(exactTop, lin.size());
        List<Entry> chosen = lin.subList(0, n);
        int poi = m.poi();
        int[] parameters = new int[n];
        for (int e = 0; e < n; e++) parameters[e] = chosen.get(e).parameter();
        RefitWork work = new RefitWork(data, Refits.refitSettings(settings), held, heldValues, best, dim,
                anyGamma() ? postfitCovariance() : null, parameters);
        List<RefitPoi> fits = runner.run(m, work, 4 * n, progress);
        List<Entry> out = new ArrayList<>(lin.size());
        for (int e = 0; e < n; e++) {
            Entry l = chosen.get(e);
            Shift post = shift(fits.get(4 * e), fits.get(4 * e + 1), poi);
            Shift pre = shift(fits.get(4 * e + 2), fits.get(4 * e + 3), poi);
            out.add(new Entry(l.parameter(), l.name(), l.pull(), l.constraint(), post, pre, l.linearPostfit(), l.linearPrefit()));
        }
        out.sort(Comparator.comparingDouble(Entry::size).reversed());
        out.addAll(lin.subList(n, lin.size()));
        return out;
    }

    /** What the ranking keeps of a refit: its status and POI value. */
    private record RefitPoi(MinimumStatus status, double poi) implements java.io.Serializable {
        boolean converged() {
            return status.isMinimum();
        }
    }

    /**
     * Refit t: parameter {@code parameters[t / 4]} held at best ± post-fit error (t % 4 = 0, 1)
     * or ± pre-fit width (2, 3), warm-started from the best fit.
     */
    private record RefitWork(DataSet data, FitSettings settings, int[] held, double[] heldValues, FitResult best,
                             int dim, PostfitCovariance full, int[] parameters)
            implements RangeWork<RefitWork.Worker, RefitPoi> {

        record Worker(Fitter fitter, Refits refits) { }

        @Override
        public Worker worker(CompiledModel m) {
            return new Worker(Fitter.valuesOnly(m, data, settings, held, heldValues), new Refits(m, best, dim, full));
        }

        @Override
        public RefitPoi run(Worker w, CompiledModel m, int t) {
            int k = parameters[t / 4];
            double v = best.values()[k];
            double d = (t % 4) < 2 ? best.errors()[k] : m.prefitWidth(k);
            double target = w.refits().clip(k, (t % 2) == 0 ? v + d : v - d);
            FitResult r = w.refits().refit(w.fitter(), k, target);
            return new RefitPoi(r.status(), r.values()[m.poi()]);
        }
    }

    private Shift shift(RefitPoi up, RefitPoi down, int poi) {
        double b = best.values()[poi];
        return new Shift(up.converged() ? up.poi() - b : Double.NaN,
                down.converged() ? down.poi() - b : Double.NaN, up.status(), down.status());
    }

    private double pull(int k) {
        return (best.values()[k] - m.nominal(k)) / m.prefitWidth(k);
    }

    /**
     * The grouped breakdown of σ_μ from the full post-fit covariance: for each group, σ_μ with the
     * group held at its best-fit values ({@link PostfitCovariance#conditionalVariance}) and the
     * contribution √(σ² − σ_fixed²); the statistical-only σ_μ with every constrained parameter
     * held. For a linear model with Gaussian terms whose groups are uncorrelated after the fit,
     * total² = stat² + Σ contribution² exactly.
     *
     * @return the breakdown, with NaN where the covariance is not positive definite
     */
    public Breakdown breakdown() {
        int poi = m.poi();
        PostfitCovariance f = postfitCovariance();
        // σ_μ from the full covariance: equal to the fit's error (Schur complement), and the same
        // matrix as the conditional variances below, so the quadrature sums are consistent.
        double total = f == null ? best.errors()[poi] : Math.sqrt(f.variance(poi));
        List<Contribution> out = new ArrayList<>();
        for (int g = 0; g < m.nGroups(); g++) {
            out.add(contribution(m.groupNames(g), notHeld(m.groupMembers(g)), total));
        }
        List<Integer> gammas = new ArrayList<>(), constrained = new ArrayList<>();
        for (int i = 0; i < m.nAll(); i++) {
            if (i == poi || best.held()[i] || !m.constrained(i)) continue;
            constrained.add(i);
            if (m.kind(i) == ParameterKind.MC_STATISTICS) gammas.add(i);
        }
        out.add(contribution(MC_STATISTICS, toArray(gammas), total));
        Contribution all = contribution(ALL_SYSTEMATICS, toArray(constrained), total);
        out.add(all);
        return new Breakdown(total, all.fixedError(), List.copyOf(out));
    }

    private Contribution contribution(String name, int[] members, double total) {
        double fixed;
        PostfitCovariance f = postfitCovariance();
        if (f == null) {
            fixed = Double.NaN;
        } else {
            double var = f.conditionalVariance(m.poi(), members);
            fixed = Math.sqrt(Math.max(var, 0));
        }
        double share = Math.sqrt(Math.max(total * total - fixed * fixed, 0));
        return new Contribution(name, members.length, fixed, share);
    }

    private int[] notHeld(int[] members) {
        return Arrays.stream(members).filter(i -> i != m.poi() && !best.held()[i]).toArray();
    }

    private static int[] toArray(List<Integer> list) {
        return list.stream().mapToInt(Integer::intValue).toArray();
    }
}
