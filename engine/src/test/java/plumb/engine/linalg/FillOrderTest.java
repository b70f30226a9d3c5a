package plumb.engine.linalg;

import org.junit.jupiter.api.Test;

import java.util.Arrays;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The minimum-degree order: a permutation, the hub of a star among the last (no fill at all), and on a
 * block-sparse pattern far less fill than the natural order with the global variables first,
 * the fill counted by eliminating the graph edge by edge (the definition of fill, common practice).
 */
class FillOrderTest {

    /** Edges added when eliminating the variables of the pattern in the given order. */
    private static long fill(boolean[][] adj, int[] order) {
        int k = adj.length;
        boolean[][] g = new boolean[k][];
        for (int i = 0; i < k; i++) g[i] = adj[i].clone();
        boolean[] gone = new boolean[k];
        long added = 0;
        for (int v : order) {
            gone[v] = true;
            for (int a = 0; a < k; a++) {
                if (gone[a] || !g[v][a]) continue;
                for (int b = a + 1; b < k; b++) {
                    if (gone[b] || !g[v][b] || g[a][b]) continue;
                    g[a][b] = g[b][a] = true;
                    added++;
                }
            }
        }
        return added;
    }

    private static double[] matrix(boolean[][] adj) {
        int k = adj.length;
        double[] a = new double[k * k];
        for (int i = 0; i < k; i++) {
            a[i * k + i] = 1;
            for (int j = 0; j < k; j++) if (adj[i][j]) a[i * k + j] = 0.5;
        }
        return a;
    }

    private static void assertPermutation(int[] order, int k) {
        int[] sorted = order.clone();
        Arrays.sort(sorted);
        int[] identity = new int[k];
        for (int i = 0; i < k; i++) identity[i] = i;
        assertArrayEquals(identity, sorted);
    }

    @Test
    void eliminatesTheHubOfAStarLast() {
        int k = 70;
        boolean[][] adj = new boolean[k][k];
        for (int i = 1; i < k; i++) adj[0][i] = adj[i][0] = true;
        int[] order = FillOrder.minimumDegree(FillOrder.pattern(matrix(adj), k), k);
        assertPermutation(order, k);
        // the hub goes when one leaf is left (a tie of degree 1, to the lower index)
        assertEquals(0, order[k - 2]);
        assertEquals(0, fill(adj, order));
        int[] natural = new int[k];
        for (int i = 0; i < k; i++) natural[i] = i;
        assertEquals((long) (k - 1) * (k - 2) / 2, fill(adj, natural)); // the hub first joins all the others
    }

    @Test
    void leavesLittleFillInABlockSparsePattern() {
        int k = 130, globals = 10;
        SplittableRandom r = new SplittableRandom(3);
        boolean[][] adj = new boolean[k][k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < i; j++) {
                boolean coupled = (i < globals || j < globals) ? r.nextDouble() < 0.8
                        : (i - globals) / 20 == (j - globals) / 20 && r.nextDouble() < 0.5;
                adj[i][j] = adj[j][i] = coupled;
            }
        }
        int[] order = FillOrder.minimumDegree(FillOrder.pattern(matrix(adj), k), k);
        assertPermutation(order, k);
        int[] natural = new int[k];
        for (int i = 0; i < k; i++) natural[i] = i;
        long ordered = fill(adj, order), plain = fill(adj, natural);
        // natural: the globals first fill in nearly all k²/2 pairs; ordered: at most the blocks' own pairs
        assertTrue(plain > 5_000, "natural fill " + plain);
        assertTrue(ordered < 1_500, "ordered fill " + ordered);
    }
}
