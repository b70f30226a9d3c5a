package plumb.engine.inference;

import org.apache.commons.math3.distribution.NormalDistribution;
import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.IntConsumer;

/**
 * CLs upper limits from toys with the q̃μ statistic (Cowan, Cranmer, Gross, Vitells, EPJ C 71
 * (2011) 1554, eq. 16; CLs: A. L. Read, J. Phys. G 28 (2002) 2693).
 *
 * <p>At each μ tested, toys of the signal-plus-background hypothesis (POI = μ) and of the
 * background-only one (POI = 0) are drawn with the nuisance parameters at their conditional fits
 * to the data, θ̂̂(μ) and θ̂̂(0) (the usual frequentist construction), and the auxiliary values
 * fluctuated; CLs = p_{s+b}/(1 − p_b), the fractions of each set with q̃μ at least the observed
 * one, with binomial errors. The expected limits use the background-only quantiles of q̃μ in
 * place of the observed value. The μ values form a small adaptive set started from the
 * asymptotic limits and widened until every limit is bracketed; each limit is interpolated
 * linearly in ln CLs between the two tested values around it, and its toy-statistics error is the
 * CLs error there over the slope.
 *
 * <p>Reproducibility: toy i of the background-only set is drawn once from (seed, i) and reused
 * at every μ; toy i of the signal-plus-background set uses the same (seed′, i) stream at every μ
 * (common random numbers keep the CLs curve smooth in μ). Every toy fit starts from the toy's
 * generating point or its own best fit, never from another toy's, so nothing depends on the
 * number of threads.
 */
public final class ToyLimits {

    private static final NormalDistribution NORMAL = new NormalDistribution(null, 0, 1);
    /** Stream constants that separate the two toy sets drawn from one --seed (digits of √2 and √3). */
    private static final long STREAM_B = 0x6A09E667F3BCC908L, STREAM_SB = 0xBB67AE8584CAA73BL;
    /** POI values tested at most: the adaptive set stops widening there. */
    private static final int MAX_POINTS = 14;
    /** A limit's bracket wider than this fraction of the limit gets a point at the interpolated limit. */
    private static final double REFINE_WIDTH = 0.1;
    /** POI values of the first pass, spread geometrically over the asymptotic limits. */
    private static final int INITIAL_POINTS = 5;

    private ToyLimits() {
    }

    /**
     * What the toy limit needs.
     *
     * @param data           the data of the observed limit, or null (blinded: expected limits only)
     * @param generationData the data the generating nuisances are fitted to (usually {@code data}; for a
     *                       blinded model the unblinded channels), or null for the nominal values
     * @param asimovZero     the Asimov set at μ = 0, for the asymptotic first guess of the μ values
     * @param toys           toys per hypothesis and μ
     */
    public record Request(CompiledModel model, DataSet data, DataSet generationData, DataSet asimovZero,
                          FitSettings settings, int[] held, double[] heldValues, double cl, int toys, long seed,
                          int threads) {
        public Request {
            if (!(cl > 0 && cl < 1)) throw new IllegalArgumentException("confidence level " + cl + " is not in (0, 1)");
            if (toys < 1) throw new IllegalArgumentException("toys must be at least 1, got " + toys);
        }
    }

    /**
     * Computes the toy-based limit.
     *
     * @param progress called with the number of toy tasks finished so far (it grows with each μ
     *                 tested: {@link #tasksPerPoint} per μ plus {@code toys} at the start), or null
     * @throws InferenceException when a fit to the data fails or a limit cannot be bracketed
     */
    public static LimitResult compute(Request r, IntConsumer progress) {
        return compute(r, WorkRunner.threads(r.threads()), progress);
    }

    /**
     * As {@link #compute(Request, IntConsumer)}, each set of toys run by {@code runner} (threads or
     * a cluster; the same numbers either way). The adaptive choice of μ values stays here.
     */
    public static LimitResult compute(Request r, WorkRunner runner, IntConsumer progress) {
        return new Run(r, runner, progress).limit();
    }

    /** Toy tasks per μ value tested (both hypotheses). */
    public static int tasksPerPoint(int toys) {
        return 2 * toys;
    }

