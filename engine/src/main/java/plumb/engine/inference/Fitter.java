package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.BoundedBfgs;
import plumb.engine.minimise.BoundedNewton;
import plumb.engine.minimise.Minimiser;
import plumb.engine.minimise.MinimiserOptions;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.MinimumStatus;
import plumb.engine.minimise.ReferenceMinimiser;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Fits one model to one data set, many times: a fit from the nominal values, or refits from a
 * given point with some parameters held (impacts, scans, toys). Holds a likelihood and a
 * minimiser sized for the model; not thread-safe, one per thread.
 */
public final class Fitter {

    private final CompiledModel m;
    private final BinnedNll nll;
    /** The first attempt, without the minimiser's own restart: a kink is checked for first. */
    private final Minimiser minimiser;
    /** With its restart, for fits that neither converge nor end on a clip kink; null if none. */
    private final Minimiser restarting;
    /** Stationarity needed to accept a minimum on a clip kink ({@link ClipKinkSettler}). */
    private final double kinkTolerance;
    private final int dim;
    private final double[] lower;
    private final double[] upper;
    /** Held in every fit of this fitter: the model's fixed parameters and the caller's. */
    private final boolean[] baseHeld;
    private final double[] baseStart;
    private boolean computeErrors = true;
    private boolean computeChecks = true;
    private boolean searchOtherSides = true;
    /** The last result {@link #fitFrom} returned and the minimum behind it (for {@link #refitHolding}). */
    private FitResult lastResult;
    private MinimumResult lastMinimum;
    private DataSet lastData;
    private ConditionalStart conditionalStart;

    /**
     * @param held   parameters (index &lt; nAll) to hold in every fit, with their values in {@code heldValues}
     */
    public Fitter(CompiledModel model, DataSet data, FitSettings settings, int[] held, double[] heldValues) {
        this.m = model;
        // refused before any n×n matrix is made: one line instead of an OutOfMemoryError
        MemoryBudget.requireFitter(settings.explicitGamma() ? model.nAll() : model.nParams());
        this.nll = new BinnedNll(model, data, settings.explicitGamma());
        this.kinkTolerance = settings.options().fallbackTolerance();
        this.dim = nll.dimension();
        this.minimiser = minimiser(settings.minimiser(), settings.options().withRestart(false));
        this.restarting = settings.minimiser() == FitSettings.MinimiserKind.REFERENCE || !settings.options().restart()
                ? null : minimiser(settings.minimiser(), settings.options());
        lower = Arrays.copyOf(model.lower(), dim);
        upper = Arrays.copyOf(model.upper(), dim);
        baseHeld = Arrays.copyOf(model.fixed(), dim);
        baseStart = Arrays.copyOf(model.nominal(), dim);
        for (int k = 0; k < held.length; k++) {
            int i = held[k];
            if (i < dim) {
                baseHeld[i] = true;
                baseStart[i] = heldValues[k];
            } else {
                nll.holdGamma(i - model.nParams(), heldValues[k]);
            }
        }
    }

    private Minimiser minimiser(FitSettings.MinimiserKind kind, MinimiserOptions options) {
        return switch (kind) {
            case NEWTON -> new BoundedNewton(dim, options);
            case BFGS -> new BoundedBfgs(dim, options);
            case REFERENCE -> new ReferenceMinimiser(dim);
        };
    }

    /** A fitter for the problem: its model, data, settings and held parameters. */
    public Fitter(Problem p) {
        this(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues());
    }

    /** A fitter for the problem whose fits skip the covariance and errors ({@link #computeErrors}). */
    public static Fitter valuesOnly(Problem p) {
        return valuesOnly(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues());
    }

    /** A fitter with nothing held beyond the model's fixed parameters. */
    public Fitter(CompiledModel model, DataSet data, FitSettings settings) {
        this(model, data, settings, new int[0], new double[0]);
    }

    /** A fitter whose fits skip the covariance and errors ({@link #computeErrors}): for refits and toys. */
    public static Fitter valuesOnly(CompiledModel model, DataSet data, FitSettings settings, int[] held,
                                    double[] heldValues) {
        Fitter f = new Fitter(model, data, settings, held, heldValues);
        f.computeErrors(false);
        return f;
    }

