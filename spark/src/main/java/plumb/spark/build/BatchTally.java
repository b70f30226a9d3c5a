package plumb.spark.build;

import org.apache.spark.sql.vectorized.ColumnVector;
import org.apache.spark.sql.vectorized.ColumnarBatch;

import java.util.ArrayList;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;

/**
 * The work of one {@link ParquetPass} task per column batch: evaluates the program's nodes over
 * a batch and adds its events to a {@link Tally}. All arrays are made once per task.
 *
 * <p>The steps are evaluated over every event of the batch; the weights and observables only
 * over the events that need them, gathered into the first rows of the nodes' arrays: the first
 * weight over the events that pass some region's first step (it weights the cut flow), every
 * weight and observable over the events some region selects (in the benchmark of the build about
 * a fifth of them). So a weight is evaluated where Spark's row path evaluates it, and a value it
 * would refuse elsewhere does not send the table to the row path.
 */
final class BatchTally {

    private final ParquetPass.Program program;
    private final Tally tally;
    private final BatchExpr.Batch batch = new BatchExpr.Batch();
    private final int[] steps;
    /** The columns (indices into the program's and the batch's columns) each stage reads. */
    private final int[] stepColumns, firstWeightColumns, filledColumns;
    private final int[][] depth;
    /** The batch rows of the events that pass a first step, and of those a region selects. */
    private final int[] passed, selected;
    private final boolean[] passes, chosen;
    private final double[][] x, w, xBuffer, wBuffer;

    BatchTally(ParquetPass.Program program, Tally tally, int capacity) {
        this.program = program;
        this.tally = tally;
        BatchExpr.Column[] columns = program.columns();
        for (BatchExpr c : columns) c.allocate(capacity);
        List<BatchExpr> stepRoots = new ArrayList<>(), filled = new ArrayList<>();
        for (BatchExpr[] s : program.steps()) stepRoots.addAll(List.of(s));
        filled.addAll(List.of(program.observables()));
        filled.addAll(List.of(program.weights()));
        for (BatchExpr r : stepRoots) r.allocate(capacity);
        for (BatchExpr r : filled) r.allocate(capacity);
        stepColumns = columnsOf(columns, stepRoots);
        firstWeightColumns = columnsOf(columns, List.of(program.weights()[0]));
        filledColumns = columnsOf(columns, filled);
        steps = new int[program.steps().length];
        for (int r = 0; r < steps.length; r++) steps[r] = program.steps()[r].length;
        depth = new int[steps.length][capacity];
        passed = new int[capacity];
        selected = new int[capacity];
        passes = new boolean[capacity];
        chosen = new boolean[capacity];
        int no = program.observables().length, nw = program.weights().length;
        x = new double[no][];
        w = new double[nw][];
        xBuffer = new double[no][capacity];
        wBuffer = new double[nw][capacity];
    }

    /** The indices of the columns the roots read, in the order of {@code columns}. */
    static int[] columnsOf(BatchExpr.Column[] columns, List<BatchExpr> roots) {
        Map<BatchExpr, Boolean> seen = new IdentityHashMap<>();
        List<BatchExpr> open = new ArrayList<>(roots);
        while (!open.isEmpty()) {
            BatchExpr e = open.remove(open.size() - 1);
            if (seen.put(e, Boolean.TRUE) == null) open.addAll(List.of(e.children()));
        }
        List<Integer> out = new ArrayList<>();
        for (int j = 0; j < columns.length; j++) if (seen.containsKey(columns[j])) out.add(j);
        return out.stream().mapToInt(Integer::intValue).toArray();
    }

