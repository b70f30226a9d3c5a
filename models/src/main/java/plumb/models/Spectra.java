package plumb.models;

import org.apache.commons.math3.special.Erf;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * Binned spectra for the demo and synthetic models: yields are integrals of a density over each
 * bin, so that they do not depend on where inside a bin the density is sampled. StrictMath and
 * commons-math's pure-Java erf keep the numbers identical on every JVM, which the stored demo
 * file relies on.
 */
final class Spectra {

    /** Significant digits kept in generated numbers: far below any statistical precision, short files. */
    private static final MathContext DIGITS = new MathContext(6, RoundingMode.HALF_EVEN);

    /** Yields below this many events are written as 0 (a Gaussian tail far from its peak). */
    private static final double NEGLIGIBLE = 1e-4;

    private Spectra() {
    }

    /** {@code n + 1} equal-width edges from {@code lo} to {@code hi}. */
    static double[] uniformEdges(double lo, double hi, int n) {
        double[] e = new double[n + 1];
        for (int i = 0; i <= n; i++) e[i] = round(lo + (hi - lo) * i / n);
        e[n] = hi;
        return e;
    }

    /**
     * Falling power law m^-index, normalised to {@code total} over the edges at {@code scale} = 1;
     * {@code scale} multiplies every mass (an energy scale shift), keeping that normalisation.
     */
    static double[] powerLaw(double[] edges, double total, double index, double scale) {
        double norm = total / powerLawIntegral(edges[0], edges[edges.length - 1], index, 1.0);
        double[] y = new double[edges.length - 1];
        for (int b = 0; b < y.length; b++) y[b] = norm * powerLawIntegral(edges[b], edges[b + 1], index, scale);
        return y;
    }

    // Density f(m/scale)/scale with f(m) = m^-index: its integral is scale^(index-1) ∫ m^-index dm.
    private static double powerLawIntegral(double a, double b, double index, double scale) {
        double k = 1.0 - index;
        return StrictMath.pow(scale, index - 1.0) * (StrictMath.pow(b, k) - StrictMath.pow(a, k)) / k;
    }

    /** Falling exponential exp(-m/slope), normalised to {@code total} at scale 1, as {@link #powerLaw}. */
    static double[] exponential(double[] edges, double total, double slope, double scale) {
        double norm = total / exponentialIntegral(edges[0], edges[edges.length - 1], slope, 1.0);
        double[] y = new double[edges.length - 1];
        for (int b = 0; b < y.length; b++) y[b] = norm * exponentialIntegral(edges[b], edges[b + 1], slope, scale);
        return y;
    }

    // Density f(m/scale)/scale with f(m) = exp(-m/slope).
    private static double exponentialIntegral(double a, double b, double slope, double scale) {
        double s = slope * scale;
        return s / scale * (StrictMath.exp(-a / s) - StrictMath.exp(-b / s));
    }

    /** A Gaussian peak holding {@code total} events over the whole line (less inside the edges). */
    static double[] gaussian(double[] edges, double total, double mean, double sigma) {
        double[] y = new double[edges.length - 1];
        double z = 1.0 / (sigma * StrictMath.sqrt(2.0));
        for (int b = 0; b < y.length; b++) {
            // Erf.erf(x1, x2) takes the difference without cancellation in the tails.
            y[b] = 0.5 * total * Erf.erf((edges[b] - mean) * z, (edges[b + 1] - mean) * z);
        }
        return y;
    }

    /** Copy scaled by 1 + amplitude·t, with t running linearly from -1 (first bin) to +1 (last bin). */
    static double[] tilt(double[] nominal, double amplitude) {
        int n = nominal.length;
        double[] y = new double[n];
        for (int b = 0; b < n; b++) {
            double t = n == 1 ? 0.0 : 2.0 * b / (n - 1) - 1.0;
            y[b] = nominal[b] * (1.0 + amplitude * t);
        }
        return y;
    }

    /** Copy scaled by 1 + amplitude·(1.5 t² − 0.5): ends against middle, t as in {@link #tilt}. */
    static double[] bend(double[] nominal, double amplitude) {
        int n = nominal.length;
        double[] y = new double[n];
        for (int b = 0; b < n; b++) {
            double t = n == 1 ? 0.0 : 2.0 * b / (n - 1) - 1.0;
            y[b] = nominal[b] * (1.0 + amplitude * (1.5 * t * t - 0.5));
        }
        return y;
    }

    /** Copy rescaled to the total of {@code reference} (a shape-only variation); unchanged if empty. */
    static double[] sameTotal(double[] y, double[] reference) {
        double s = sum(y);
        double r = sum(reference);
        double[] out = y.clone();
        if (s > 0) for (int b = 0; b < out.length; b++) out[b] *= r / s;
        return out;
    }

    /**
     * {@code y} (in place; returned) set to 0 wherever {@code nominal} is 0: a template without
     * events has no variation either. Otherwise a shifted peak's tail would give a bin with no
     * nominal yield a variation on one side only, and the clip max(0, ·) a kink at θ = 0.
     */
    static double[] emptyWhere(double[] nominal, double[] y) {
        for (int b = 0; b < y.length; b++) if (nominal[b] == 0) y[b] = 0;
        return y;
    }

    static double sum(double[] y) {
        double s = 0;
        for (int b = 0; b < y.length; b++) s += y[b];
        return s;
    }

    /** Six significant digits, negligible values to 0, element by element (in place; returned). */
    static double[] round(double[] y) {
        for (int b = 0; b < y.length; b++) y[b] = Math.abs(y[b]) < NEGLIGIBLE ? 0.0 : round(y[b]);
        return y;
    }

    /**
     * Six significant digits, half-even on the exact decimal value of x, so that the result is the
     * same everywhere. Fast path: x scaled by an exact power of ten into [10⁵, 10⁶) is within
     * 2·10⁻¹⁰ of its true value, so unless it lies within 10⁻⁶ of a rounding boundary the nearest
     * integer r is the exact decimal rounding (also where the scaling error crosses 10⁵ or 10⁶: the
     * digits then round to the same power of ten), and r / 10^k (one correctly rounded IEEE operation
     * on exact operands) is the double BigDecimal gives. Near a boundary, exact decimal arithmetic.
     * A generated model holds tens of millions of numbers; BigDecimal for each took most of the
     * generation time.
     */
    static double round(double x) {
        if (x == 0.0 || !Double.isFinite(x)) return x;
        double ax = Math.abs(x);
        int k = 5 - (int) Math.floor(Math.log10(ax));
        if (k >= -22 && k <= 22) {
            double p = POW10[Math.abs(k)];
            double scaled = k >= 0 ? ax * p : ax / p;
            if (scaled >= 1e5 && scaled < 1e6) {
                double whole = Math.floor(scaled);
                double frac = scaled - whole;
                if (Math.abs(frac - 0.5) > 1e-6) {
                    double r = frac > 0.5 ? whole + 1 : whole;
                    double v = k >= 0 ? r / p : r * p;
                    return x < 0 ? -v : v;
                }
            }
        }
        return exactRound(x);
    }

    /** Six significant digits by exact decimal arithmetic (the reference for {@link #round(double)}). */
    static double exactRound(double x) {
        if (x == 0.0 || !Double.isFinite(x)) return x;
        return new BigDecimal(x).round(DIGITS).doubleValue();
    }

    /** 10⁰ … 10²², each exact in a double. */
    private static final double[] POW10 = new double[23];

    static {
        double p = 1;
        for (int i = 0; i < POW10.length; i++, p *= 10) POW10[i] = p;
    }
}