    public BinnedNll likelihood() {
        return nll;
    }

    public CompiledModel model() {
        return m;
    }

    /** Evaluates on other data from now on (toys). */
    public void setData(DataSet data) {
        nll.setData(data);
    }

    /**
     * Whether fits compute the covariance and errors (default true). Limits, discovery tests and
     * toys need only −ln L and the values; on large models the inverse Hessian and the γ variances
     * cost more than the minimisation itself. Without them a result's errors are NaN and its
     * covariance null.
     */
    public void computeErrors(boolean on) {
        computeErrors = on;
    }

    /**
     * Whether fits with errors also make their {@link FitChecks} (default true). Injection toys
     * keep only the POI, its error and the pulls, so they switch the checks off.
     */
    public void computeChecks(boolean on) {
        computeChecks = on;
    }

    /** Number of variables the minimiser sees (nParams, or nAll with explicit γ). */
    public int dimension() {
        return dim;
    }

    /** The start point of a fit from scratch: nominal values with held values applied (length {@link #dimension()}). */
    public double[] nominalStart() {
        return baseStart.clone();
    }

    /** Fit from the nominal values. */
    public FitResult fit() {
        return fit(baseStart, -1, 0);
    }

    /**
     * Fit from {@code start} (length {@link #dimension()}, e.g. a previous best fit's values) with
     * parameter {@code hold} (or −1 for none) held at {@code holdValue} in addition.
     */
    public FitResult fit(double[] start, int hold, double holdValue) {
        return fit(start, hold < 0 ? new int[0] : new int[] {hold}, hold < 0 ? new double[0] : new double[] {holdValue});
    }

    /**
     * Fit from {@code start} with the listed parameters (indices &lt; dimension) held at the given
     * values. Errors and covariance are computed unless the fitter was made with {@link #valuesOnly}.
     */
    public FitResult fit(double[] start, int[] hold, double[] holdValues) {
        return fitFrom(new double[][] {start}, hold, holdValues);
    }

    /**
     * Fits from each start with the listed parameters held and keeps the lowest minimum; then, on a
     * model with one-sided terms, looks for a lower one on their other side ({@link OtherSideSearch}).
     * Profiles pass several starts (a warm start and the best fit's values) so that a point never
     * stays in a worse basin than a fit from scratch would find.
     */
    public FitResult fitFrom(double[][] starts, int[] hold, double[] holdValues) {
        long t0 = System.nanoTime();
        boolean[] held = baseHeld.clone();
        for (int k : hold) held[k] = true;
        MinimumResult best = null;
        List<MinimumResult> met = new ArrayList<>();
        int evaluations = 0, iterations = 0;
        for (double[] start : starts) {
            double[] x = Arrays.copyOf(start, dim);
            for (int k = 0; k < hold.length; k++) x[hold[k]] = holdValues[k];
            for (int i = 0; i < dim; i++) if (baseHeld[i] && !contains(hold, i)) x[i] = baseStart[i];
            MinimumResult r = local(x, held);
            evaluations += r.evaluations();
            iterations += r.iterations();
            if (best == null || better(r, best)) {
                if (best != null && best.converged()) met.add(best);
                best = r;
            } else if (r.converged()) {
                met.add(r);
            }
        }
        int[] candidates = searchOtherSides ? OtherSideSearch.candidates(m, held) : new int[0];
        if (candidates.length > 0 && best.converged()) {
            OtherSideSearch.Outcome o = OtherSideSearch.run(m, best, candidates, lower, upper, nll, x -> local(x, held));
            if (o.best() != best) met.add(best);
            met.addAll(o.others());
            best = o.best();
            evaluations += o.evaluations();
            iterations += o.iterations();
        }
        List<FitResult.OtherMinimum> others = otherMinima(best, met);
        best = new MinimumResult(best.status(), best.x(), best.value(), best.gradient(), best.hessian(), best.fixed(),
                best.decrement(), iterations, evaluations);
        FitResult result = toResult(best, held, System.nanoTime() - t0, others);
        lastResult = result;
        lastMinimum = best;
        lastData = nll.data();
        return result;
    }

