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
     * The events of one batch evaluated by {@link ParquetPass}, in the same order of operations
     * as {@link #add(InternalRow)} so that a partition's sums do not depend on the path.
     *
     * @param depth       per distinct region, per event: the steps passed in a row
     * @param observables the distinct observables per event (NaN where null)
     * @param weights     the weights per event (NaN where null)
     */
    void add(int n, int[][] depth, double[][] observables, double[][] weights) {
        int regions = layout.steps().length, nw = layout.weights();
        int[] steps = layout.steps(), depthOf = layout.depthOf(), observableOf = layout.observableOf();
        int[] offsets = layout.offsets(), weightsUsed = layout.weightsUsed();
        double[][] edges = layout.edges();
        boolean[] fold = layout.fold();
        if (w == null) w = new double[nw];
        for (int i = 0; i < n; i++) {
            boolean selected = false, any = false;
            for (int r = 0; r < regions; r++) {
                int d = depth[r][i];
                if (d == 0) continue;
                any = true;
                selected |= d == steps[r];
            }
            if (!any) continue;
            double w0 = weights[0][i];
            for (int r = 0; r < regions; r++) {
                int d = depth[r][i];
                double[] weighted = stepWeighted[r];
                long[] raw = stepRaw[r];
                for (int k = 0; k < d; k++) {
                    weighted[k] += w0;
                    raw[k]++;
                }
            }
            if (!selected) continue;
            for (int k = 0; k < nw; k++) {
                double v = weights[k][i];
                if (!Double.isFinite(v)) badWeight[k]++;
                w[k] = v;
            }
            for (int e = 0; e < depthOf.length; e++) {
                int r = depthOf[e];
                if (depth[r][i] != steps[r]) continue;
                double x = observables[observableOf[e]][i];
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
                    double v = w[k];
                    sum[base + k] += v;
                    square[base + k] += v * v;
                }
            }
        }
    }

    /**
     * The bin of x (not NaN) per docs/build-format.md: bin b holds edges[b] ≤ x < edges[b+1];
     * outside the edges −1 (dropped) or the end bin (folded).
     */
    static int bin(double x, double[] edges, boolean fold) {
        int n = edges.length - 1;
        if (x < edges[0]) return fold ? 0 : -1;
        if (x >= edges[n]) return fold ? n - 1 : -1;
        int lo = 0, hi = n;   // edges[lo] <= x < edges[hi]
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