    /**
     * Toy tasks of a run that needs only its first μ values: the toys at the start plus
     * {@link #tasksPerPoint} at each first value (a progress total; runs that add μ values do more).
     */
    public static long firstTasks(int toys) {
        return toys + (long) INITIAL_POINTS * tasksPerPoint(toys);
    }

    /** A toy of the background-only set, drawn once: its data and best fit (null when it failed). */
    private record BackgroundToy(DataSet data, FitResult best) { }

    /** A toy's outcome: a value (q̃μ, or 0 for a usable background fit; NaN when a fit failed) and the fits made. */
    private record Outcome(double value, int fits) implements java.io.Serializable { }

    /** What both toy sets share: the fitter's settings, the channels toys fill, the background-only stream. */
    private record Common(DataSet fitterData, FitSettings settings, int[] held, double[] heldValues, boolean[] channels,
                          double[] generatingZero, long seedB) implements java.io.Serializable {

        Fitter fitter(CompiledModel m) {
            return Fitter.valuesOnly(m, fitterData, settings, held, heldValues);
        }

        /** The start of the background-only toys' fits, for a worker's fitter. */
        ToyStart startZero(Fitter fitter, double[] expectedZero) {
            return new ToyStart(fitter, generatingZero, expectedZero, channels, held);
        }

        /** Background-only toy i with its best fit (null when the fit found no minimum) and the fits made. */
        BackgroundToy background(CompiledModel m, Fitter fitter, double[] expectedZero, ToyStart startZero, int i) {
            DataSet toy = Toys.generate(m, expectedZero, generatingZero, channels, seedB, i, true);
            fitter.setData(toy);
            FitResult best = fitter.fit(startZero.of(fitter), -1, 0);
            return new BackgroundToy(toy, PoiProfile.minimumFound(best) ? best : null);
        }
    }

    /**
     * The background-only toys, drawn and fitted once. On threads of this process each toy is kept
     * ({@code keep}, not shipped) for the μ values tested later; in a cluster those recompute it.
     */
    private static final class BackgroundWork implements RangeWork<BackgroundWork.Worker, Outcome> {
        private static final long serialVersionUID = 1L;
        private final Common c;
        private final transient BackgroundToy[] keep;

        BackgroundWork(Common c, BackgroundToy[] keep) {
            this.c = c;
            this.keep = keep;
        }

        record Worker(Fitter fitter, double[] expectedZero, ToyStart startZero) { }

        @Override
        public Worker worker(CompiledModel m) {
            Fitter fitter = c.fitter(m);
            double[] expectedZero = DataSets.expectedCounts(m, c.generatingZero);
            return new Worker(fitter, expectedZero, c.startZero(fitter, expectedZero));
        }

        @Override
        public Outcome run(Worker w, CompiledModel m, int i) {
            BackgroundToy t = c.background(m, w.fitter(), w.expectedZero(), w.startZero(), i);
            if (keep != null) keep[i] = t;
            return new Outcome(t.best() == null ? Double.NaN : 0, 1);
        }
    }

    /**
     * Both toy sets at one μ: indices 0 .. n−1 the signal-plus-background toys, n .. 2n−1 the
     * background-only ones (taken from {@code background} when it is at hand, else drawn and
     * fitted again: the same numbers, not counted twice).
     */
    private static final class PointWork implements RangeWork<PointWork.Worker, Outcome> {
        private static final long serialVersionUID = 1L;
        private final Common c;
        private final double mu;
        private final double[] generating;
        private final long seedSb;
        private final int n;
        private final transient BackgroundToy[] background;

        PointWork(Common c, double mu, double[] generating, long seedSb, int n, BackgroundToy[] background) {
            this.c = c;
            this.mu = mu;
            this.generating = generating;
            this.seedSb = seedSb;
            this.n = n;
            this.background = background;
        }

        static final class Worker {
            final Fitter fitter;
            final double[] expected;
            final ToyStart start;
            double[] expectedZero;
            ToyStart startZero;

            Worker(Fitter fitter, double[] expected, ToyStart start) {
                this.fitter = fitter;
                this.expected = expected;
                this.start = start;
            }
        }

