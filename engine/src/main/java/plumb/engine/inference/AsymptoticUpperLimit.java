package plumb.engine.inference;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.special.Erf;
import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.util.List;

/**
 * CLs upper limits on the POI from the asymptotic distributions of q̃μ (Cowan, Cranmer, Gross,
 * Vitells, EPJ C 71 (2011) 1554, section 3.7 and eqs. 65–66; CLs: A. L. Read, J. Phys. G 28
 * (2002) 2693). σ comes from the Asimov data set at μ = 0 and is evaluated at each μ tested:
 * σ(μ)² = μ²/q_μ,A(μ), so every formula below needs only √q_μ,A = μ/σ. Each limit, observed and
 * each expected band, is its own root in μ found by {@link Roots} to 1e-5 relative: secant steps whose second point
 * is the limit the Gaussian model would give with the widths measured at the first.
 */
public final class AsymptoticUpperLimit {

    private static final NormalDistribution NORMAL = new NormalDistribution(null, 0, 1);

    private AsymptoticUpperLimit() {
    }

    /** Upper tail 1 − Φ(x), from erfc so that it keeps its precision far in the tail. */
    static double upperTail(double x) {
        return 0.5 * Erf.erfc(x / Math.sqrt(2));
    }

    /**
     * CLs+b = p_μ of an observed q̃μ = {@code q}, with q_μ,A = {@code qA}: 1 − Φ(√q̃) for q̃ ≤ μ²/σ²,
     * else 1 − Φ((q̃ + μ²/σ²)/(2μ/σ)). Cowan et al. eq. 66 with μ′ = μ.
     */
    public static double clsPlusB(double q, double qA) {
        if (q <= qA) return upperTail(Math.sqrt(q));
        return upperTail((q + qA) / (2 * Math.sqrt(qA)));
    }

    /**
     * CLb = 1 − p_b of an observed q̃μ: 1 − F(q̃μ | μ′ = 0) = Φ(μ/σ − √q̃) for q̃ ≤ μ²/σ², else
     * 1 − Φ((q̃ − μ²/σ²)/(2μ/σ)). Cowan et al. eq. 65 with μ′ = 0.
     */
    public static double clb(double q, double qA) {
        if (q <= qA) return upperTail(Math.sqrt(q) - Math.sqrt(qA));
        return upperTail((q - qA) / (2 * Math.sqrt(qA)));
    }

    /** CLs = CLs+b / CLb; 1 where the data cannot tell the hypotheses apart (q_μ,A = 0). */
    public static double cls(double q, double qA) {
        if (!(qA > 0)) return 1;
        return clsPlusB(q, qA) / clb(q, qA);
    }

    /**
     * The value of μ/σ = √q_μ,A at which expected band N reaches CLs = 1 − cl: solving
     * Φ(N − μ/σ)/Φ(N) = 1 − cl gives μ/σ = N − Φ⁻¹((1 − cl)Φ(N)) (for a constant σ this is
     * eq. 89 of Cowan et al.; for N = 0 it is Φ⁻¹(1 − α/2)).
     */
    public static double bandTarget(int n, double cl) {
        return n - NORMAL.inverseCumulativeProbability((1 - cl) * NORMAL.cumulativeProbability(n));
    }

    /**
     * The asymptotic CLs limit at confidence level {@code cl}.
     *
     * @param p             the problem; its data give the observed limit
     * @param asimovZero    the Asimov data set at μ = 0 that gives σ (and the expected limits)
     * @param observedLimit false for expected limits only (a blinded model has no observed limit)
     * @throws InferenceException when a needed fit fails or a limit cannot be bracketed in the POI range
     */
    public static LimitResult compute(Problem p, DataSet asimovZero, boolean observedLimit, double cl) {
        return compute(p.model(), observedLimit ? p.data() : null, asimovZero, p.settings(), p.heldIndices(),
                p.heldValues(), cl);
    }

