package plumb.engine.compile;

/**
 * Multiplicative terms of a sample, with first and second derivatives: the normalisation terms
 * f(θ) of docs/model-format.md and the free factors φ. Each term is described by
 * {@link #COEFFS} coefficients stored consecutively in a {@code double[]}:
 * {@code [mode, κu, κd, ln κu, ln κd, a1, …, a6]}. Kernels here check nothing: the model reader
 * validated κ > 0 already.
 */
public final class NormInterpolation {

    /** Coefficients stored per norm term: mode, κu, κd, ln κu, ln κd, a1..a6. */
    public static final int COEFFS = 11;

    public static final int EXPONENTIAL = 0;
    public static final int LINEAR = 1;
    public static final int SMOOTH = 2;
    /** A free multiplicative factor φ: f = θ. */
    public static final int FACTOR = 3;

    private NormInterpolation() {
    }

    /** Writes the coefficients of one norm term at {@code out[off..off+COEFFS)}. */
    public static void coefficients(int mode, double kappaUp, double kappaDown, double[] out, int off) {
        out[off] = mode;
        out[off + 1] = kappaUp;
        out[off + 2] = kappaDown;
        double lu = Math.log(kappaUp);
        double ld = Math.log(kappaDown);
        out[off + 3] = lu;
        out[off + 4] = ld;
        if (mode != SMOOTH) return;
        // p(θ) = f − 1 = Σ a_k θ^k matches f, f', f'' of the exponential branches at θ = ±1.
        // Split into odd and even parts; each gives a 3×3 system with the closed-form solution below.
        double s0 = (kappaUp - kappaDown) / 2;
        double s1 = (kappaUp * lu - kappaDown * ld) / 2;
        double s2 = (kappaUp * lu * lu - kappaDown * ld * ld) / 2;
        double e0 = (kappaUp + kappaDown - 2) / 2;
        double e1 = (kappaUp * lu + kappaDown * ld) / 2;
        double e2 = (kappaUp * lu * lu + kappaDown * ld * ld) / 2;
        double a5 = (s2 - 3 * (s1 - s0)) / 8;
        double a3 = (s1 - s0) / 2 - 2 * a5;
        double a1 = s0 - a3 - a5;
        double a6 = (e2 - 5 * e1 + 8 * e0) / 8;
        double a4 = (e1 - 2 * e0) / 2 - 2 * a6;
        double a2 = e0 - a4 - a6;
        out[off + 5] = a1;
        out[off + 6] = a2;
        out[off + 7] = a3;
        out[off + 8] = a4;
        out[off + 9] = a5;
        out[off + 10] = a6;
    }

    /**
     * Evaluates f, f′, f″ of the term at {@code c[off..]} for parameter value θ into
     * {@code out[0..2]}.
     */
    public static void evaluate(double[] c, int off, double theta, double[] out) {
        int mode = (int) c[off];
        switch (mode) {
            case FACTOR -> {
                out[0] = theta;
                out[1] = 1;
                out[2] = 0;
            }
            case LINEAR -> {
                double slope = theta >= 0 ? c[off + 1] - 1 : 1 - c[off + 2];
                double f = 1 + theta * slope;
                if (f > 0) {
                    out[0] = f;
                    out[1] = slope;
                } else {
                    out[0] = 0;
                    out[1] = 0;
                }
                out[2] = 0;
            }
            case SMOOTH -> {
                if (theta >= 1 || theta <= -1) {
                    exponential(c, off, theta, out);
                } else {
                    double a1 = c[off + 5], a2 = c[off + 6], a3 = c[off + 7];
                    double a4 = c[off + 8], a5 = c[off + 9], a6 = c[off + 10];
                    double t = theta;
                    // Horner forms of p, p', p''.
                    out[0] = 1 + t * (a1 + t * (a2 + t * (a3 + t * (a4 + t * (a5 + t * a6)))));
                    out[1] = a1 + t * (2 * a2 + t * (3 * a3 + t * (4 * a4 + t * (5 * a5 + t * 6 * a6))));
                    out[2] = 2 * a2 + t * (6 * a3 + t * (12 * a4 + t * (20 * a5 + t * 30 * a6)));
                }
            }
            default -> exponential(c, off, theta, out);
        }
    }

    private static void exponential(double[] c, int off, double theta, double[] out) {
        double slope = theta >= 0 ? c[off + 3] : -c[off + 4];
        double f = Math.exp(theta * slope);
        out[0] = f;
        out[1] = slope * f;
        out[2] = slope * slope * f;
    }
}
