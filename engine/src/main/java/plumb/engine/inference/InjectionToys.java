package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.likelihood.DataSet;

import java.util.Arrays;
import java.util.function.IntConsumer;

/**
 * Signal-injection toys of one model: generating points at an injected POI value, batches of toy
 * fits, and the Asimov closure check.
 *
 * <p>A batch is a pure function of (model, fit settings, held parameters, generating point, seed,
 * first toy, count): toy i draws from its own random stream ({@link Toys}), every toy fit starts
 * from a point made of the generating point and the toy's own data ({@link ToyStart}), never from
 * the previous toy of its thread, and results are stored by
 * index. So results do not depend on the thread count, and batches (first, count) merge exactly
 * into the run of all their toys. Immutable and thread-safe; the fitters live in the workers.
 */
public final class InjectionToys {

    /** Largest |fitted − generating| allowed in the Asimov closure check. */
    public static final double CLOSURE_TOLERANCE = 1e-6;

    /**
     * Decrement tolerance of the closure fit. The default 1e-8 stops up to ~1e-4 σ away from the
     * minimum; the closure must resolve 1e-6, so its Newton iterations go on to rounding level.
     */
    private static final double CLOSURE_FIT_TOLERANCE = 1e-20;

    private final CompiledModel m;
    private final FitSettings settings;
    private final int[] held;
    private final double[] heldValues;
    private final int[] pulled;

    /**
     * @param held        parameters held in every fit besides the model's fixed ones (e.g. --fix),
     *                    with their values; the POI must not be among them
     * @throws IllegalArgumentException when the model has no POI or the POI is held or fixed
     */
    public InjectionToys(CompiledModel model, FitSettings settings, int[] held, double[] heldValues) {
        if (model.poi() < 0) throw new IllegalArgumentException("the model names no parameter of interest");
        if (model.fixed(model.poi())) throw new IllegalArgumentException("the parameter of interest is fixed in the model");
        for (int i : held) {
            if (i == model.poi()) throw new IllegalArgumentException("the parameter of interest cannot be held");
        }
        this.m = model;
        this.settings = settings;
        this.held = held.clone();
        this.heldValues = heldValues.clone();
        int[] p = new int[model.nAll()];
        int k = 0;
        for (int i = 0; i < model.nAll(); i++) {
            if (model.constraintType(i) != ConstraintType.NONE && !model.fixed(i) && !isHeld(i)) p[k++] = i;
        }
        this.pulled = Arrays.copyOf(p, k);
    }

    /**
     * The seed of the toys of the {@code k}-th injected value of a run with {@code seed}: the seed
     * itself for the first, then seeds a large odd step apart, so that the points of a linearity
     * fit come from independent toys (the weighted line fit assumes independent points) while a
     * run of one value equals the first value of a longer list.
     */
    public static long injectionSeed(long seed, int k) {
        return seed + k * 0xD1B54A32D192ED03L;
    }

    /** Injection toys of the problem's model with its settings and held parameters (its data is not used). */
    public InjectionToys(Problem p) {
        this(p.model(), p.settings(), p.heldIndices(), p.heldValues());
    }

    public CompiledModel model() {
        return m;
    }

    /** The constrained parameters whose pulls each toy records (not fixed, not held), in index order. */
    public int[] pulledParameters() {
        return pulled.clone();
    }

    /**
     * The point toys are generated at for POI value {@code poiValue}: the nominal values (with the
     * held values), or with {@code postfit} those of a fit to the observed data with the POI and
     * the held parameters held (docs/model-format.md, as for a post-fit Asimov set). The returned
     * conditional fit is null for the nominal point; callers must check it converged.
     */
    public DataSets.Generated generatingPoint(double poiValue, boolean postfit) {
        return DataSets.asimovAt(m, poiValue, held, heldValues, postfit, settings);
    }

    /**
     * Fits toys {@code first} .. {@code first + count − 1} generated at {@code generating}.
     *
     * @param generating    the generating point (nAll values, γ included), e.g. from {@link #generatingPoint}
     * @param fluctuateAux  draw the auxiliary values too (docs/model-format.md); false keeps them at
     *                      the generating values
     * @param threads       worker threads (results do not depend on it)
     * @param progress      called once per finished toy from the worker threads, or null
     * @return the toys' results in index order
     */
    public ToyFit[] run(double[] generating, long seed, boolean fluctuateAux, long first, int count, int threads,
                        IntConsumer progress) {
        return run(generating, seed, fluctuateAux, first, count, WorkRunner.threads(threads), progress);
    }

