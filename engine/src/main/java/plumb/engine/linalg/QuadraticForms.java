package plumb.engine.linalg;

/**
 * Quadratic forms vᵀAv of many vectors with one symmetric matrix: the variances of γ and of
 * yields after a fit, thousands of them per channel block of the covariance.
 *
 * <p>Written as row updates {@code y[j] += s·A[i][j]} over the upper triangle, four vectors per
 * pass, so the inner loop is contiguous and vectorised by the JIT and each row of A is read once
 * per four vectors; the textbook dot-product form is a chain of dependent additions that stays
 * scalar. Half the multiplications of the full form: vᵀAv = Σ_i A_ii v_i² + 2 Σ_{i<j} v_i A_ij v_j.
 */
public final class QuadraticForms {

    private final double[] y0;
    private final double[] y1;
    private final double[] y2;
    private final double[] y3;

    /** Work space for vectors of length up to {@code capacity}. */
    public QuadraticForms(int capacity) {
        y0 = new double[capacity];
        y1 = new double[capacity];
        y2 = new double[capacity];
        y3 = new double[capacity];
    }

    /**
     * out[r] = v_rᵀ A v_r for r &lt; count, A symmetric n×n (row-major, row stride n, only the upper
     * triangle read), v_r in {@code vectors[r·stride .. r·stride + n)}.
     */
    public void symmetric(double[] a, int n, double[] vectors, int stride, int count, double[] out) {
        if (n > y0.length) {
            throw new IllegalArgumentException("vector length " + n + " is above the capacity " + y0.length);
        }
        int r = 0;
        for (; r + 3 < count; r += 4) {
            four(a, n, vectors, r * stride, stride, out, r);
        }
        for (; r < count; r++) {
            out[r] = one(a, n, vectors, r * stride);
        }
    }

    private void four(double[] a, int n, double[] v, int o0, int stride, double[] out, int r) {
        final int o1 = o0 + stride, o2 = o1 + stride, o3 = o2 + stride;
        final double[] y0 = this.y0, y1 = this.y1, y2 = this.y2, y3 = this.y3;
        java.util.Arrays.fill(y0, 0, n, 0);
        java.util.Arrays.fill(y1, 0, n, 0);
        java.util.Arrays.fill(y2, 0, n, 0);
        java.util.Arrays.fill(y3, 0, n, 0);
        double d0 = 0, d1 = 0, d2 = 0, d3 = 0;
        for (int i = 0; i < n; i++) {
            final double s0 = v[o0 + i], s1 = v[o1 + i], s2 = v[o2 + i], s3 = v[o3 + i];
            if (s0 == 0 && s1 == 0 && s2 == 0 && s3 == 0) continue;
            final int row = i * n;
            final double aii = a[row + i];
            d0 += aii * s0 * s0;
            d1 += aii * s1 * s1;
            d2 += aii * s2 * s2;
            d3 += aii * s3 * s3;
            for (int j = i + 1; j < n; j++) {
                final double aij = a[row + j];
                y0[j] += s0 * aij;
                y1[j] += s1 * aij;
                y2[j] += s2 * aij;
                y3[j] += s3 * aij;
            }
        }
        double e0 = 0, e1 = 0, e2 = 0, e3 = 0;
        for (int j = 0; j < n; j++) {
            e0 += v[o0 + j] * y0[j];
            e1 += v[o1 + j] * y1[j];
            e2 += v[o2 + j] * y2[j];
            e3 += v[o3 + j] * y3[j];
        }
        out[r] = d0 + 2 * e0;
        out[r + 1] = d1 + 2 * e1;
        out[r + 2] = d2 + 2 * e2;
        out[r + 3] = d3 + 2 * e3;
    }

    private double one(double[] a, int n, double[] v, int o) {
        final double[] y = y0;
        java.util.Arrays.fill(y, 0, n, 0);
        double d = 0;
        for (int i = 0; i < n; i++) {
            final double s = v[o + i];
            if (s == 0) continue;
            final int row = i * n;
            d += a[row + i] * s * s;
            for (int j = i + 1; j < n; j++) y[j] += s * a[row + j];
        }
        double e = 0;
        for (int j = 0; j < n; j++) e += v[o + j] * y[j];
        return d + 2 * e;
    }

    /** out = A v for A symmetric n×n (row-major, both triangles read), as row updates. */
    public static void times(double[] a, int n, double[] v, double[] out) {
        java.util.Arrays.fill(out, 0, n, 0);
        for (int i = 0; i < n; i++) {
            final double s = v[i];
            if (s == 0) continue;
            final int row = i * n;
            for (int j = 0; j < n; j++) out[j] += s * a[row + j];
        }
    }
}
