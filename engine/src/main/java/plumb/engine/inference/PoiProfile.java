package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.MinimumStatus;

import java.util.Arrays;
import java.util.Locale;
import java.util.TreeMap;

/**
 * The profile likelihood of the parameter of interest on one data set: the unconditional best fit
 * and conditional fits with the POI held, from which the test statistics q̃μ and q0 follow
 * (Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554, eqs. 12 and 16). Conditional fits are
 * cached by μ and each new one starts from the cached fit at the nearest μ, moved toward the new μ's
 * minimum ({@link #nearestStart}): the result depends only
 * on the sequence of μ asked for, which a sequential root-finding makes deterministic. Not
 * thread-safe: one per thread.
 */
public final class PoiProfile {

    private final CompiledModel m;
    private final Fitter fitter;
    private final String what;
    private FitResult best;
    private int fits;
    private final TreeMap<Double, FitResult> conditional = new TreeMap<>();

    /**
     * @param what names the data set in failure messages, e.g. "the observed data"
     * @throws IllegalArgumentException when the model names no POI
     */
    public PoiProfile(CompiledModel m, DataSet data, FitSettings settings, int[] held, double[] heldValues, String what) {
        if (m.poi() < 0) throw new IllegalArgumentException("the model names no parameter of interest");
        this.m = m;
        this.fitter = new Fitter(m, data, settings, held, heldValues);
        fitter.computeErrors(false);   // conditional fits: −ln L and values only
        fitter.computeChecks(false);   // the best fit's errors serve the bracket and the warm starts only
        this.what = what;
    }

    public CompiledModel model() {
        return m;
    }

    /**
     * The unconditional best fit (computed once).
     *
     * @throws InferenceException when it does not converge
     */
    public FitResult best() {
        if (best == null) {
            fitter.computeErrors(true);    // the best fit's POI error sets the first bracket
            best = fitter.fit();
            fitter.computeErrors(false);
            fits++;
            if (!minimumFound(best)) {
                throw new InferenceException(String.format(Locale.ROOT, "the fit to %s did not converge (%s)", what,
                        best.status()));
            }
        }
        return best;
    }

    /**
     * Whether a fit found the minimum −ln L a test statistic needs: converged, or stopped at a
     * minimum where only the curvature is missing (NOT_POSITIVE_DEFINITE_AT_MINIMUM). The latter
     * is routine for q̃μ and q0: with no events in a bin −ln L is linear in the POI, and the best
     * fit sits on the bound μ = 0 with zero curvature; its value is exact, only its error is not.
     */
    static boolean minimumFound(FitResult r) {
        return r.converged() || r.status() == MinimumStatus.NOT_POSITIVE_DEFINITE_AT_MINIMUM;
    }

    /** Fits made so far. */
    public int fits() {
        return fits;
    }

    /** The best-fit POI value μ̂. */
    public double muHat() {
        return best().values()[m.poi()];
    }

    /**
     * The fit with the POI held at {@code mu}, started from the cached conditional fit at the
     * nearest μ (or the best fit). A fit that does not converge is retried once from the nominal
     * values before it counts as failed.
     *
     * @throws InferenceException when neither attempt converges
     */
    public FitResult at(double mu) {
        FitResult cached = conditional.get(mu);
        if (cached != null) return cached;
        double[] start = nearestStart(mu);
        FitResult r;
        if (fitter.mayHaveSeveralMinima()) {
            // Several minima possible: the neighbour's basin may not be this μ's lowest. The lowest
            // of the warm start, the best fit's values and a start from scratch, then the fitter's
            // search across one-sided terms.
            r = fitter.fitFrom(new double[][] {start, best().values(), fitter.nominalStart()}, new int[] {m.poi()},
                    new double[] {mu});
        } else {
            r = fitter.fit(start, m.poi(), mu);
        }
        fits++;
        if (!minimumFound(r)) {
            r = fitter.fit(fitter.nominalStart(), m.poi(), mu);
            fits++;
        }
        if (!minimumFound(r)) {
            throw new InferenceException(String.format(Locale.ROOT,
                    "the fit to %s with %s held at %s did not converge (%s)", what, m.parameterNames(m.poi()), mu,
                    r.status()));
        }
        conditional.put(mu, r);
        return r;
    }

    /**
     * The start of the fit at μ: the cached fit at the nearest μ (or the best fit) moved along the
     * linear response of the other parameters, Δθ_i = Σ_iμ/Σ_μμ · Δμ with the best fit's
     * covariance, then brought closer by {@link ChordSteps} (docs/engine.md section 5).
     */
    private double[] nearestStart(double mu) {
        Double lo = conditional.floorKey(mu), hi = conditional.ceilingKey(mu);
        Double key = lo == null ? hi : hi == null ? lo : (mu - lo <= hi - mu ? lo : hi);
        FitResult from = key == null ? best() : conditional.get(key);
        double[] x = Arrays.copyOf(from.values(), fitter.dimension());
        int poi = m.poi(), nP = m.nParams();
        double[] cov = best().covariance();
        if (cov == null || !(cov[poi * nP + poi] > 0)) return x;
        double shift = (mu - x[poi]) / cov[poi * nP + poi];
        boolean[] held = best().held();
        for (int i = 0; i < nP; i++) {
            if (!held[i]) x[i] = Math.max(m.lower(i), Math.min(m.upper(i), x[i] + cov[i * nP + poi] * shift));
        }
        x[poi] = mu;
        BinnedNll nll = fitter.likelihood();
        if (ChordSteps.apply(m, nll, best(), poi)) ChordSteps.improve(m, nll, best(), x, poi);
        return x;
    }

    /**
     * The statistic q̃μ for an upper limit: 0 when μ̂ &gt; μ, else 2[−ln L(μ, θ̂̂(μ)) + ln L(max(μ̂, 0), θ̂)],
     * where for μ̂ &lt; 0 the denominator is the conditional fit at μ = 0 (Cowan et al. eq. 16).
     * With the POI's lower bound at 0 (the default range [0, 50]) the best fit cannot go below 0:
     * it already is L(0, θ̂̂(0)) whenever the unbounded μ̂ would be negative, so the bounded best
     * fit is exactly the q̃μ denominator and no extra fit is made. Rounding noise below 0 is
     * clipped.
     */
    public double qTilde(double mu) {
        double muHat = muHat();
        if (muHat > mu) return 0;
        double denominator = muHat >= 0 ? best().nll() : at(0).nll();
        return Math.max(0, 2 * (at(mu).nll() - denominator));
    }

    /**
     * The discovery statistic q0 = 2[−ln L(0, θ̂̂(0)) + ln L(μ̂, θ̂)] for μ̂ ≥ 0 and 0 for μ̂ &lt; 0
     * (Cowan et al. eq. 12). With the POI bounded at 0, μ̂ = 0 gives q0 = 0 by itself.
     */
    public double q0() {
        if (muHat() <= 0) return 0;
        return Math.max(0, 2 * (at(0).nll() - best().nll()));
    }
}
