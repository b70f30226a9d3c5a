package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.BoundedNewton;
import plumb.engine.minimise.Minimiser;
import plumb.engine.minimise.MinimumResult;
import plumb.engine.minimise.MinimumStatus;
import plumb.engine.minimise.ReferenceMinimiser;

import java.util.Arrays;

/**
 * Fits one model to one data set, many times: a fit from the nominal values, or refits from a
 * given point with some parameters held (impacts, scans, toys). Holds a likelihood and a
 * minimiser sized for the model; not thread-safe, one per thread.
 */
public final class Fitter {

    private final CompiledModel m;
    private final BinnedNll nll;
    private final Minimiser minimiser;
    private final int dim;
    private final double[] lower;
    private final double[] upper;
    /** Held in every fit of this fitter: the model's fixed parameters and the caller's. */
    private final boolean[] baseHeld;
    private final double[] baseStart;

    /**
     * @param held   parameters (index &lt; nAll) to hold in every fit, with their values in {@code heldValues}
     */
    public Fitter(CompiledModel model, DataSet data, FitSettings settings, int[] held, double[] heldValues) {
        this.m = model;
        this.nll = new BinnedNll(model, data, settings.explicitGamma());
        this.dim = nll.dimension();
        this.minimiser = settings.optimizer() == FitSettings.Optimizer.REFERENCE
                ? new ReferenceMinimiser(dim, settings.options())
                : new BoundedNewton(dim, settings.options());
        lower = Arrays.copyOf(model.lower, dim);
        upper = Arrays.copyOf(model.upper, dim);
        baseHeld = Arrays.copyOf(model.fixed, dim);
        baseStart = Arrays.copyOf(model.nominal, dim);
        for (int k = 0; k < held.length; k++) {
            int i = held[k];
            if (i < dim) {
                baseHeld[i] = true;
                baseStart[i] = heldValues[k];
            } else {
                nll.holdGamma(i - model.nParams, heldValues[k]);
            }
        }
    }

    /** A fitter with nothing held beyond the model's fixed parameters. */
    public Fitter(CompiledModel model, DataSet data, FitSettings settings) {
        this(model, data, settings, new int[0], new double[0]);
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

    /** Fit from {@code start} with the listed parameters (indices &lt; dimension) held at the given values. */
    public FitResult fit(double[] start, int[] hold, double[] holdValues) {
        long t0 = System.nanoTime();
        double[] x = Arrays.copyOf(start, dim);
        boolean[] held = baseHeld.clone();
        for (int k = 0; k < hold.length; k++) {
            held[hold[k]] = true;
            x[hold[k]] = holdValues[k];
        }
        for (int i = 0; i < dim; i++) if (baseHeld[i] && !contains(hold, i)) x[i] = baseStart[i];
        MinimumResult r = minimiser.minimise(nll, x, lower, upper, held);
        return toResult(r, held, System.nanoTime() - t0);
    }

    private static boolean contains(int[] a, int v) {
        for (int x : a) if (x == v) return true;
        return false;
    }

    private FitResult toResult(MinimumResult r, boolean[] held, long nanos) {
        final int nP = m.nParams;
        double[] values = new double[m.nAll];
        nll.allValues(r.x(), values);
        double[] cov = r.covariance();
        MinimumStatus status = r.status();
        double[] errors = new double[m.nAll];
        double[] covTheta = null;
        if (cov != null) {
            covTheta = new double[nP * nP];
            for (int i = 0; i < nP; i++) System.arraycopy(cov, i * dim, covTheta, i * nP, nP);
            for (int i = 0; i < dim; i++) errors[i] = Math.sqrt(Math.max(cov[i * dim + i], 0));
            if (dim == nP && m.nGamma > 0) {
                double[] var = new double[m.nGamma];
                nll.gammaVariances(r.x(), covTheta, var);
                for (int g = 0; g < m.nGamma; g++) errors[nP + g] = Math.sqrt(var[g]);
            }
        } else {
            Arrays.fill(errors, Double.NaN);
        }
        boolean[] heldAll = Arrays.copyOf(held, m.nAll);
        for (int g = 0; g < m.nGamma && dim == nP; g++) {
            if (m.fixed[nP + g]) {
                heldAll[nP + g] = true;
                errors[nP + g] = 0;
            }
        }
        for (int i = 0; i < dim; i++) if (held[i]) errors[i] = 0;
        return new FitResult(status, r.value(), values, errors, covTheta, heldAll, r.evaluations(), r.iterations(),
                nanos * 1e-9);
    }
}