        @Override
        public Worker worker(CompiledModel m) {
            Fitter fitter = c.fitter(m);
            double[] expected = DataSets.expectedCounts(m, generating);
            return new Worker(fitter, expected, new ToyStart(fitter, generating, expected, c.channels, c.held));
        }

        @Override
        public Outcome run(Worker w, CompiledModel m, int i) {
            int[] fits = new int[1];
            if (i < n) {
                w.fitter.setData(Toys.generate(m, w.expected, generating, c.channels, seedSb, i, true));
                FitResult best = w.fitter.fit(w.start.of(w.fitter), -1, 0);
                fits[0]++;
                double q = PoiProfile.minimumFound(best) ? qTilde(m, w.fitter, best, true, mu, fits) : Double.NaN;
                return new Outcome(q, fits[0]);
            }
            BackgroundToy toy;
            if (background != null) {
                toy = background[i - n];
                w.fitter.setData(toy.data());
            } else {
                if (w.expectedZero == null) {
                    w.expectedZero = DataSets.expectedCounts(m, c.generatingZero);
                    w.startZero = c.startZero(w.fitter, w.expectedZero);
                }
                toy = c.background(m, w.fitter, w.expectedZero, w.startZero, i - n);
            }
            if (toy.best() == null) return new Outcome(Double.NaN, 0);
            // a kept toy's best fit is not the fitter's last one: plain starts, as where toys are refitted
            double q = qTilde(m, w.fitter, toy.best(), false, mu, fits);
            return new Outcome(q, fits[0]);
        }
    }

    /**
     * q̃μ of the fitter's data given its best fit; NaN when a fit fails. Adds the fits made to
     * {@code fits[0]}. With {@code justFitted} (best is the fitter's last fit, on every runner) the
     * conditional fit starts from {@link Fitter#refitHolding}, else from best's values.
     */
    private static double qTilde(CompiledModel m, Fitter fitter, FitResult best, boolean justFitted, double mu, int[] fits) {
        double muHat = best.values()[m.poi()];
        if (muHat > mu) return 0;
        double denominator = best.nll();
        if (muHat < 0) {   // only with a POI range below 0: the q̃μ denominator is L(0, θ̂̂(0))
            FitResult zero = fitter.fit(best.values(), m.poi(), 0);
            fits[0]++;
            if (!PoiProfile.minimumFound(zero)) return Double.NaN;
            denominator = zero.nll();
        }
        FitResult at = justFitted && muHat >= 0 ? fitter.refitHolding(best, m.poi(), mu) : fitter.fit(best.values(), m.poi(), mu);
        fits[0]++;
        return PoiProfile.minimumFound(at) ? Math.max(0, 2 * (at.nll() - denominator)) : Double.NaN;
    }

    private static final class Run {
        final Request r;
        final CompiledModel m;
        final IntConsumer progress;
        final WorkRunner runner;
        final AtomicInteger done = new AtomicInteger();
        final AtomicInteger fits = new AtomicInteger();
        final boolean[] channels;
        final PoiProfile observed;
        final PoiProfile generation;
        final double lo, hi, alpha;
        final List<LimitResult.ClsPoint> points = new ArrayList<>();
        BackgroundToy[] background;
        boolean[] backgroundFailed;
        Common common;
        double[] generatingZero;
        int failed;

        Run(Request r, WorkRunner runner, IntConsumer progress) {
            this.r = r;
            this.m = r.model();
            this.runner = runner;
            this.progress = progress;
            if (r.data() != null) {
                channels = r.data().channelIncluded().clone();
            } else {
                channels = new boolean[m.nChannels()];
                Arrays.fill(channels, true);
            }
            observed = r.data() == null ? null : new PoiProfile(m, r.data(), r.settings(), r.held(), r.heldValues(),
                    "the " + r.data().kind() + " data");
            generation = r.generationData() == null ? null : r.generationData() == r.data() ? observed
                    : new PoiProfile(m, r.generationData(), r.settings(), r.held(), r.heldValues(),
                    "the " + r.generationData().kind() + " data");
            lo = Math.max(0, m.lower(m.poi()));
            hi = m.upper(m.poi());
            alpha = 1 - r.cl();
        }

