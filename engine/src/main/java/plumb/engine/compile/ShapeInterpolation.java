package plumb.engine.compile;

/**
 * Shape terms of docs/model-format.md. Every shape term of one bin is written as
 * Δ(θ) = S·θ + A·P(θ) with per-bin coefficients S = (u − d)/2 and A = (u + d − 2n)/16, and one
 * function P of the parameter shared by all bins:
 * <ul>
 *   <li>smooth: P = θ²(15 − 10θ² + 3θ⁴) for |θ| &lt; 1 and 8|θ| beyond, which is the format page's
 *       closed form inside and the linear branches outside (S + 8A = u − n, S − 8A = n − d);</li>
 *   <li>linear: P = 8|θ|.</li>
 * </ul>
 * So a likelihood evaluation computes P, P′, P″ once per term, and each bin costs two
 * multiply-adds.
 */
public final class ShapeInterpolation {

    public static final int LINEAR = 0;
    public static final int SMOOTH = 1;

    private ShapeInterpolation() {
    }

    /** Writes P(θ), P′(θ), P″(θ) into {@code out[0..2]}. */
    public static void evaluate(int mode, double theta, double[] out) {
        if (mode == SMOOTH && theta < 1 && theta > -1) {
            double t2 = theta * theta;
            out[0] = t2 * (15 - 10 * t2 + 3 * t2 * t2);
            out[1] = theta * (30 - 40 * t2 + 18 * t2 * t2);
            out[2] = 30 - 120 * t2 + 90 * t2 * t2;
        } else {
            // The kink of linear interpolation at θ = 0 takes the right-hand slope.
            double sign = theta >= 0 ? 1 : -1;
            out[0] = 8 * sign * theta;
            out[1] = 8 * sign;
            out[2] = 0;
        }
    }
}
