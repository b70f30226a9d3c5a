package plumb.spark.build;

import org.apache.spark.sql.catalyst.InternalRow;

import java.io.Serializable;

/**
 * The histograms and cut flow of one partition of events, in primitive arrays, filled row by row
 * from the projection of {@link HistogramJob} and added up across partitions on the driver.
 * Sums are kept cell-major ({@code [cell * weights + k]}) so that one event's weights land next
 * to each other.
 */
final class Tally implements Serializable {

    private static final long serialVersionUID = 1L;

    /**
     * What the loop needs to know, shipped to the tasks. Row columns: the depth of each distinct
     * region, then each distinct observable, then each weight. An entry is a region binned in one
     * observable.
     *
     * @param steps        steps per distinct region (depth == steps: selected)
     * @param depthOf      per entry: its region's depth column
     * @param edges        bin edges per entry
     * @param fold         per entry: outside values go to the end bins (else dropped)
     * @param observableOf per entry: which distinct observable column it bins
     * @param weightsUsed  per entry: how many weights (from the first) it sums
     * @param offsets      first cell of each entry, and the number of cells last
     * @param observables  number of distinct observable columns
     * @param weights      number of weight columns
     */
    record Layout(int[] steps, int[] depthOf, double[][] edges, boolean[] fold, int[] observableOf, int[] weightsUsed,
                  int[] offsets, int observables, int weights) implements Serializable {
    }

    private final Layout layout;
    private final double[] sum, square;     // [cell * weights + k]
    private final long[] entries;           // [cell]
    private final long[] badObservable;     // [entry]
    private final long[] badWeight;         // [k]
    private final double[][] stepWeighted;  // [distinct region][step], cumulative
    private final long[][] stepRaw;
    private transient double[] w;           // one event's weights
    private transient int[] gathered;       // one region's depths of the events of a batch
    /** The exponent bits of a double: all set for ±∞ and NaN. */
    private static final long EXPONENT = 0x7ff0000000000000L;
    /** Set when the batch evaluation refused a table (see {@link BatchExpr}): these numbers are then not used. */
    String refused;

    Tally(Layout layout) {
        this.layout = layout;
        int regions = layout.steps().length, n = layout.depthOf().length, cells = layout.offsets()[n];
        sum = new double[cells * layout.weights()];
        square = new double[sum.length];
        entries = new long[cells];
        badObservable = new long[n];
        badWeight = new long[layout.weights()];
        stepWeighted = new double[regions][];
        stepRaw = new long[regions][];
        for (int r = 0; r < regions; r++) {
            stepWeighted[r] = new double[layout.steps()[r]];
            stepRaw[r] = new long[layout.steps()[r]];
        }
    }

    /** A double column; null (an expression that gave none) is NaN so that it cannot vanish unseen. */
    private static double value(InternalRow row, int column) {
        return row.isNullAt(column) ? Double.NaN : row.getDouble(column);
    }

    void add(InternalRow row) {
        int regions = layout.steps().length;
        int firstWeight = regions + layout.observables();
        boolean selected = false;
        double w0 = 0;
        boolean w0Read = false;
        for (int r = 0; r < regions; r++) {
            int depth = row.getInt(r);
            if (depth == 0) continue;
            if (!w0Read) {
                w0 = value(row, firstWeight);
                w0Read = true;
            }
            double[] weighted = stepWeighted[r];
            long[] raw = stepRaw[r];
            for (int k = 0; k < depth; k++) {
                weighted[k] += w0;
                raw[k]++;
            }
            selected |= depth == layout.steps()[r];
        }
        if (!selected) return;
        int nw = layout.weights();
        if (w == null) w = new double[nw];
        for (int k = 0; k < nw; k++) {
            double v = k == 0 ? w0 : value(row, firstWeight + k);
            if (!Double.isFinite(v)) badWeight[k]++;
            w[k] = v;
        }
        int[] depthOf = layout.depthOf();
        for (int e = 0; e < depthOf.length; e++) {
            int r = depthOf[e];
            if (row.getInt(r) != layout.steps()[r]) continue;
            double x = value(row, regions + layout.observableOf()[e]);
            if (Double.isNaN(x)) {
                badObservable[e]++;
                continue;
            }
            int b = bin(x, layout.edges()[e], layout.fold()[e]);
            if (b < 0) continue;
            int cell = layout.offsets()[e] + b;
            entries[cell]++;
            int base = cell * nw;
            for (int k = 0, used = layout.weightsUsed()[e]; k < used; k++) {
                double v = w[k];
                sum[base + k] += v;
                square[base + k] += v * v;
            }
        }
    }