        LimitResult limit() {
            long t0 = System.nanoTime();
            if (!(hi > lo)) throw new InferenceException("the POI's range has no positive values to set a limit in");
            generatingZero = generatingPoint(0);
            throwBackgroundToys();
            for (double mu : initialPoints()) addPoint(mu);
            // Widen until the observed limit and every band are bracketed.
            while (points.size() < MAX_POINTS) {
                boolean up = false, down = false;
                for (int t = observed == null ? 0 : -1; t < ExpectedBands.N.length; t++) {
                    int d = direction(t);
                    up |= d > 0;
                    down |= d < 0;
                }
                double top = points.get(points.size() - 1).mu(), bottom = points.get(0).mu();
                if (up && top < hi) addPoint(Math.min(hi, 1.5 * top));
                else if (down) addPoint(lo + (bottom - lo) / 1.5);
                else break;
            }
            // Refine: a point where each limit is interpolated to lie, while its bracket is wider
            // than REFINE_WIDTH of the limit (interpolation error then stays below the toy error).
            for (int round = 0; round < 3 && points.size() < MAX_POINTS; round++) {
                List<Double> extra = new ArrayList<>();
                for (int t = observed == null ? 0 : -1; t < ExpectedBands.N.length; t++) {
                    int j = crossingIndex(t);
                    if (j < 0) continue;
                    double[] c = crossing(t);
                    double width = points.get(j).mu() - points.get(j - 1).mu();
                    if (width > REFINE_WIDTH * c[0] && !near(c[0]) && !nearAny(extra, c[0])) extra.add(c[0]);
                }
                if (extra.isEmpty()) break;
                for (double mu : extra) if (points.size() < MAX_POINTS) addPoint(mu);
            }
            double observedLimit = Double.NaN, observedError = Double.NaN;
            if (observed != null) {
                double[] c = require(-1, "the observed limit");
                observedLimit = c[0];
                observedError = c[1];
            }
            double[] bands = new double[ExpectedBands.N.length], errors = new double[ExpectedBands.N.length];
            for (int k = 0; k < bands.length; k++) {
                double[] c = require(k, "the expected limit (" + AsymptoticUpperLimit.bandName(ExpectedBands.N[k]) + ")");
                bands[k] = c[0];
                errors[k] = c[1];
            }
            int totalToys = r.toys() * (1 + points.size());
            int allFits = fits.get() + (observed == null ? 0 : observed.fits())
                    + (generation == null || generation == observed ? 0 : generation.fits());
            return new LimitResult(r.cl(), "toys", observedLimit, ExpectedBands.of(bands), observedError,
                    ExpectedBands.of(errors), observed == null ? Double.NaN : observed.muHat(), points, totalToys,
                    failed, allFits, (System.nanoTime() - t0) * 1e-9);
        }

        private static boolean nearAny(List<Double> mus, double mu) {
            for (double x : mus) if (Math.abs(x - mu) <= 0.02 * mu) return true;
            return false;
        }

        private boolean near(double mu) {
            for (LimitResult.ClsPoint p : points) if (Math.abs(p.mu() - mu) <= 0.02 * mu) return true;
            return false;
        }

        /** θ̂̂(μ) of the generation data, or the nominal values with the POI and held values set. */
        double[] generatingPoint(double mu) {
            if (generation != null) return generation.at(mu).values();
            double[] v = m.nominal();
            for (int k = 0; k < r.held().length; k++) v[r.held()[k]] = r.heldValues()[k];
            v[m.poi()] = mu;
            return v;
        }

        /** POI values first tested: around the asymptotic limits (or spread over the range if they fail). */
        double[] initialPoints() {
            try {
                LimitResult a = AsymptoticUpperLimit.compute(m, r.data(), r.asimovZero(), r.settings(), r.held(),
                        r.heldValues(), r.cl());
                double low = a.expected().minus2(), high = a.expected().plus2();
                if (!Double.isNaN(a.observed())) {
                    low = Math.min(low, a.observed());
                    high = Math.max(high, a.observed());
                }
                double from = Math.max(0.8 * low, lo + 1e-6 * (hi - lo)), to = Math.min(hi, 1.2 * high);
                double[] mus = new double[INITIAL_POINTS];
                for (int k = 0; k < INITIAL_POINTS; k++) mus[k] = from * Math.pow(to / from, k / (INITIAL_POINTS - 1.0));
                return mus;
            } catch (InferenceException e) {
                double span = hi - lo;
                return new double[] {lo + 0.02 * span, lo + 0.1 * span, lo + 0.3 * span};
            }
        }