    /** Adds the batch's events; the reason when a node refused the batch (the tally is then void), else null. */
    String add(ColumnarBatch read) {
        int n = read.numRows();
        load(read, stepColumns, null, n);
        batch.next(n);
        for (BatchExpr[] s : program.steps()) for (BatchExpr e : s) e.eval(batch);
        if (batch.refused != null) return batch.refused;
        for (int r = 0; r < depth.length; r++) depth(program.steps()[r], depth[r], n);
        java.util.Arrays.fill(passes, 0, n, false);
        java.util.Arrays.fill(chosen, 0, n, false);
        for (int r = 0; r < steps.length; r++) {
            int[] dr = depth[r];
            int all = steps[r];
            for (int i = 0; i < n; i++) {
                passes[i] |= dr[i] > 0;
                chosen[i] |= dr[i] == all;
            }
        }
        int a = 0, b = 0;
        for (int i = 0; i < n; i++) {
            passed[a] = i;
            a += passes[i] ? 1 : 0;
            selected[b] = i;
            b += chosen[i] ? 1 : 0;
        }
        if (a > b) {   // events in the cut flow that no region selects: the first weight alone for them
            int[] rows = a == n ? null : passed;
            BatchExpr first = program.weights()[0];
            load(read, firstWeightColumns, rows, a);
            batch.next(a);
            first.eval(batch);
            if (batch.refused != null) return batch.refused;
            tally.flow(a, rows, depth, doubles(first, wBuffer[0], a));
        }
        if (b == 0) return null;
        int[] rows = b == n ? null : selected;
        load(read, filledColumns, rows, b);
        batch.next(b);
        for (BatchExpr e : program.observables()) e.eval(batch);
        for (BatchExpr e : program.weights()) e.eval(batch);
        if (batch.refused != null) return batch.refused;
        for (int o = 0; o < x.length; o++) x[o] = doubles(program.observables()[o], xBuffer[o], b);
        for (int k = 0; k < w.length; k++) w[k] = doubles(program.weights()[k], wBuffer[k], b);
        if (a == b) tally.flow(b, rows, depth, w[0]);
        tally.fill(b, rows, depth, x, w);
        return null;
    }

    /**
     * A number node's first n values as doubles with NaN where null: its own array when it holds
     * doubles without nulls, else {@code buffer} filled.
     */
    private static double[] doubles(BatchExpr e, double[] buffer, int n) {
        if (e.kind == BatchExpr.Kind.DOUBLE && !e.anyNull) return e.d;
        for (int i = 0; i < n; i++) buffer[i] = e.asDouble(i);
        return buffer;
    }

    /** How many steps each event passes in a row (a null step fails, as in the row path). */
    private static void depth(BatchExpr[] steps, int[] out, int n) {
        java.util.Arrays.fill(out, 0, n, 0);
        for (int k = 0; k < steps.length; k++) {   // without branches on the events: one more where all before passed
            boolean[] t = steps[k].b;
            if (steps[k].anyNull) {
                boolean[] nul = steps[k].nul;
                for (int i = 0; i < n; i++) out[i] += out[i] == k & t[i] & !nul[i] ? 1 : 0;
            } else {
                for (int i = 0; i < n; i++) out[i] += out[i] == k & t[i] ? 1 : 0;
            }
        }
    }

    /** Copies the columns' values at {@code rows} (null: the first m rows) into the first m places of their nodes. */
    private void load(ColumnarBatch read, int[] which, int[] rows, int m) {
        BatchExpr.Column[] columns = program.columns();
        for (int j : which) load(read.column(j), columns[j], rows, m);
    }

    /** One column's values at {@code rows} (null: the first m) into its node's arrays, zero where null. */
    private static void load(ColumnVector v, BatchExpr.Column c, int[] rows, int m) {
        switch (c.kind) {
            case DOUBLE -> {
                double[] d = c.d;
                if (rows == null) for (int j = 0; j < m; j++) d[j] = v.getDouble(j);
                else for (int j = 0; j < m; j++) d[j] = v.getDouble(rows[j]);
            }
            case LONG -> {
                long[] l = c.l;
                if (c.bits == 32) {
                    if (rows == null) for (int j = 0; j < m; j++) l[j] = v.getInt(j);
                    else for (int j = 0; j < m; j++) l[j] = v.getInt(rows[j]);
                } else {
                    if (rows == null) for (int j = 0; j < m; j++) l[j] = v.getLong(j);
                    else for (int j = 0; j < m; j++) l[j] = v.getLong(rows[j]);
                }
            }
            case BOOL -> {
                boolean[] bv = c.b;
                if (rows == null) for (int j = 0; j < m; j++) bv[j] = v.getBoolean(j);
                else for (int j = 0; j < m; j++) bv[j] = v.getBoolean(rows[j]);
            }
        }
        c.anyNull = false;
        if (!v.hasNull()) return;
        boolean any = false;
        for (int j = 0; j < m; j++) {
            boolean isNull = v.isNullAt(rows == null ? j : rows[j]);
            c.nul[j] = isNull;
            if (!isNull) continue;
            any = true;
            switch (c.kind) {
                case DOUBLE -> c.d[j] = 0;
                case LONG -> c.l[j] = 0;
                case BOOL -> c.b[j] = false;
            }
        }
        c.anyNull = any;
    }
}