    /**
     * The cut flow of some events of a batch evaluated by {@link ParquetPass}: each event that
     * passes the first step of some region. With {@link #fill} the same additions in the same
     * order as {@link #add(InternalRow)} (each sum grows event by event in the order of the
     * events), so a partition's sums do not depend on the path.
     *
     * @param m     the number of events
     * @param rows  event j's row in the batch (null: row j)
     * @param depth per distinct region, per row of the batch: the steps passed in a row
     * @param w0    the first weight of event j (NaN where null)
     */
    // Without branches on the events: where an event did not pass a step, +0.0 is added, which
    // leaves the sum as it was (a sum that starts at +0.0 never becomes −0.0, the one value that
    // +0.0 would change), so the sums are those of the row path bit for bit.
    void flow(int m, int[] rows, int[][] depth, double[] w0) {
        if (rows != null && (gathered == null || gathered.length < m)) gathered = new int[Math.max(m, 4096)];
        for (int r = 0; r < depth.length; r++) {
            int[] dr = depth[r];
            if (rows != null) {
                for (int j = 0; j < m; j++) gathered[j] = dr[rows[j]];
                dr = gathered;
            }
            double[] weighted = stepWeighted[r];
            long[] raw = stepRaw[r];
            int k = 0;
            for (; k + 1 < weighted.length; k += 2) {   // two steps at a time: two sums in flight
                double s0 = weighted[k], s1 = weighted[k + 1];
                long n0 = 0, n1 = 0;
                for (int j = 0; j < m; j++) {
                    int d = dr[j];
                    long bits = Double.doubleToRawLongBits(w0[j]);
                    int past0 = (k - d) >> 31, past1 = (k + 1 - d) >> 31;   // −1 where the event passed the step, else 0
                    s0 += Double.longBitsToDouble(bits & past0);
                    s1 += Double.longBitsToDouble(bits & past1);
                    n0 -= past0;
                    n1 -= past1;
                }
                weighted[k] = s0;
                weighted[k + 1] = s1;
                raw[k] += n0;
                raw[k + 1] += n1;
            }
            for (; k < weighted.length; k++) {
                double s0 = weighted[k];
                long n0 = 0;
                for (int j = 0; j < m; j++) {
                    int past0 = (k - dr[j]) >> 31;
                    s0 += Double.longBitsToDouble(Double.doubleToRawLongBits(w0[j]) & past0);
                    n0 -= past0;
                }
                weighted[k] = s0;
                raw[k] += n0;
            }
        }
    }

    /**
     * The histograms of some events of a batch evaluated by {@link ParquetPass}: each event
     * selected by some region (see {@link #flow}).
     *
     * @param m           the number of events
     * @param rows        event j's row in the batch (null: row j)
     * @param depth       per distinct region, per row of the batch: the steps passed in a row
     * @param observables the distinct observables of event j (NaN where null)
     * @param weights     the weights of event j (NaN where null)
     */
    void fill(int m, int[] rows, int[][] depth, double[][] observables, double[][] weights) {
        int nw = layout.weights();
        int[] steps = layout.steps(), depthOf = layout.depthOf(), observableOf = layout.observableOf();
        int[] offsets = layout.offsets(), weightsUsed = layout.weightsUsed();
        double[][] edges = layout.edges();
        boolean[] fold = layout.fold();
        for (int k = 0; k < nw; k++) {
            double[] wk = weights[k];
            long bad = 0;
            for (int j = 0; j < m; j++) bad += (Double.doubleToRawLongBits(wk[j]) & EXPONENT) == EXPONENT ? 1 : 0;
            badWeight[k] += bad;
        }
        for (int j = 0; j < m; j++) {
            int i = rows == null ? j : rows[j];
            for (int e = 0; e < depthOf.length; e++) {
                int r = depthOf[e];
                if (depth[r][i] != steps[r]) continue;
                double x = observables[observableOf[e]][j];
                if (Double.isNaN(x)) {
                    badObservable[e]++;
                    continue;
                }
                int b = bin(x, edges[e], fold[e]);
                if (b < 0) continue;
                int cell = offsets[e] + b;
                entries[cell]++;
                int base = cell * nw;
                for (int k = 0, used = weightsUsed[e]; k < used; k++) {
                    double v = weights[k][j];
                    sum[base + k] += v;
                    square[base + k] += v * v;
                }
            }
        }
    }