        void throwBackgroundToys() {
            long seed = Toys.toySeed(r.seed() ^ STREAM_B, 0);
            common = new Common(r.data() != null ? r.data() : r.asimovZero(), r.settings(), r.held(), r.heldValues(),
                    channels, generatingZero, seed);
            background = new BackgroundToy[r.toys()];
            List<Outcome> out = runTasks(new BackgroundWork(common, background), r.toys());
            for (Outcome o : out) {
                fits.addAndGet(o.fits());
                if (Double.isNaN(o.value())) failed++;
            }
            backgroundFailed = new boolean[r.toys()];
            for (int i = 0; i < backgroundFailed.length; i++) backgroundFailed[i] = Double.isNaN(out.get(i).value());
            if (background.length > 0 && background[0] == null) background = null;   // ran elsewhere: not at hand
        }

        /** Runs one set of toy tasks, the progress counted on from the sets before. */
        List<Outcome> runTasks(RangeWork<?, Outcome> work, int count) {
            int base = done.get();
            List<Outcome> out = runner.run(m, work, count, progress == null ? null : d -> progress.accept(base + d));
            done.set(base + count);
            return out;
        }

        /** Throws both toy sets at μ and stores its CLs point (kept sorted by μ). */
        void addPoint(double mu) {
            double[] generating = generatingPoint(mu);
            long seedSb = Toys.toySeed(r.seed() ^ STREAM_SB, 0);
            int n = r.toys();
            List<Outcome> out = runTasks(new PointWork(common, mu, generating, seedSb, n, background), 2 * n);
            List<Double> q = new ArrayList<>(2 * n);
            for (Outcome o : out) {
                q.add(o.value());
                fits.addAndGet(o.fits());
            }
            double[] qSb = new double[n], qB = new double[n];
            for (int i = 0; i < n; i++) {
                qSb[i] = q.get(i);
                qB[i] = q.get(n + i);
                if (Double.isNaN(qSb[i])) failed++;
                if (Double.isNaN(qB[i]) && !backgroundFailed[i]) failed++;
            }
            double qObs = observed == null ? Double.NaN : observed.qTilde(mu);
            double[] sb = fraction(qSb, qObs), b = fraction(qB, qObs);
            double[] cls = ratio(sb, b);
            double[] expectedCls = new double[ExpectedBands.N.length];
            double[] sortedB = finiteSorted(qB);
            for (int k = 0; k < expectedCls.length; k++) {
                // Band N: the background-only outcome at the Φ(N) quantile of μ̂, which is the
                // 1 − Φ(N) quantile of q̃μ (q̃μ falls as μ̂ rises).
                double qN = quantile(sortedB, 1 - NORMAL.cumulativeProbability(ExpectedBands.N[k]));
                expectedCls[k] = ratio(fraction(qSb, qN), fraction(qB, qN))[0];
            }
            points.add(new LimitResult.ClsPoint(mu, qObs, sb[0], b[0], cls[0], cls[1], (int) sb[2], (int) b[2],
                    expectedCls));
            points.sort(Comparator.comparingDouble(LimitResult.ClsPoint::mu));
        }

        /**
         * CLs of target t at point p: t = −1 the observed, else expected band index t.
         */
        double cls(LimitResult.ClsPoint p, int t) {
            return t < 0 ? p.cls() : p.expectedCls()[t];
        }

        /** 0 when target t's limit is bracketed, −1 when CLs is below α already at the lowest μ, +1 when above α at every μ. */
        int direction(int t) {
            if (crossing(t) != null) return 0;
            return cls(points.get(0), t) < alpha ? -1 : 1;
        }

        /** Index j of the first point below α when point j − 1 is at or above it (the bracket of target t), else −1. */
        int crossingIndex(int t) {
            for (int j = 1; j < points.size(); j++) {
                if (!(cls(points.get(j - 1), t) >= alpha)) return -1;
                if (cls(points.get(j), t) < alpha) return j;
            }
            return -1;
        }