    /**
     * A fit of the current data with parameter {@code hold} held at {@code holdValue}, following
     * {@code best}, a fit of the same data by this fitter (a toy's conditional fit after its best
     * fit). When {@code best} is the last result of this fitter and its data are still set, the fit
     * starts near the conditional minimum, found with the Hessian of best's minimum
     * ({@link ConditionalStart}: fewer Newton iterations); otherwise from best's values with
     * θ_hold moved, as {@code fit(best.values(), hold, holdValue)}.
     */
    public FitResult refitHolding(FitResult best, int hold, double holdValue) {
        double[] start = Arrays.copyOf(best.values(), dim);
        start[hold] = holdValue;
        for (int i = 0; i < dim; i++) if (baseHeld[i] && i != hold) start[i] = baseStart[i];
        boolean[] held = baseHeld.clone();
        held[hold] = true;
        if (best == lastResult && lastData == nll.data() && !hasKinks(held)) {
            if (conditionalStart == null) conditionalStart = new ConditionalStart(nll, lower, upper);
            conditionalStart.improve(lastMinimum, hold, holdValue, start);
        }
        return fit(start, hold, holdValue);
    }

    /**
     * A fit from the nominal values and from {@code extra} seeded random starts
     * ({@link RandomStarts}), keeping the lowest minimum; the distinct minima met are in
     * {@link FitResult#otherMinima()}.
     */
    public FitResult fitWithRandomStarts(int extra, long seed) {
        double[][] random = RandomStarts.around(m, baseStart, baseHeld, extra, seed);
        double[][] starts = new double[extra + 1][];
        starts[0] = baseStart;
        System.arraycopy(random, 0, starts, 1, extra);
        return fitFrom(starts, new int[0], new double[0]);
    }

    /** Whether a is a better end than b: a minimum beats a failure, then the lower −ln L wins. */
    private static boolean better(MinimumResult a, MinimumResult b) {
        if (a.converged() != b.converged()) return a.converged();
        return a.value() < b.value();
    }

    /** The distinct minima in {@code met} other than best, as results report them (lowest first). */
    private List<FitResult.OtherMinimum> otherMinima(MinimumResult best, List<MinimumResult> met) {
        List<FitResult.OtherMinimum> out = new ArrayList<>();
        List<double[]> seen = new ArrayList<>();
        seen.add(best.x());
        met.sort((a, b) -> Double.compare(a.value(), b.value()));
        for (MinimumResult r : met) {
            boolean known = false;
            for (double[] x : seen) known |= OtherSideSearch.same(m, r.x(), x);
            if (known) continue;
            seen.add(r.x());
            double[] values = new double[m.nAll()];
            nll.allValues(r.x(), values);
            out.add(new FitResult.OtherMinimum(r.value() - best.value(), values));
        }
        return List.copyOf(out);
    }

    /**
     * Whether fits look for other minima across one-sided terms (default true). Off only to
     * measure what the search changes.
     */
    public void searchOtherSides(boolean on) {
        searchOtherSides = on;
    }

    /**
     * Whether −ln L may have several minima for this fitter: the model has one-sided terms and the
     * search is on. Profiles then start each point from more than one place ({@link #fitFrom}).
     */
    public boolean mayHaveSeveralMinima() {
        return searchOtherSides && m.anyOneSided();
    }

    /** One descent from x to the minimum of its basin: Newton, clip-kink check, restart. */
    private MinimumResult local(double[] x, boolean[] held) {
        MinimumResult r = settle(minimiser, x, held);
        if (!r.converged() && restarting != null) {
            // Neither converged nor on a clip kink: the minimiser's restart from the best point.
            MinimumResult again = settle(restarting, r.x(), held);
            r = again.converged() || again.value() < r.value() ? counted(again, r) : counted(r, again);
        }
        return r;
    }

