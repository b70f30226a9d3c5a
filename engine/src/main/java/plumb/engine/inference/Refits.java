package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

import java.util.Arrays;

/**
 * Refits near a best fit with one parameter held (impacts, scans), warm-started as docs/engine.md
 * section 5 describes: from the best fit moved along the linearised response of the other parameters,
 * Δθ = Σ_·k/Σ_kk · Δθ_k (the first Newton step with the best-fit Hessian, which is what the
 * conditional mean of the post-fit Gaussian is). The start depends only on (k, value), never on
 * a previous task, so results do not depend on the thread count. Package-private: validated by
 * its callers.
 */
final class Refits {

    private final CompiledModel m;
    private final FitResult best;
    private final int dim;
    /** Post-fit covariance with the γ when they are refitted in the profiled layout, else null. */
    private final PostfitCovariance full;

    Refits(CompiledModel m, FitResult best, int dim, PostfitCovariance full) {
        this.m = m;
        this.best = best;
        this.dim = dim;
        this.full = full;
    }

    /**
     * Evaluation budget of one refit attempt. A warm-started refit takes 2–5 evaluations; one
     * that wanders off a kink or a clipped yield should fail fast and be retried from another
     * start rather than spend the 2000 of a fit from scratch.
     */
    static final int REFIT_EVALUATIONS = 150;

    /** The settings of refit workers: the fit's, with the smaller evaluation budget. */
    static FitSettings refitSettings(FitSettings s) {
        return new FitSettings(s.explicitGamma(), s.minimiser(),
                s.options().withMaxEvaluations(Math.min(REFIT_EVALUATIONS, s.options().maxEvaluations())));
    }

    /** The value clipped to the parameter's range (docs/cli-contract.md). */
    double clip(int k, double value) {
        return Math.max(m.lower(k), Math.min(m.upper(k), value));
    }

    /** The warm start of a refit with parameter k at {@code value} (length dim). */
    double[] start(int k, double value) {
        double[] x = Arrays.copyOf(best.values(), dim);
        double delta = value - best.values()[k];
        final int nP = m.nParams();
        double[] cov = best.covariance();
        if (k < nP && cov != null && cov[k * nP + k] > 0) {
            double f = delta / cov[k * nP + k];
            for (int i = 0; i < nP; i++) x[i] += cov[i * nP + k] * f;
        } else if (k >= nP && full != null && full.variance(k) > 0) {
            double f = delta / full.variance(k);
            for (int i = 0; i < nP; i++) x[i] += full.covariance(i, k) * f;
        }
        for (int i = 0; i < dim; i++) {
            if (best.held()[i]) x[i] = best.values()[i];
            else x[i] = Math.max(m.lower(i), Math.min(m.upper(i), x[i]));
        }
        if (k < dim) x[k] = value;
        return x;
    }

    /**
     * Refits with parameter k held at {@code value} (already clipped), errors not computed. A γ of
     * the profiled layout is held inside the fitter's likelihood for this fit and released after.
     */
    FitResult refit(Fitter fitter, int k, double value) {
        if (fitter.mayHaveSeveralMinima()) return refitEverywhere(fitter, k, value);
        FitResult r = refitFrom(fitter, k, value, improvedStart(fitter, k, value));
        if (r.converged()) return r;
        // A failed warm start (a strongly non-linear response): once more from the best fit with
        // only θ_k moved, then from the nominal values. Each start depends only on the task.
        double[] plain = Arrays.copyOf(best.values(), dim);
        if (k < dim) plain[k] = value;
        FitResult second = refitFrom(fitter, k, value, plain);
        if (second.converged()) return second;
        double[] nominal = fitter.nominalStart();
        if (k < dim) nominal[k] = value;
        FitResult third = refitFrom(fitter, k, value, nominal);
        return third.converged() ? third : r;
    }

    /**
     * A refit where −ln L may have several minima: the lowest of the fits from the warm start, from
     * the best fit with only θ_k moved, and from the nominal values (the start of a fit from
     * scratch), followed by the fitter's search on the other side of one-sided terms. So the point
     * never lies above a fresh fit with θ_k held, and a warm start that strays into a worse basin
     * far from the best fit does not decide the result.
     */
    private FitResult refitEverywhere(Fitter fitter, int k, double value) {
        double[] plain = Arrays.copyOf(best.values(), dim);
        double[] nominal = fitter.nominalStart();
        if (k < dim) {
            plain[k] = value;
            nominal[k] = value;
        }
        return refitFrom(fitter, k, value, improvedStart(fitter, k, value), plain, nominal);
    }

    /** The warm start moved by {@link ChordSteps} toward the refit's minimum where they apply. */
    private double[] improvedStart(Fitter fitter, int k, double value) {
        double[] x = start(k, value);
        if (ChordSteps.apply(m, fitter.likelihood(), best, k)) ChordSteps.improve(m, fitter.likelihood(), best, x, k);
        return x;
    }

    private FitResult refitFrom(Fitter fitter, int k, double value, double[]... starts) {
        if (k < dim) return fitter.fitFrom(starts, new int[] {k}, new double[] {value});
        int g = k - m.nParams();
        fitter.likelihood().holdGamma(g, value);
        try {
            return fitter.fitFrom(starts, new int[0], new double[0]);
        } finally {
            fitter.likelihood().holdGamma(g, Double.NaN);
        }
    }
}
