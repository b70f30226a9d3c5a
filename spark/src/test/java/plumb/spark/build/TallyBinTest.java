package plumb.spark.build;

import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@link Tally#bin}'s guess from equally spaced edges against a plain scan of the edges (the
 * convention of docs/build-format.md: bin b holds edges[b] ≤ x < edges[b+1], the low edge
 * included; outside the edges dropped or folded): the same bin on every edge, one ulp below and
 * above each edge, ±0, ±∞, the largest doubles, and random values, for even and uneven edges.
 */
class TallyBinTest {

    /** The bin by a scan from the first edge: the largest b with edges[b] ≤ x, outside as the format says. */
    static int byScan(double x, double[] edges, boolean fold) {
        int n = edges.length - 1;
        if (x < edges[0]) return fold ? 0 : -1;
        if (x >= edges[n]) return fold ? n - 1 : -1;
        int b = 0;
        while (b + 1 < n && edges[b + 1] <= x) b++;
        return b;
    }

    static List<double[]> edgeSets() {
        List<double[]> sets = new ArrayList<>();
        double[] even = new double[21];   // the benchmark's: 0, 50, …, 1000
        for (int b = 0; b <= 20; b++) even[b] = b * 1000 / 20;
        sets.add(even);
        double[] tenths = new double[11];   // b × 0.1: not exactly equally spaced in binary
        for (int b = 0; b <= 10; b++) tenths[b] = b * 0.1;
        sets.add(tenths);
        double[] sums = new double[11];     // 0.1 added up: other rounding of the same edges
        for (int b = 1; b <= 10; b++) sums[b] = sums[b - 1] + 0.1;
        sets.add(sums);
        double[] log = new double[16];      // uneven: the guess is often far off
        for (int b = 0; b < log.length; b++) log[b] = Math.pow(10, b * 0.4 - 2);
        sets.add(log);
        sets.add(new double[] {-5, -0.0, 3});          // a −0 edge
        sets.add(new double[] {0, 1});                 // one bin
        sets.add(new double[] {-1e308, 0, 1e308});     // hi − lo overflows to ∞
        sets.add(new double[] {-Double.MAX_VALUE, Double.MAX_VALUE});
        sets.add(new double[] {1, 1 + Math.ulp(1.0), 1 + 2 * Math.ulp(1.0), 2});   // bins one ulp wide
        sets.add(new double[] {100, 101, 102, 1e6});   // one wide bin at the end
        sets.add(new double[] {-1000, -999, 0, 999, 1000});
        return sets;
    }

    @Test
    void binEqualsTheScanOnEdgesNeighboursZerosAndRandomValues() {
        SplittableRandom rng = new SplittableRandom(7);
        int checked = 0;
        for (double[] edges : edgeSets()) {
            List<Double> xs = new ArrayList<>(List.of(0.0, -0.0, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY,
                    Double.MAX_VALUE, -Double.MAX_VALUE, Double.MIN_VALUE, -Double.MIN_VALUE));
            for (double e : edges) {
                xs.add(e);
                xs.add(Math.nextDown(e));
                xs.add(Math.nextUp(e));
                xs.add(Math.nextDown(Math.nextDown(e)));
                xs.add(Math.nextUp(Math.nextUp(e)));
            }
            double lo = edges[0], hi = edges[edges.length - 1];
            for (int i = 0; i < 20_000; i++) {
                double u = rng.nextDouble();
                xs.add(Double.isFinite(hi - lo) ? lo + (hi - lo) * (1.2 * u - 0.1) : lo * (1 - u) + hi * u);
            }
            for (int b = 0; b + 1 < edges.length; b++) {   // the middle of each bin
                xs.add(edges[b] / 2 + edges[b + 1] / 2);
            }
            for (double x : xs) {
                for (boolean fold : new boolean[] {false, true}) {
                    assertEquals(byScan(x, edges, fold), Tally.bin(x, edges, fold),
                            "x = " + x + " (bits " + Long.toHexString(Double.doubleToRawLongBits(x)) + "), edges "
                                    + java.util.Arrays.toString(edges) + ", fold " + fold);
                    checked++;
                }
            }
        }
        assertTrue(checked > 400_000, "values checked: " + checked);
    }

    @Test
    void lowEdgeIncludedHighEdgeNotAndZeroSignsAlike() {
        double[] edges = {0, 50, 100};
        assertEquals(0, Tally.bin(0.0, edges, false));
        assertEquals(0, Tally.bin(-0.0, edges, false), "−0 is the low edge itself (−0 = 0)");
        assertEquals(-1, Tally.bin(Math.nextDown(0.0), edges, false));
        assertEquals(1, Tally.bin(50, edges, false), "an inner edge belongs to the bin above it");
        assertEquals(0, Tally.bin(Math.nextDown(50.0), edges, false));
        assertEquals(-1, Tally.bin(100, edges, false), "the high edge is outside");
        assertEquals(1, Tally.bin(100, edges, true), "folded into the last bin");
        assertEquals(1, Tally.bin(Double.POSITIVE_INFINITY, edges, true));
        assertEquals(0, Tally.bin(Double.NEGATIVE_INFINITY, edges, true));
        double[] negative = {-3, -0.0, 3};
        assertEquals(1, Tally.bin(0.0, negative, false), "+0 on a −0 edge: the bin above it");
        assertEquals(0, Tally.bin(Math.nextDown(-0.0), negative, false));
    }

    @Test
    void nanStillGoesWhereTheBinarySearchPutIt() {
        // NaN never reaches bin (the tally counts it as a bad observable first); the search's answer
        // for it (every "x < edge" false: the last bin) stays the same all the same
        for (double[] edges : edgeSets()) {
            assertEquals(edges.length - 2, Tally.bin(Double.NaN, edges, false));
        }
    }
}
