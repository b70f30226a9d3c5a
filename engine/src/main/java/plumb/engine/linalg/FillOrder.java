package plumb.engine.linalg;

/**
 * An order of the variables of a sparse symmetric matrix in which its Cholesky factor stays
 * sparse: greedy minimum degree (eliminate next the variable with the fewest remaining
 * neighbours, which become a clique; ties to the lowest index). A likelihood's Hessian is sparse
 * in blocks: a parameter acting on one or a few channels meets only the parameters of those
 * channels, so taking such parameters first and the global ones last leaves a dense remainder
 * of the global ones and skips most of the work before it ({@link DenseCholesky} skips zero
 * multipliers).
 *
 * <p>The neighbour sets are bit sets (k²/64 words), so an elimination merges sets word by word;
 * a 2,000-variable order takes about a tenth of a second, worth it only for matrices a Newton fit
 * factors many times with the same pattern.
 */
public final class FillOrder {

    private FillOrder() {
    }

    /**
     * The non-zero pattern of the strict lower triangle of the k×k row-major matrix a, as bit sets:
     * row i's neighbours in words [i·w, (i+1)·w), w = (k + 63) / 64, both triangles set.
     */
    public static long[] pattern(double[] a, int k) {
        final int w = words(k);
        long[] bits = new long[k * w];
        for (int i = 0; i < k; i++) {
            final int row = i * k;
            for (int j = 0; j < i; j++) {
                if (a[row + j] != 0) {
                    bits[i * w + (j >>> 6)] |= 1L << j;
                    bits[j * w + (i >>> 6)] |= 1L << i;
                }
            }
        }
        return bits;
    }

    /** Words per row of a {@link #pattern} of size k. */
    public static int words(int k) {
        return (k + 63) >>> 6;
    }

    /**
     * The minimum-degree elimination order of a {@link #pattern} (not modified): order[p] is the
     * variable eliminated p-th.
     */
    public static int[] minimumDegree(long[] pattern, int k) {
        final int w = words(k);
        long[] adj = pattern.clone();
        long[] alive = new long[w];
        for (int i = 0; i < k; i++) alive[i >>> 6] |= 1L << i;
        int[] degree = new int[k];
        for (int i = 0; i < k; i++) {
            int d = 0;
            for (int q = 0; q < w; q++) d += Long.bitCount(adj[i * w + q]);
            degree[i] = d;
        }
        int[] order = new int[k];
        boolean[] done = new boolean[k];
        long[] clique = new long[w];
        for (int p = 0; p < k; p++) {
            int v = -1;
            for (int i = 0; i < k; i++) {
                if (!done[i] && (v < 0 || degree[i] < degree[v])) v = i;
            }
            order[p] = v;
            done[v] = true;
            alive[v >>> 6] &= ~(1L << v);
            for (int q = 0; q < w; q++) clique[q] = adj[v * w + q] & alive[q];
            // every remaining neighbour of v now neighbours the others (the fill of eliminating v)
            for (int q = 0; q < w; q++) {
                long bits = clique[q];
                while (bits != 0) {
                    final int u = (q << 6) + Long.numberOfTrailingZeros(bits);
                    bits &= bits - 1;
                    final int at = u * w;
                    int d = 0;
                    for (int r = 0; r < w; r++) {
                        final long merged = (adj[at + r] | clique[r]) & alive[r];
                        adj[at + r] = merged;
                        d += Long.bitCount(merged);
                    }
                    if ((adj[at + (u >>> 6)] & (1L << u)) != 0) {
                        adj[at + (u >>> 6)] &= ~(1L << u);
                        d--;
                    }
                    degree[u] = d;
                }
            }
        }
        return order;
    }
}