    /** As {@link #compute(Problem, DataSet, boolean, double)}, with the parts given one by one; {@code data} null for no observed limit. */
    public static LimitResult compute(CompiledModel m, DataSet data, DataSet asimovZero, FitSettings settings,
                                      int[] held, double[] heldValues, double cl) {
        if (!(cl > 0 && cl < 1)) throw new IllegalArgumentException("confidence level " + cl + " is not in (0, 1)");
        long t0 = System.nanoTime();
        PoiProfile asimov = new PoiProfile(m, asimovZero, settings, held, heldValues, "the Asimov data set at mu = 0");
        PoiProfile observed = data == null ? null
                : new PoiProfile(m, data, settings, held, heldValues, "the " + data.kind() + " data");
        double lo = Math.max(0, m.lower(m.poi())), hi = m.upper(m.poi());
        if (!(hi > lo)) throw new InferenceException("the POI's range has no positive values to set a limit in");
        double sigma = sigmaEstimate(m, asimov, observed, lo, hi);

        double[] bands = new double[ExpectedBands.N.length];
        for (int k = 0; k < bands.length; k++) {
            int n = ExpectedBands.N[k];
            double target = bandTarget(n, cl);
            // second point: where the band would be with σ as measured at the first (μ/σ = target)
            bands[k] = Roots.decreasingRoot(mu -> target - Math.sqrt(asimov.qTilde(mu)), sigma * target,
                    mu -> mu * target / Math.sqrt(asimov.qTilde(mu)), lo, hi, "the expected limit (" + bandName(n) + ")");
            sigma = bands[k] / target;   // the next band's first guess uses σ where this one ended
        }
        double observedLimit = Double.NaN, muHat = Double.NaN;
        if (observed != null) {
            muHat = observed.muHat();
            double lnAlpha = Math.log(1 - cl);
            double guess = Math.max(muHat, 0) + sigma * bandTarget(0, cl);
            double from = Math.max(muHat, 0);
            observedLimit = Roots.decreasingRoot(mu -> Math.log(Math.max(Double.MIN_NORMAL,
                    cls(observed.qTilde(mu), asimov.qTilde(mu)))) - lnAlpha, guess,
                    mu -> gaussianLimit(observed.qTilde(mu), asimov.qTilde(mu), mu, from, hi, lnAlpha),
                    lo, hi, "the observed limit");
        }
        int fits = asimov.fits() + (observed == null ? 0 : observed.fits());
        ExpectedBands none = ExpectedBands.missing();
        return new LimitResult(cl, "asymptotic", observedLimit, ExpectedBands.of(bands), Double.NaN, none, muHat,
                List.of(), 0, 0, fits, (System.nanoTime() - t0) * 1e-9);
    }

    /**
     * The observed limit if the widths measured at μ held everywhere: q̃ and q_A growing as
     * (μ − μ̂)² and μ² with the values {@code q} and {@code qA} they have at μ (where q̃ is 0, the
     * Asimov width stands in). The second point of the observed limit's secant search; NaN when
     * the model gives no root in (μ̂, hi].
     */
    static double gaussianLimit(double q, double qA, double mu, double muHat, double hi, double lnAlpha) {
        if (!(qA > 0) || !(mu > 0)) return Double.NaN;
        double perMuA = qA / (mu * mu);
        double perMu = q > 0 && mu > muHat ? q / ((mu - muHat) * (mu - muHat)) : perMuA;
        UnivariateFunction model = x -> {
            double d = Math.max(x - muHat, 0);
            return Math.log(Math.max(Double.MIN_NORMAL, cls(perMu * d * d, perMuA * x * x))) - lnAlpha;
        };
        double a = Math.max(muHat, 0) + 1e-12 * hi;
        if (!(a < hi) || !(model.value(a) > 0) || !(model.value(hi) < 0)) return Double.NaN;
        return new BrentSolver(1e-12, 1e-14 * hi).solve(200, model, a, hi);
    }

    /**
     * A first σ for the bracket searches: μ_p/√q_μp,A at a probe μ_p, the Asimov fit's error on the
     * POI when it has one. A probe the data hardly constrain is moved up tenfold until q_A is usable.
     */
    private static double sigmaEstimate(CompiledModel m, PoiProfile asimov, PoiProfile observed, double lo, double hi) {
        double probe = asimov.best().errors()[m.poi()];
        if (!(probe > 0 && Double.isFinite(probe)) && observed != null) probe = observed.best().errors()[m.poi()];
        if (!(probe > 0 && Double.isFinite(probe))) probe = (hi - lo) / 20;
        probe = Math.min(hi, lo + probe);
        double qA = asimov.qTilde(probe);
        while (qA < 1e-6 && probe < hi) {
            probe = Math.min(hi, lo + 10 * (probe - lo));
            qA = asimov.qTilde(probe);
        }
        if (!(qA > 0)) {
            throw new InferenceException("the data do not constrain the POI: q_mu,A is 0 up to its upper bound " + hi);
        }
        return (probe - lo) / Math.sqrt(qA);
    }

    /** "median", "-1 sigma", "+2 sigma". */
    static String bandName(int n) {
        return n == 0 ? "median" : (n > 0 ? "+" : "") + n + " sigma";
    }
}
