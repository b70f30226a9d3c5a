package plumb.spark.build;

import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import plumb.spark.build.BuildSpec.Outside;
import plumb.spark.build.BuildSpec.Region;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * One pass of Spark over one set of event tables: for every region it applies the selection, bins
 * the observable and sums, per bin, each of several weight expressions and their squares. Each
 * event becomes one row per region that keeps it (explode of its "cells", a cell being region
 * offset + bin), and one GROUP BY cell does all sums at once, so a weight variation costs two sums
 * per event and nothing more. An observable that is NaN or null lands in cell −1 − r (counted per
 * region r, refused by the caller); a weight that is NaN, infinite or null turns its sums NaN (found by the caller).
 *
 * @param regions     the regions filled, with the observable expression of each (an observable
 *                    variation passes its own)
 * @param observables SQL of each region's observable, same order
 * @param weights     SQL of the weight expressions summed
 */
record HistogramJob(List<Region> regions, List<String> observables, List<String> weights) {

    /** Per weight expression k: sums[k][cell] of w and squares[k][cell] of w², plus the raw entries per cell. */
    record Sums(double[][] sums, double[][] squares, long[] entries, long[] badObservable) {

        /** The slice of region r of an array indexed by cell. */
        double[] region(double[] byCell, int[] offsets, int r, int bins) {
            double[] out = new double[bins];
            System.arraycopy(byCell, offsets[r], out, 0, bins);
            return out;
        }
    }

    /** First cell of each region. */
    int[] offsets() {
        int[] o = new int[regions.size() + 1];
        for (int r = 0; r < regions.size(); r++) o[r + 1] = o[r] + regions.get(r).bins();
        return o;
    }

    /** The whole selection of a region as one boolean expression (null counts as false). */
    static String selection(Region r) {
        StringBuilder s = new StringBuilder();
        for (BuildSpec.Step st : r.steps()) {
            if (s.length() > 0) s.append(" AND ");
            s.append("coalesce((").append(st.keep().sql()).append("), false)");
        }
        return s.toString();
    }

    /**
     * The bin of x (not NaN) per the convention of docs/build-format.md: the low edge is included;
     * outside the edges null (dropped) or the end bin (folded).
     */
    static String bin(String x, Region r) {
        double[] e = r.edges();
        int n = r.bins();
        boolean fold = r.outside() == Outside.FOLD;
        StringBuilder s = new StringBuilder("CASE");
        s.append(" WHEN ").append(x).append(" < ").append(lit(e[0])).append(" THEN ").append(fold ? "0" : "NULL");
        s.append(" WHEN ").append(x).append(" >= ").append(lit(e[n])).append(" THEN ").append(fold ? String.valueOf(n - 1) : "NULL");
        for (int b = 1; b < n; b++) s.append(" WHEN ").append(x).append(" < ").append(lit(e[b])).append(" THEN ").append(b - 1);
        return s.append(" ELSE ").append(n - 1).append(" END").toString();
    }

    /** A double literal that Spark reads back exactly (17 significant digits, D suffix). */
    static String lit(double v) {
        return String.format(Locale.ROOT, "%.17eD", v);
    }

    /** The weight as a double, null made NaN so that it cannot vanish from a sum unseen. */
    static String weight(String w) {
        return "coalesce(CAST((" + w + ") AS DOUBLE), double('NaN'))";
    }