        double[] require(int t, String what) {
            double[] c = crossing(t);
            if (c == null) {
                throw new InferenceException(String.format(Locale.ROOT,
                        "%s could not be bracketed by toys: CLs does not cross %s between POI values %s and %s",
                        what, alpha, points.get(0).mu(), points.get(points.size() - 1).mu()));
            }
            return c;
        }

        /**
         * The limit of target t and its toy-statistics error, interpolated linearly in ln CLs
         * between the last point above α and the first below it (linearly in CLs when the point
         * below has CLs = 0); null when no such pair exists.
         */
        double[] crossing(int t) {
            int j = crossingIndex(t);
            if (j < 0) return null;
            LimitResult.ClsPoint a = points.get(j - 1), b = points.get(j);
            double ca = cls(a, t), cb = cls(b, t);
            double ea = t < 0 ? a.clsError() : errorOf(a, t), eb = t < 0 ? b.clsError() : errorOf(b, t);
            double mu, err;
            if (cb > 0) {
                double la = Math.log(ca), lb = Math.log(cb);
                double f = (Math.log(alpha) - la) / (lb - la);
                mu = a.mu() + f * (b.mu() - a.mu());
                double slope = (lb - la) / (b.mu() - a.mu());
                err = ((1 - f) * ea / ca + f * eb / cb) / Math.abs(slope);
            } else {
                double f = (alpha - ca) / (cb - ca);
                mu = a.mu() + f * (b.mu() - a.mu());
                double slope = (cb - ca) / (b.mu() - a.mu());
                err = ((1 - f) * ea + f * eb) / Math.abs(slope);
            }
            return new double[] {mu, err};
        }

        /** Binomial error of an expected band's CLs, as for the observed one (fractions from its definition). */
        private double errorOf(LimitResult.ClsPoint p, int t) {
            double c = p.expectedCls()[t];
            double pb = 1 - NORMAL.cumulativeProbability(-ExpectedBands.N[t]);   // Φ(N): 1 − p_b by construction
            double psb = c * pb;
            double e1 = Math.sqrt(Math.max(psb * (1 - psb), 0) / p.toysSb());
            double e2 = Math.sqrt(pb * (1 - pb) / p.toysB());
            return Math.sqrt(Math.pow(e1 / pb, 2) + Math.pow(psb * e2 / (pb * pb), 2));
        }
    }

    /** {fraction of finite q at least qRef, its binomial error, count of finite q}. */
    static double[] fraction(double[] q, double qRef) {
        int n = 0, k = 0;
        for (double v : q) {
            if (Double.isNaN(v)) continue;
            n++;
            if (v >= qRef - ToyPValue.TIE_TOLERANCE) k++;
        }
        double p = n > 0 ? (double) k / n : Double.NaN;
        return new double[] {p, n > 0 ? Math.sqrt(p * (1 - p) / n) : Double.NaN, n};
    }

    /**
     * {CLs = p_{s+b}/(1 − p_b), its error}: errors of the two fractions propagated in quadrature,
     * σ² = (σ_sb/c_b)² + (c_sb σ_b/c_b²)², which stays finite when c_sb = 0. With c_b = 0 the
     * ratio is 0 when c_sb is 0 too (nothing as extreme as the data in either set) and 1 otherwise.
     */
    static double[] ratio(double[] sb, double[] b) {
        if (!(b[0] > 0)) return new double[] {sb[0] > 0 ? 1 : 0, Double.NaN};
        double c = sb[0] / b[0];
        double e = Math.sqrt(Math.pow(sb[1] / b[0], 2) + Math.pow(sb[0] * b[1] / (b[0] * b[0]), 2));
        return new double[] {c, e};
    }

    private static double[] finiteSorted(double[] q) {
        return Arrays.stream(q).filter(v -> !Double.isNaN(v)).sorted().toArray();
    }

    /** The empirical quantile at probability p (nearest rank); NaN for no values. */
    static double quantile(double[] sorted, double p) {
        if (sorted.length == 0) return Double.NaN;
        int k = (int) Math.ceil(p * sorted.length) - 1;
        return sorted[Math.max(0, Math.min(sorted.length - 1, k))];
    }
}