    /**
     * Minimises from x, then lets {@link ClipKinkSettler} recognise a minimum on a clip kink; when the
     * check moves the point along the kink to a lower value, Newton goes on from there.
     */
    private MinimumResult settle(Minimiser with, double[] x, boolean[] held) {
        MinimumResult r = minimiseWithKinks(with, x, held);
        for (int round = 0; round < KINK_ROUNDS && !r.converged(); round++) {
            MinimumResult checked = ClipKinkSettler.settle(nll, r, lower, upper, kinkTolerance);
            if (checked.converged() || !(checked.value() < r.value())) {
                r = checked;
                break;
            }
            r = counted(minimiseWithKinks(with, checked.x(), held), checked);
        }
        return r;
    }

    /** {@code result} with the iterations and evaluations of {@code before} added. */
    private static MinimumResult counted(MinimumResult result, MinimumResult before) {
        return new MinimumResult(result.status(), result.x(), result.value(), result.gradient(), result.hessian(),
                result.fixed(), result.decrement(), before.iterations() + result.iterations(),
                before.evaluations() + result.evaluations());
    }

    /** Rounds of (Newton, clip-kink check) before a fit is given up ({@link ClipKinkSettler}). */
    private static final int KINK_ROUNDS = 3;

    private MinimumResult minimiseWithKinks(Minimiser with, double[] x, boolean[] held) {
        return hasKinks(held) ? minimiseOnPieces(with, x, held) : with.minimise(nll, x, lower, upper, held);
    }

    private boolean hasKinks(boolean[] held) {
        for (int i = 0; i < m.nParams(); i++) if (m.kinked(i) && !held[i]) return true;
        return false;
    }

    /**
     * Minimises a likelihood with kinks at θ = 0 (linear or exponential interpolation). Each kinked
     * parameter is kept on one side of its kink, where −ln L is smooth, so the Newton steps see
     * smooth pieces; a parameter that ends on the kink moves to the other side when the slope
     * there points that way, and stays when both one-sided slopes point at the kink (a minimum on
     * the kink). A few rounds settle it.
     */
    private MinimumResult minimiseOnPieces(Minimiser with, double[] x, boolean[] held) {
        double[] lo = lower.clone(), hi = upper.clone();
        double[] grad = new double[dim];
        double[] probe = new double[dim];
        // First pieces: the side the start lies on; at the kink itself, the downhill side.
        nll.valueAndGradient(x, grad);
        double[] right = grad.clone();
        System.arraycopy(x, 0, probe, 0, dim);
        for (int i = 0; i < m.nParams(); i++) if (m.kinked(i) && !held[i] && x[i] == 0) probe[i] = LEFT_OF_KINK;
        nll.valueAndGradient(probe, grad);
        for (int i = 0; i < m.nParams(); i++) {
            if (!m.kinked(i) || held[i]) continue;
            boolean leftSide = x[i] < 0 || (x[i] == 0 && right[i] >= 0 && grad[i] > 0);
            restrict(i, leftSide, lo, hi);
        }
        MinimumResult r = null;
        int evaluations = 2, iterations = 0;
        for (int round = 0; round < MAX_PIECE_ROUNDS; round++) {
            r = with.minimise(nll, x, lo, hi, held);
            evaluations += r.evaluations();
            iterations += r.iterations();
            if (!r.converged()) break;
            x = r.x().clone();
            // The one-sided slope beyond the kink of every parameter sitting on it.
            System.arraycopy(x, 0, probe, 0, dim);
            boolean any = false;
            for (int i = 0; i < m.nParams(); i++) {
                if (!m.kinked(i) || held[i]) continue;
                if (x[i] == LEFT_OF_KINK) {
                    probe[i] = 0;
                    any = true;
                } else if (x[i] == 0) {
                    probe[i] = LEFT_OF_KINK;
                    any = true;
                }
            }
            if (!any) break;
            nll.valueAndGradient(probe, grad);
            evaluations++;
            boolean moved = false;
            for (int i = 0; i < m.nParams(); i++) {
                if (!m.kinked(i) || held[i]) continue;
                if (x[i] == LEFT_OF_KINK && grad[i] < 0 && upper[i] > 0) {
                    restrict(i, false, lo, hi);
                    x[i] = 0;
                    moved = true;
                } else if (x[i] == 0 && grad[i] > 0 && lower[i] < 0) {
                    restrict(i, true, lo, hi);
                    x[i] = LEFT_OF_KINK;
                    moved = true;
                }
            }
            if (!moved) break;
        }
        return new MinimumResult(r.status(), r.x(), r.value(), r.gradient(), r.hessian(), r.fixed(), r.decrement(),
                iterations, evaluations);
    }