    /**
     * The bin of x (not NaN) per docs/build-format.md: bin b holds edges[b] ≤ x < edges[b+1];
     * outside the edges −1 (dropped) or the end bin (folded). The bin is first guessed as if the
     * edges were equally spaced, then confirmed by the very comparisons a binary search makes
     * (edges[b] ≤ x < edges[b+1], which only one b meets), so the answer is the binary search's
     * for any edges; where neither the guess nor a neighbour holds x (uneven edges), the binary
     * search decides.
     */
    static int bin(double x, double[] edges, boolean fold) {
        int n = edges.length - 1;
        double lo = edges[0], hi = edges[n];
        if (x < lo) return fold ? 0 : -1;
        if (x >= hi) return fold ? n - 1 : -1;
        // lo <= x < hi: the guess lies in [0, n] (rounding may give n, an overflow of hi - lo NaN → 0)
        int g = Math.min((int) ((x - lo) / (hi - lo) * n), n - 1);
        if (x < edges[g]) {
            if (g > 0 && x >= edges[g - 1]) return g - 1;
        } else if (x < edges[g + 1]) {
            return g;
        } else if (g + 2 <= n && x < edges[g + 2]) {
            return g + 1;
        }
        return search(x, edges);
    }

    /** The binary search of {@link #bin}, for edges[0] ≤ x < edges[n]. */
    static int search(double x, double[] edges) {
        int lo = 0, hi = edges.length - 1;   // edges[lo] <= x < edges[hi]
        while (hi - lo > 1) {
            int mid = (lo + hi) >>> 1;
            if (x < edges[mid]) hi = mid;
            else lo = mid;
        }
        return lo;
    }

    /** Adds another partition's numbers to these. */
    void merge(Tally o) {
        for (int i = 0; i < sum.length; i++) {
            sum[i] += o.sum[i];
            square[i] += o.square[i];
        }
        for (int i = 0; i < entries.length; i++) entries[i] += o.entries[i];
        for (int i = 0; i < badObservable.length; i++) badObservable[i] += o.badObservable[i];
        for (int i = 0; i < badWeight.length; i++) badWeight[i] += o.badWeight[i];
        for (int r = 0; r < stepRaw.length; r++) {
            for (int k = 0; k < stepRaw[r].length; k++) {
                stepWeighted[r][k] += o.stepWeighted[r][k];
                stepRaw[r][k] += o.stepRaw[r][k];
            }
        }
    }

    /** The numbers in the shape the assembly reads: by weight, then cell. */
    HistogramJob.Sums sums() {
        int nw = layout.weights(), cells = entries.length;
        double[][] sums = new double[nw][cells], squares = new double[nw][cells];
        for (int c = 0; c < cells; c++) {
            for (int k = 0; k < nw; k++) {
                sums[k][c] = sum[c * nw + k];
                squares[k][c] = square[c * nw + k];
            }
        }
        double[][] weighted = new double[stepWeighted.length][];
        long[][] raw = new long[stepRaw.length][];
        for (int r = 0; r < raw.length; r++) {
            weighted[r] = stepWeighted[r].clone();
            raw[r] = stepRaw[r].clone();
        }
        return new HistogramJob.Sums(sums, squares, entries.clone(), badObservable.clone(), badWeight.clone(),
                new CutFlow.Counts(weighted, raw));
    }
}
