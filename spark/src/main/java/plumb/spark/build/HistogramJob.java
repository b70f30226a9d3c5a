package plumb.spark.build;

import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.catalyst.InternalRow;
import org.apache.spark.sql.catalyst.expressions.Expression;
import plumb.spark.build.BuildSpec.Outside;
import plumb.spark.build.BuildSpec.Region;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * One pass of Spark over one set of event tables. Spark evaluates the description's expressions,
 * compiled once into one projection: per region how many of its steps an event passes in a row
 * (its depth in the cut flow), each distinct observable as a double, and each weight as a double
 * (weights and observables only where some region needs them). Plain Java then fills the
 * histograms of each partition into primitive arrays ({@link Tally}) and the driver adds up the
 * few small arrays of the partitions. A grouped SQL query over exploded rows (one row per region
 * an event falls in, 82 sums) did the same at ~10× the CPU per event: Spark's aggregation, not the
 * reading, was the cost; now reading the Parquet columns is most of it.
 *
 * <p>The cut flow (weighted with the first weight) and the counts of NaN/null observables and of
 * NaN/infinite/null weights come from the same pass.
 *
 * <p>The histograms filled are "entries": a region with an observable. A region may come back
 * with another observable (an observable-based variation): its selection is evaluated once, and
 * such an entry sums only the first weight.
 *
 * @param regions     the region of each entry
 * @param observables SQL of each entry's observable, same order
 * @param weights     SQL of the weight expressions summed; the first also weights the cut flow
 * @param weightsUsed per entry, how many of the weights (from the first) it sums
 */
record HistogramJob(List<Region> regions, List<String> observables, List<String> weights, int[] weightsUsed) {

    /**
     * {@code -Dplumb.build.rows=true}: every pass through Spark's SQL projection, as before the
     * column batches (to compare the two paths' speed and numbers; read at each pass).
     */
    static boolean rowsOnly() {
        return Boolean.getBoolean("plumb.build.rows");
    }

    /** Every region once with the given observables, summing every weight. */
    HistogramJob(List<Region> regions, List<String> observables, List<String> weights) {
        this(regions, observables, weights, filled(regions.size(), weights.size()));
    }

    private static int[] filled(int n, int value) {
        int[] a = new int[n];
        java.util.Arrays.fill(a, value);
        return a;
    }

    /** This job with more entries: {@code more} binned in {@code observable}, summing the first weight. */
    HistogramJob plus(List<Region> more, String observable) {
        List<Region> r = new ArrayList<>(regions);
        List<String> o = new ArrayList<>(observables);
        int[] used = java.util.Arrays.copyOf(weightsUsed, weightsUsed.length + more.size());
        for (int i = 0; i < more.size(); i++) {
            r.add(more.get(i));
            o.add(observable);
            used[weightsUsed.length + i] = 1;
        }
        return new HistogramJob(r, o, weights, used);
    }

    /** The distinct regions in order of first appearance: one depth column and one cut flow each. */
    List<Region> distinctRegions() {
        List<Region> out = new ArrayList<>();
        for (Region r : regions) if (!out.contains(r)) out.add(r);
        return out;
    }

    /**
     * Per weight expression k: sums[k][cell] of w and squares[k][cell] of w² (zero where an entry
     * does not sum weight k), the raw entries per cell, per entry the selected events with a NaN or
     * null observable, per weight the selected events where it is NaN, infinite or null, and the
     * cut flow of each distinct region.
     */
    record Sums(double[][] sums, double[][] squares, long[] entries, long[] badObservable, long[] badWeights,
                CutFlow.Counts flow) {

        /** The slice of region r of an array indexed by cell. */
        double[] region(double[] byCell, int[] offsets, int r, int bins) {
            double[] out = new double[bins];
            System.arraycopy(byCell, offsets[r], out, 0, bins);
            return out;
        }
    }

    /** First cell of each entry. */
    int[] offsets() {
        int[] o = new int[regions.size() + 1];
        for (int r = 0; r < regions.size(); r++) o[r + 1] = o[r] + regions.get(r).bins();
        return o;
    }

    /**
     * How many steps of region r an event passes before the first it fails (all of them: the
     * event is selected). A step that is null counts as failed; later steps are not evaluated.
     */
    static String depth(Region r) {
        StringBuilder s = new StringBuilder("CASE");
        List<BuildSpec.Step> steps = r.steps();
        for (int k = 0; k < steps.size(); k++) {
            s.append(" WHEN NOT coalesce((").append(steps.get(k).keep().sql()).append("), false) THEN ").append(k);
        }
        return s.append(" ELSE ").append(steps.size()).append(" END").toString();
    }

    /** How the partitions' loop reads the projection's rows; fills {@code distinct} with the distinct observables. */
    Tally.Layout layout(Map<String, Integer> distinct) {
        List<Region> depths = distinctRegions();
        int n = regions.size();
        int[] steps = new int[depths.size()], depthOf = new int[n], observableOf = new int[n];
        for (int d = 0; d < depths.size(); d++) steps[d] = depths.get(d).steps().size();
        double[][] edges = new double[n][];
        boolean[] fold = new boolean[n];
        for (int r = 0; r < n; r++) {
            depthOf[r] = depths.indexOf(regions.get(r));
            edges[r] = regions.get(r).edges().clone();
            fold[r] = regions.get(r).outside() == Outside.FOLD;
            observableOf[r] = distinct.computeIfAbsent(observables.get(r), k -> distinct.size());
        }
        return new Tally.Layout(steps, depthOf, edges, fold, observableOf, weightsUsed.clone(), offsets(), distinct.size(),
                weights.size());
    }