    /** Runs the pass over {@code table} (a temporary view name). */
    Sums run(SparkSession spark, String table) {
        int[] offsets = offsets();
        List<String> inner = new ArrayList<>();
        inner.add("*");
        for (int r = 0; r < regions.size(); r++) inner.add("CAST((" + observables.get(r) + ") AS DOUBLE) AS __plumb_x" + r);
        StringBuilder cells = new StringBuilder("explode(filter(array(");
        for (int r = 0; r < regions.size(); r++) {
            if (r > 0) cells.append(", ");
            String x = "__plumb_x" + r;
            cells.append("CASE WHEN ").append(selection(regions.get(r))).append(" THEN CASE WHEN ").append(x)
                    .append(" IS NULL OR isnan(").append(x).append(") THEN ").append(-1 - r).append(" ELSE ").append(offsets[r]).append(" + (")
                    .append(bin(x, regions.get(r))).append(") END END");
        }
        cells.append("), c -> c IS NOT NULL)) AS cell");
        List<String> middle = new ArrayList<>();
        middle.add(cells.toString());
        for (int k = 0; k < weights.size(); k++) middle.add(weight(weights.get(k)) + " AS __plumb_w" + k);
        StringBuilder sql = new StringBuilder("SELECT cell, count(*) AS n");
        for (int k = 0; k < weights.size(); k++) {
            sql.append(", sum(__plumb_w").append(k).append(") AS s").append(k)
               .append(", sum(__plumb_w").append(k).append(" * __plumb_w").append(k).append(") AS q").append(k);
        }
        sql.append(" FROM (SELECT ").append(String.join(", ", middle)).append(" FROM (SELECT ")
           .append(String.join(", ", inner)).append(" FROM ").append(table).append(")) GROUP BY cell");
        Dataset<Row> result = spark.sql(sql.toString());
        int cellsTotal = offsets[regions.size()];
        double[][] sums = new double[weights.size()][cellsTotal];
        double[][] squares = new double[weights.size()][cellsTotal];
        long[] entries = new long[cellsTotal];
        long[] bad = new long[regions.size()];
        for (Row row : result.collectAsList()) {
            int cell = row.getInt(0);
            long n = row.getLong(1);
            if (cell < 0) {
                bad[-1 - cell] += n;
                continue;
            }
            entries[cell] = n;
            for (int k = 0; k < weights.size(); k++) {
                sums[k][cell] = row.getDouble(2 + 2 * k);
                squares[k][cell] = row.getDouble(3 + 2 * k);
            }
        }
        return new Sums(sums, squares, entries, bad);
    }

    /**
     * The cut flow of {@code weight} over {@code table}: for region r and step k, the weighted sum
     * and the number of events passing steps 1..k ({@code [r][k]}).
     */
    static CutFlow.Counts cutFlow(SparkSession spark, String table, List<Region> regions, String weight) {
        List<String> cols = new ArrayList<>();
        String w = weight(weight);
        for (Region r : regions) {
            String cumulative = "true";
            for (BuildSpec.Step st : r.steps()) {
                cumulative = cumulative + " AND coalesce((" + st.keep().sql() + "), false)";
                cols.add("sum(CASE WHEN " + cumulative + " THEN " + w + " ELSE 0D END)");
                cols.add("count_if(" + cumulative + ")");
            }
        }
        Row row = spark.sql("SELECT " + String.join(", ", cols) + " FROM " + table).first();
        double[][] weighted = new double[regions.size()][];
        long[][] raw = new long[regions.size()][];
        int c = 0;
        for (int r = 0; r < regions.size(); r++) {
            int steps = regions.get(r).steps().size();
            weighted[r] = new double[steps];
            raw[r] = new long[steps];
            for (int k = 0; k < steps; k++) {
                weighted[r][k] = row.isNullAt(c) ? 0 : row.getDouble(c);
                raw[r][k] = row.getLong(c + 1);
                c += 2;
            }
        }
        return new CutFlow.Counts(weighted, raw);
    }

    /** How many events kept by some region have a weight that is NaN, infinite or null. */
    static long badWeights(SparkSession spark, String table, List<Region> regions, String weight) {
        StringBuilder any = new StringBuilder("false");
        for (Region r : regions) any.append(" OR (").append(selection(r)).append(")");
        String w = weight(weight);
        return spark.sql("SELECT count_if((" + any + ") AND (isnan(" + w + ") OR abs(" + w + ") = double('inf'))) FROM "
                + table).first().getLong(0);
    }
}