    /** Rounds of piece changes before a fit on kinked parameters gives up (returns its last result). */
    private static final int MAX_PIECE_ROUNDS = 8;

    /**
     * The upper end of the piece left of a kink. The interpolation kernels take the right-hand
     * branch at θ = 0, so the left piece ends one ulp below zero, where they take the left-hand
     * one: derivatives at the piece's end then belong to the piece.
     */
    private static final double LEFT_OF_KINK = -Double.MIN_VALUE;

    private void restrict(int i, boolean leftSide, double[] lo, double[] hi) {
        if (leftSide) {
            lo[i] = lower[i];
            hi[i] = Math.min(upper[i], LEFT_OF_KINK);
        } else {
            lo[i] = Math.max(lower[i], 0);
            hi[i] = upper[i];
        }
    }

    private static boolean contains(int[] a, int v) {
        for (int x : a) if (x == v) return true;
        return false;
    }

    /** The covariance of r, from the minimiser's last factor when it is r's (one factorisation fewer). */
    private double[] covariance(MinimumResult r) {
        double[] cov = minimiser.covariance(r);
        if (cov == null && restarting != null) cov = restarting.covariance(r);
        return cov != null ? cov : r.covariance();
    }

    private FitResult toResult(MinimumResult r, boolean[] held, long nanos, List<FitResult.OtherMinimum> others) {
        final int nP = m.nParams();
        double[] values = new double[m.nAll()];
        nll.allValues(r.x(), values);
        double[] cov = computeErrors ? covariance(r) : null;
        MinimumStatus status = r.status();
        double[] errors = new double[m.nAll()];
        double[] covTheta = null;
        if (cov != null) {
            covTheta = new double[nP * nP];
            for (int i = 0; i < nP; i++) System.arraycopy(cov, i * dim, covTheta, i * nP, nP);
            for (int i = 0; i < dim; i++) errors[i] = Math.sqrt(Math.max(cov[i * dim + i], 0));
            if (dim == nP && m.nGamma() > 0) {
                double[] var = new double[m.nGamma()];
                nll.gammaVariances(r.x(), covTheta, var);
                for (int g = 0; g < m.nGamma(); g++) errors[nP + g] = Math.sqrt(var[g]);
            }
        } else {
            Arrays.fill(errors, Double.NaN);
        }
        boolean[] heldAll = Arrays.copyOf(held, m.nAll());
        for (int g = 0; g < m.nGamma() && dim == nP; g++) {
            if (m.fixed(nP + g) || nll.gammaHeld(g)) {
                heldAll[nP + g] = true;
                errors[nP + g] = 0;
            }
        }
        for (int i = 0; i < dim; i++) if (held[i]) errors[i] = 0;
        boolean[] atKink = new boolean[m.nAll()];
        for (int i = 0; i < m.nParams(); i++) {
            atKink[i] = m.kinked(i) && !held[i] && (r.x()[i] == 0 || r.x()[i] == LEFT_OF_KINK);
        }
        // only for fits with errors: toys and refits skip them with the covariance
        FitChecks checks = computeErrors && computeChecks ? FitChecks.of(m, dim, cov == null ? null : r.hessian(), errors, heldAll, values)
                : FitChecks.none(m.nAll());
        return new FitResult(status, r.value(), values, errors, covTheta, heldAll, r.evaluations(), r.iterations(),
                nanos * 1e-9, others, atKink, checks);
    }
}