    /**
     * As {@link #run(double[], long, boolean, long, int, int, IntConsumer)}, on {@code runner}
     * (threads, or a cluster): the same results whatever runs them.
     */
    public ToyFit[] run(double[] generating, long seed, boolean fluctuateAux, long first, int count, WorkRunner runner,
                        IntConsumer progress) {
        if (generating.length != m.nAll()) {
            throw new IllegalArgumentException("generating point has " + generating.length + " values, expected " + m.nAll());
        }
        if (first < 0 || count < 0) throw new IllegalArgumentException("first " + first + " and count " + count + " must be >= 0");
        Work work = new Work(settings, held, heldValues, pulled, generating.clone(), seed, first, fluctuateAux);
        return runner.run(m, work, count, progress).toArray(new ToyFit[0]);
    }

    /** Toys first + i of one generating point: what a task needs, in plain values. */
    private record Work(FitSettings settings, int[] held, double[] heldValues, int[] pulled, double[] point, long seed,
                        long first, boolean fluctuateAux) implements RangeWork<Work.Worker, ToyFit> {

        /** A thread's fitter with the generating point's expected counts and the toys' start. */
        record Worker(Fitter fitter, double[] expected, boolean[] channels, ToyStart start) { }

        @Override
        public Worker worker(CompiledModel m) {
            boolean[] allChannels = new boolean[m.nChannels()];
            Arrays.fill(allChannels, true); // toys fill blinded channels too (docs/model-format.md)
            Fitter fitter = new Fitter(m, DataSets.asimov(m, point), settings, held, heldValues);
            fitter.computeChecks(false); // a toy keeps only the POI, its error and the pulls
            double[] expected = DataSets.expectedCounts(m, point);
            return new Worker(fitter, expected, allChannels, new ToyStart(fitter, point, expected, allChannels, held));
        }

        /** Toy {@code first + i}: generated, fitted from its {@link ToyStart}, reduced to a {@link ToyFit}. */
        @Override
        public ToyFit run(Worker w, CompiledModel m, int i) {
            long index = first + i;
            w.fitter().setData(Toys.generate(m, w.expected(), point, w.channels(), seed, index, fluctuateAux));
            FitResult r = w.fitter().fit(w.start().of(w.fitter()), new int[0], new double[0]);
            double[] values = r.values(), errors = r.errors();
            double[] pulls = new double[pulled.length];
            for (int k = 0; k < pulled.length; k++) {
                int p = pulled[k];
                pulls[k] = errors[p] > 0 ? (values[p] - point[p]) / errors[p] : Double.NaN;
            }
            return new ToyFit(index, r.status(), values[m.poi()], errors[m.poi()], pulls);
        }
    }

    /**
     * The Asimov closure check: a fit from the nominal values to the Asimov data set of
     * {@code generating} must return every free parameter to its generating value within
     * {@link #CLOSURE_TOLERANCE} — the cheapest sign that a model and the fit are sane.
     */
    public AsimovClosure closure(double[] generating) {
        DataSet asimov = DataSets.asimov(m, generating);
        FitSettings tight = new FitSettings(settings.explicitGamma(), settings.minimiser(),
                settings.options().withTolerance(CLOSURE_FIT_TOLERANCE));
        Fitter fitter = new Fitter(m, asimov, tight, held, heldValues);
        FitResult r = fitter.fit();
        double worst = 0;
        int worstIndex = -1;
        for (int i = 0; i < m.nAll(); i++) {
            if (r.held()[i]) continue;
            double d = Math.abs(r.values()[i] - generating[i]);
            if (Double.isNaN(d)) {
                worst = d;
                worstIndex = i;
                break;
            }
            if (worstIndex < 0 || d > worst) {
                worst = d;
                worstIndex = i;
            }
        }
        return new AsimovClosure(generating[m.poi()], generating.clone(), r, worst, worstIndex,
                r.converged() && worst <= CLOSURE_TOLERANCE);
    }

    private boolean isHeld(int i) {
        for (int h : held) if (h == i) return true;
        return false;
    }
}
