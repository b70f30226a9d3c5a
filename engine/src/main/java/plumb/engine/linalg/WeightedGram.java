package plumb.engine.linalg;

/**
 * C += Vᵀ·diag(w)·V over the upper triangle of C: a channel's block of a likelihood's Hessian,
 * one weighted rank-one term per bin, summed for all its bins in one call.
 *
 * <p>Cache-blocked: C is updated one tile of {@link #TILE_ROWS} × {@link #TILE_COLUMNS} at a time,
 * small enough to stay in the first-level cache while every row of V passes through it, four rows
 * of V fused per pass. Summing bin by bin over the whole block instead streams C (690 KB for a
 * 293-parameter channel) through the cache once per four bins.
 *
 * <p>The sums are those of the unblocked form, in the same order: each entry gets, in row order,
 * one term per group of four rows, ((a₀v₀ + a₁v₁) + a₂v₂) + a₃v₃, and then one term per leftover
 * row, so results are bit for bit those of a row-by-row update grouped the same way.
 */
public final class WeightedGram {

    static final int TILE_ROWS = 16;
    static final int TILE_COLUMNS = 128;

    private WeightedGram() {
    }

    /**
     * Upper triangle (j ≥ i) of C (n×n, row stride n) += Σ_r w_r v_r v_rᵀ, v_r = v[r·stride ..
     * r·stride + n), r &lt; rows: rows in groups of four from the first, then the remainder one by one.
     */
    public static void addUpper(double[] v, int stride, double[] w, int rows, int n, double[] c) {
        update(v, stride, w, rows, n, c, false);
    }

    /**
     * {@link #addUpper} for rows that are zero beyond their index (v_r[j] = 0 for j &gt; r, a lower
     * triangular matrix by rows, zeros stored): a tile of columns from j₀ on skips the rows above
     * j₀, which add nothing to it. Rows are grouped in fours from j₀ on.
     */
    public static void addUpperOfTriangularRows(double[] v, int stride, double[] w, int rows, int n, double[] c) {
        update(v, stride, w, rows, n, c, true, 0, n);
    }

    /**
     * {@link #addUpperOfTriangularRows} for the columns [from, to) of C only, {@code from} a
     * multiple of {@link #TILE_COLUMNS}: the same sums for those entries, so ranges can be split
     * between threads.
     */
    static void addUpperOfTriangularRows(double[] v, int stride, double[] w, int rows, int n, double[] c,
                                         int from, int to) {
        update(v, stride, w, rows, n, c, true, from, to);
    }

    private static void update(double[] v, int stride, double[] w, int rows, int n, double[] c, boolean triangular) {
        update(v, stride, w, rows, n, c, triangular, 0, n);
    }

    private static void update(double[] v, int stride, double[] w, int rows, int n, double[] c, boolean triangular,
                               int from, int to) {
        for (int j0 = from; j0 < to; j0 += TILE_COLUMNS) {
            final int j1 = Math.min(to, j0 + TILE_COLUMNS);
            final int first = triangular ? Math.min(j0, rows) : 0;
            final int grouped = rows - (rows - first) % 4;
            for (int i0 = 0; i0 < j1; i0 += TILE_ROWS) {
                final int i1 = Math.min(j1, i0 + TILE_ROWS);
                for (int r = first; r < grouped; r += 4) {
                    tileOfFour(v, r * stride, stride, w, r, c, n, i0, i1, j0, j1);
                }
                for (int r = grouped; r < rows; r++) {
                    tileOfOne(v, r * stride, w[r], c, n, i0, i1, j0, j1);
                }
            }
        }
    }

    private static void tileOfFour(double[] v, int o0, int stride, double[] w, int r, double[] c, int n,
                                   int i0, int i1, int j0, int j1) {
        final int o1 = o0 + stride, o2 = o1 + stride, o3 = o2 + stride;
        final double c0 = w[r], c1 = w[r + 1], c2 = w[r + 2], c3 = w[r + 3];
        for (int i = i0; i < i1; i++) {
            final double a0 = c0 * v[o0 + i], a1 = c1 * v[o1 + i], a2 = c2 * v[o2 + i], a3 = c3 * v[o3 + i];
            if (a0 == 0 && a1 == 0 && a2 == 0 && a3 == 0) continue;
            final int row = i * n;
            for (int j = Math.max(i, j0); j < j1; j++) {
                c[row + j] += a0 * v[o0 + j] + a1 * v[o1 + j] + a2 * v[o2 + j] + a3 * v[o3 + j];
            }
        }
    }

    private static void tileOfOne(double[] v, int o, double f, double[] c, int n, int i0, int i1, int j0, int j1) {
        if (f == 0) return;
        for (int i = i0; i < i1; i++) {
            final double vi = f * v[o + i];
            if (vi == 0) continue;
            final int row = i * n;
            for (int j = Math.max(i, j0); j < j1; j++) c[row + j] += vi * v[o + j];
        }
    }
}