    /** The projection's SQL over {@code table}: depth per distinct region, then the observables, then the weights. */
    String sql(String table, Tally.Layout layout, Map<String, Integer> distinct) {
        List<Region> depths = distinctRegions();
        List<String> inner = new ArrayList<>(List.of("*"));
        for (int d = 0; d < depths.size(); d++) inner.add(depth(depths.get(d)) + " AS __plumb_d" + d);
        List<String> outer = new ArrayList<>();
        List<String> selected = new ArrayList<>(), passedOne = new ArrayList<>();
        for (int d = 0; d < depths.size(); d++) {
            outer.add("__plumb_d" + d);
            selected.add("__plumb_d" + d + " = " + layout.steps()[d]);
            passedOne.add("__plumb_d" + d + " >= 1");
        }
        for (Map.Entry<String, Integer> o : distinct.entrySet()) {
            List<String> users = new ArrayList<>();
            for (int r = 0; r < regions.size(); r++) {
                String sel = selected.get(layout.depthOf()[r]);
                if (layout.observableOf()[r] == o.getValue() && !users.contains(sel)) users.add(sel);
            }
            outer.add(onlyWhen(users, o.getKey()) + " AS __plumb_x" + o.getValue());
        }
        for (int k = 0; k < weights.size(); k++) {
            // the first weight also weights the cut flow: needed from the first step on
            outer.add(onlyWhen(k == 0 ? passedOne : selected, weights.get(k)) + " AS __plumb_w" + k);
        }
        return "SELECT " + String.join(", ", outer) + " FROM (SELECT " + String.join(", ", inner) + " FROM " + table + ")";
    }

    /** The expression as a double where one of the conditions holds, null elsewhere (and not evaluated there). */
    private static String onlyWhen(List<String> conditions, String expr) {
        return "CASE WHEN " + String.join(" OR ", conditions) + " THEN CAST((" + expr + ") AS DOUBLE) END";
    }

    /**
     * Runs the pass over {@code table} (a temporary view name). With {@code parquetFiles} (the
     * view's files, when they are Parquet) the expressions are first tried over column batches
     * ({@link ParquetPass}); the rows of Spark's SQL projection are the way for CSV and for
     * whatever the batches do not evaluate.
     */
    Sums run(SparkSession spark, String table, List<String> parquetFiles) {
        return run(spark, table, parquetFiles, null);
    }

    /** As above; {@code analysed}: trees of the expressions already resolved over the table, by SQL (may be null). */
    Sums run(SparkSession spark, String table, List<String> parquetFiles, Map<String, Expression> analysed) {
        return runAll(spark, List.of(new Pass(this, table, parquetFiles, analysed))).get(0);
    }

    /**
     * One pass of a build: the job, its table (a temporary view), the view's Parquet files (null
     * when they are not Parquet) and the trees of its expressions already analysed (may be null).
     */
    record Pass(HistogramJob job, String table, List<String> parquetFiles, Map<String, Expression> analysed) {
    }

    /**
     * Runs passes together: those over Parquet whose expressions compile to column batches in one
     * Spark job ({@link ParquetPass#runAll}), then, one by one in order, the others through the
     * row path. The sums of each pass, in the order given.
     */
    static List<Sums> runAll(SparkSession spark, List<Pass> passes) {
        List<Sums> out = new ArrayList<>();
        List<Map<String, Integer>> distinct = new ArrayList<>();
        List<Tally.Layout> layouts = new ArrayList<>();
        List<ParquetPass.Input> batched = new ArrayList<>();
        List<Integer> batchedPass = new ArrayList<>();
        for (int i = 0; i < passes.size(); i++) {
            Pass p = passes.get(i);
            Map<String, Integer> d = new LinkedHashMap<>();
            Tally.Layout layout = p.job().layout(d);
            distinct.add(d);
            layouts.add(layout);
            out.add(null);
            if (p.parquetFiles() == null || rowsOnly()) continue;
            ParquetPass.Program program = ParquetPass.compile(spark, p.table(), p.job(), d, p.analysed());
            if (program == null) continue;
            batched.add(new ParquetPass.Input(p.parquetFiles(), program, layout));
            batchedPass.add(i);
        }
        if (!batched.isEmpty()) {
            List<Sums> direct = ParquetPass.runAll(spark, batched);
            for (int k = 0; k < direct.size(); k++) out.set(batchedPass.get(k), direct.get(k));
        }
        for (int i = 0; i < passes.size(); i++) {
            if (out.get(i) == null) {
                Pass p = passes.get(i);
                out.set(i, p.job().rows(spark, p.table(), layouts.get(i), distinct.get(i)));
            }
        }
        return out;
    }

    /** The pass through Spark's SQL projection, row by row. */
    private Sums rows(SparkSession spark, String table, Tally.Layout layout, Map<String, Integer> distinct) {
        Dataset<Row> projected = spark.sql(sql(table, layout, distinct));
        // Spark's internal rows straight from the compiled projection: no conversion into Row objects per event.
        JavaRDD<InternalRow> rows = ((org.apache.spark.sql.classic.Dataset<Row>) projected).queryExecution().toRdd().toJavaRDD();
        List<Tally> parts = rows.mapPartitions((Iterator<InternalRow> it) -> {
            Tally t = new Tally(layout);
            while (it.hasNext()) t.add(it.next());
            return List.of(t).iterator();
        }).collect();
        Tally total = new Tally(layout);
        for (Tally t : parts) total.merge(t);   // in partition order: the same sums on every run
        return total.sums();
    }
}
