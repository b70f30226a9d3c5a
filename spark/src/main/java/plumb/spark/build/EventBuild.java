package plumb.spark.build;

import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.BooleanType;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.NumericType;
import org.apache.spark.sql.types.StructField;
import plumb.cli.ComputationException;
import plumb.cli.InputException;
import plumb.cli.build.BuildOutcome;
import plumb.cli.build.BuildRequest;
import plumb.cli.build.CutFlowRow;
import plumb.cli.io.AtomicFiles;
import plumb.cli.table.TableFormat;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;
import plumb.spark.build.BuildSpec.Events;
import plumb.spark.build.BuildSpec.Expr;
import plumb.spark.build.BuildSpec.Region;
import plumb.spark.build.BuildSpec.SampleSpec;
import plumb.spark.build.BuildSpec.Source;
import plumb.spark.build.BuildSpec.Step;
import plumb.spark.build.BuildSpec.VariationSpec;
import plumb.spark.campaign.SparkRunner;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * {@code plumb build}: event tables to a model (docs/build-format.md). Reads the description,
 * checks every expression against the tables it applies to (so an error names its key), runs one
 * Spark pass per set of tables ({@link HistogramJob}), assembles and tidies the model
 * ({@link ModelAssembly}), has the model reader validate it, and only then writes the cut flow
 * and the model.
 */
public final class EventBuild {

    private final BuildSpec spec;
    private final SparkSession spark;
    private final PrintWriter err;
    private final List<String> warnings = new ArrayList<>();
    private int views;
    /** Per view, the expressions Spark's analysis resolved when they were checked, by their SQL. */
    private final Map<String, Map<String, org.apache.spark.sql.catalyst.expressions.Expression>> analysed = new HashMap<>();
    /** The Parquet files behind each view (CSV views are not listed). */
    private final Map<String, List<String>> parquetFiles = new LinkedHashMap<>();

    private EventBuild(BuildSpec spec, SparkSession spark, PrintWriter err) {
        this.spec = spec;
        this.spark = spark;
        this.err = err;
    }

    /** The command's entry (called by the command line): opens Spark on the request's master, builds, closes. */
    public static BuildOutcome run(BuildRequest request, PrintWriter out, PrintWriter err) {
        BuildSpec spec = BuildSpecReader.read(request.spec());
        err.printf(Locale.ROOT, "build: starting Spark (%s)%n", request.master());
        err.flush();
        try (SparkRunner runner = SparkRunner.open(request.master(), request.timeoutSeconds())) {
            SparkSession spark = BuildSession.of(runner);
            return build(spec, spark, request.out(), out, err);
        }
    }

    /** Builds with a Spark session that is already open (tests, the events demo). */
    public static BuildOutcome build(BuildSpec spec, SparkSession spark, Path modelFile, PrintWriter out, PrintWriter err) {
        long t0 = System.nanoTime();
        EventBuild b = new EventBuild(spec, spark, err);
        ModelAssembly assembly;
        try {
            assembly = b.histograms();
        } catch (InputException | ComputationException e) {
            throw e;
        } catch (Exception e) {   // Spark failed while reading or computing: the input, as far as we can tell
            throw new InputException(spec.file() + ": Spark: " + firstLine(e) + "; nothing written");
        }
        Model model = assembly.model();
        String json;
        try {
            json = ModelWriter.toJson(model);
            ModelReader.parse(json, modelFile.toString());   // the reader's every rule, before anything is written
        } catch (ModelException | IllegalArgumentException e) {
            throw new InputException(spec.file() + ": the model built is not valid: " + e.getMessage());
        }
        List<String> warnings = new ArrayList<>(b.warnings);
        warnings.addAll(assembly.warnings());
        BuildOutcome outcome = new BuildOutcome(modelFile, assembly.cutFlow(), warnings, assembly.changes());
        writeAll(outcome, json);
        for (String c : outcome.changes()) out.println("  variation: " + c);
        for (String w : warnings) err.println("plumb build: warning: " + w);
        out.print(TableFormat.TEXT.render(outcome.cutFlowTable(false)));
        out.printf(Locale.ROOT, "wrote %s (%d channels, %d samples) and its cut flow %s.{txt,csv,tex} in %.1f s%n",
                modelFile, model.channels().size(), spec.samples().size(), stem(modelFile),
                (System.nanoTime() - t0) * 1e-9);
        out.flush();
        err.flush();
        return outcome;
    }

    /** The file name of the model without .json: the cut flow files take it with their own ending. */
    static Path stem(Path modelFile) {
        return plumb.cli.build.CutFlowFile.stem(modelFile);   // where the report looks for it too
    }

    /** Cut flow first, the model last: a model on disk means that every file of the build is there. */
    private static void writeAll(BuildOutcome o, String json) {
        Path stem = stem(o.model());
        try {
            AtomicFiles.writeString(Path.of(stem + ".txt"), TableFormat.TEXT.render(o.cutFlowTable(false)));
            AtomicFiles.writeString(Path.of(stem + ".csv"), TableFormat.CSV.render(o.cutFlowTable(true)));
            AtomicFiles.writeString(Path.of(stem + ".tex"), TableFormat.LATEX.render(o.cutFlowTable(false)));
            AtomicFiles.writeString(o.model(), json);
        } catch (IOException e) {
            throw new InputException("--out " + o.model() + ": cannot write: " + e.getMessage());
        }
    }

    /** Every Spark pass of the build; the numbers go into an assembly. */
    private ModelAssembly histograms() {
        ModelAssembly assembly = new ModelAssembly(spec);
        int passes = 0, pass = 0;
        for (SampleSpec s : spec.samples()) {
            passes++;
            for (VariationSpec v : s.variations()) {
                if (v.source() == Source.EVENTS) passes += (v.upEvents() != null ? 1 : 0) + (v.downEvents() != null ? 1 : 0);
            }
        }
        List<Region> dataRegions = spec.regions().stream().filter(r -> !r.blinded()).toList();
        if (spec.data() != null && !dataRegions.isEmpty()) passes++;
        // Read every table and check every expression before the first pass: errors come early and name their key.
        Map<SampleSpec, String> nominal = new LinkedHashMap<>();
        for (SampleSpec s : spec.samples()) {
            String view = view(s.events());
            nominal.put(s, view);
            List<Pending> checks = new ArrayList<>();
            regionChecks(checks, assembly.regions(s), s.events().path());
            checks.add(new Pending(s.weight(), false, null));
            for (VariationSpec v : s.variations()) {
                if (v.source() == Source.WEIGHTS || v.source() == Source.OBSERVABLE) {
                    if (v.up() != null) checks.add(new Pending(v.up(), false, null));
                    if (v.down() != null) checks.add(new Pending(v.down(), false, null));
                }
            }
            checkAll(view, checks);
        }
        Map<Events, String> alternative = new LinkedHashMap<>();
        for (SampleSpec s : spec.samples()) {
            for (VariationSpec v : s.variations()) {
                for (Events e : new Events[] {v.upEvents(), v.downEvents()}) {
                    if (e == null) continue;
                    String view = view(e);
                    alternative.put(e, view);
                    List<Pending> checks = new ArrayList<>();
                    regionChecks(checks, assembly.regions(s, v), e.path());
                    checks.add(new Pending(s.weight(), false, null));
                    checkAll(view, checks);
                }
            }
        }
        String dataView = null;
        if (spec.data() != null && !dataRegions.isEmpty()) {
            dataView = view(spec.data());
            List<Pending> checks = new ArrayList<>();
            regionChecks(checks, dataRegions, spec.data().path());
            checkAll(dataView, checks);
        }
        // Every pass is planned first and run in one go (the Parquet ones in one Spark job, so
        // the cores never wait for the end of one table's pass), then the sums are used in order.
        List<HistogramJob.Pass> planned = new ArrayList<>();
        Map<SampleSpec, HistogramJob> nominalJobs = new LinkedHashMap<>();
        for (SampleSpec s : spec.samples()) {
            String view = nominal.get(s);
            List<Region> regions = assembly.regions(s);
            List<String> weights = weights(s);
            // observable-based variations ride along on the same pass: the same table, the same selection
            HistogramJob job = new HistogramJob(regions, observables(regions), weights);
            int shifted = 0;
            for (VariationSpec v : s.variations()) {
                if (v.source() != Source.OBSERVABLE) continue;
                for (Expr side : new Expr[] {v.up(), v.down()}) {
                    if (side == null) continue;
                    job = job.plus(assembly.regions(s, v), side.sql());
                    shifted++;
                }
            }
            progress(++pass, passes, "sample " + s.name() + ": nominal" + (weights.size() > 1
                    ? " and " + (weights.size() - 1) + " weight variation" + (weights.size() > 2 ? "s" : "") : "")
                    + (shifted == 0 ? "" : ", " + shifted + " shifted observable" + (shifted > 1 ? "s" : "")));
            nominalJobs.put(s, job);
            planned.add(pass(job, view));
            for (VariationSpec v : s.variations()) {
                if (v.source() != Source.EVENTS) continue;
                if (v.upEvents() != null) {
                    progress(++pass, passes, "sample " + s.name() + ": " + v.parameter() + " up (events)");
                    planned.add(pass(tableJob(s, assembly.regions(s, v)), alternative.get(v.upEvents())));
                }
                if (v.downEvents() != null) {
                    progress(++pass, passes, "sample " + s.name() + ": " + v.parameter() + " down (events)");
                    planned.add(pass(tableJob(s, assembly.regions(s, v)), alternative.get(v.downEvents())));
                }
            }
        }
        if (dataView != null) {
            progress(++pass, passes, "data");
            planned.add(pass(new HistogramJob(dataRegions, observables(dataRegions), List.of("1")), dataView));
        }
        List<HistogramJob.Sums> results;
        try (TaskProgress shown = TaskProgress.start(spark, err)) {
            results = HistogramJob.runAll(spark, planned);
        }
        int next = 0;
        for (SampleSpec s : spec.samples()) {
            List<Region> regions = assembly.regions(s);
            HistogramJob job = nominalJobs.get(s);
            HistogramJob.Sums sums = results.get(next++);
            refuseBad(s.name(), regions, weights(s), sums, s.events().path());
            assembly.nominal(s, regions, job, sums, sums.flow());
            int entry = regions.size();
            for (VariationSpec v : s.variations()) {
                if (v.source() == Source.OBSERVABLE) {
                    List<Region> vr = assembly.regions(s, v);
                    double[][] up = null, down = null;
                    if (v.up() != null) {
                        up = shiftedEntries(s, v.up(), job, sums, entry, vr);
                        entry += vr.size();
                    }
                    if (v.down() != null) {
                        down = shiftedEntries(s, v.down(), job, sums, entry, vr);
                        entry += vr.size();
                    }
                    assembly.variation(s, v, vr, up, down);
                } else if (v.source() == Source.EVENTS) {
                    List<Region> vr = assembly.regions(s, v);
                    double[][] up = null, down = null;
                    if (v.upEvents() != null) up = tableSums(s, planned.get(next).job(), results.get(next++), vr, v.upEvents().path());
                    if (v.downEvents() != null) {
                        down = tableSums(s, planned.get(next).job(), results.get(next++), vr, v.downEvents().path());
                    }
                    assembly.variation(s, v, vr, up, down);
                }
            }
        }
        if (dataView != null) {
            HistogramJob.Sums sums = results.get(next);
            refuseBadObservable("data", dataRegions, sums, spec.data().path());
            assembly.data(dataRegions, planned.get(next).job(), sums, sums.flow());
        }
        return assembly;
    }

    /** The weights a sample's nominal pass sums: its weight, then up and down of each weight-based variation. */
    private static List<String> weights(SampleSpec s) {
        List<String> weights = new ArrayList<>();
        weights.add(s.weight().sql());
        for (VariationSpec v : s.variations()) {
            if (v.source() != Source.WEIGHTS) continue;
            if (v.up() != null) weights.add(v.up().sql());
            if (v.down() != null) weights.add(v.down().sql());
        }
        return weights;
    }

    private HistogramJob.Pass pass(HistogramJob job, String view) {
        return new HistogramJob.Pass(job, view, parquetFiles.get(view), analysed.get(view));
    }

    /** The histograms of one side of an observable variation: entries {@code from ..} of the sample's pass. */
    private double[][] shiftedEntries(SampleSpec s, Expr observable, HistogramJob job, HistogramJob.Sums sums, int from,
                                      List<Region> regions) {
        refuseBadObservable(s.name() + " (" + observable.path() + ")", regions, sums, from, observable.path());
        int[] off = job.offsets();
        double[][] out = new double[regions.size()][];
        for (int r = 0; r < out.length; r++) out[r] = sums.region(sums.sums()[0], off, from + r, regions.get(r).bins());
        return out;
    }

    /** The pass over a table-based variation's tables: the sample's regions, its nominal weight. */
    private static HistogramJob tableJob(SampleSpec s, List<Region> regions) {
        return new HistogramJob(regions, observables(regions), List.of(s.weight().sql()));
    }

    private double[][] tableSums(SampleSpec s, HistogramJob job, HistogramJob.Sums sums, List<Region> regions, String path) {
        refuseBad(s.name() + " (" + path + ")", regions, List.of(s.weight().sql()), sums, path);
        return perRegion(job, sums);
    }

    /** Weighted sums (weight 0) of each region of a one-weight pass. */
    static double[][] perRegion(HistogramJob job, HistogramJob.Sums sums) {
        int[] off = job.offsets();
        double[][] out = new double[job.regions().size()][];
        for (int r = 0; r < out.length; r++) out[r] = sums.region(sums.sums()[0], off, r, job.regions().get(r).bins());
        return out;
    }

    private static List<String> observables(List<Region> regions) {
        return regions.stream().map(r -> r.observable().sql()).toList();
    }

    /** NaN or infinite weights and NaN observables: counted, then refused with the sample and the count. */
    private void refuseBad(String sample, List<Region> regions, List<String> weights, HistogramJob.Sums sums, String path) {
        refuseBadObservable(sample, regions, sums, path);
        for (int k = 0; k < weights.size(); k++) {
            long bad = sums.badWeights()[k];
            if (bad > 0) {
                throw new InputException(String.format(Locale.ROOT,
                        "%s: sample %s: the weight '%s' is NaN, infinite or null in %d selected event%s; nothing written",
                        spec.file(), sample, weights.get(k), bad, bad == 1 ? "" : "s"));
            }
            boolean finite = true;
            for (double v : sums.sums()[k]) finite &= Double.isFinite(v);
            for (double v : sums.squares()[k]) finite &= Double.isFinite(v);
            if (!finite) {
                throw new ComputationException(String.format(Locale.ROOT,
                        "%s: sample %s: the weights '%s' sum beyond the range of double numbers", spec.file(), sample, weights.get(k)));
            }
        }
    }

    private void refuseBadObservable(String sample, List<Region> regions, HistogramJob.Sums sums, String path) {
        refuseBadObservable(sample, regions, sums, 0, path);
    }

    /** Entries {@code from ..} of the pass are {@code regions}. */
    private void refuseBadObservable(String sample, List<Region> regions, HistogramJob.Sums sums, int from, String path) {
        for (int r = 0; r < regions.size(); r++) {
            long bad = sums.badObservable()[from + r];
            if (bad > 0) {
                throw new InputException(String.format(Locale.ROOT,
                        "%s: %s: region %s: the observable is NaN or null in %d selected event%s of %s; nothing written",
                        spec.file(), path, regions.get(r).name(), bad, bad == 1 ? "" : "s", sample));
            }
        }
    }

    private void progress(int k, int n, String what) {
        err.printf(Locale.ROOT, "build: [%d/%d] %s%n", k, n, what);
        err.flush();
    }

    // ---- tables and expressions

    /** Reads one list of tables into a temporary view; its name. */
    private String view(Events events) {
        EventTables.Read read = EventTables.read(spark, events, spec.file());
        String name = "plumb_events_" + (views++);
        read.table().createOrReplaceTempView(name);
        if (read.parquetFiles() != null) parquetFiles.put(name, read.parquetFiles());
        return name;
    }

    /** An expression to check against a table: a step (boolean) or a number, and the tables' key for the message. */
    private record Pending(Expr expr, boolean bool, String tablesPath) { }

    private static void regionChecks(List<Pending> checks, List<Region> regions, String tablesPath) {
        for (Region r : regions) {
            for (Step st : r.steps()) checks.add(new Pending(st.keep(), true, tablesPath));
            checks.add(new Pending(r.observable(), false, tablesPath));
        }
    }

    /**
     * Checks a table's expressions in one analysis by Spark (each analysis costs about as much as a
     * small pass); only when that fails are they analysed one by one, in order, so that the error
     * names its key.
     */
    private void checkAll(String view, List<Pending> checks) {
        List<String> sql = checks.stream().map(p -> p.expr().sql()).toList();
        List<org.apache.spark.sql.catalyst.expressions.Expression> trees;
        try {
            trees = BatchCompiler.analysed(spark.table(view), sql);
        } catch (Exception x) {   // analysed again one by one below
            trees = null;
        }
        if (trees != null) {
            Map<String, org.apache.spark.sql.catalyst.expressions.Expression> known = analysed.computeIfAbsent(view, v -> new HashMap<>());
            for (int i = 0; i < trees.size(); i++) {
                checkType(checks.get(i), trees.get(i).dataType());
                known.put(sql.get(i), trees.get(i));   // the column-batch pass compiles these without a second analysis
            }
            return;
        }
        for (Pending p : checks) check(view, p);
    }

    /** Spark analyses the expression against the table now; an error names the key, the tables and Spark's message. */
    private void check(String view, Pending p) {
        Expr e = p.expr();
        DataType type;
        try {
            StructField[] fields = spark.table(view).selectExpr(e.sql()).schema().fields();
            if (fields.length != 1) throw new InputException(spec.file() + ": " + e.path() + ": '" + e.sql() + "' gives "
                    + fields.length + " columns, expected one");
            type = fields[0].dataType();
        } catch (InputException x) {
            throw x;
        } catch (Exception x) {   // Spark's analysis errors are checked exceptions in Java's eyes
            throw new InputException(spec.file() + ": " + e.path() + ": " + on(p.tablesPath()) + "Spark: " + firstLine(x));
        }
        checkType(p, type);
    }

    private void checkType(Pending p, DataType type) {
        Expr e = p.expr();
        if (p.bool() && !(type instanceof BooleanType)) {
            throw new InputException(spec.file() + ": " + e.path() + ": '" + e.sql() + "' is of type "
                    + type.simpleString() + ", expected a boolean");
        }
        if (!p.bool() && !(type instanceof NumericType)) {
            throw new InputException(spec.file() + ": " + e.path() + ": '" + e.sql() + "' is of type "
                    + type.simpleString() + ", expected a number");
        }
    }

    private static String on(String tablesPath) {
        return tablesPath == null ? "" : "on the tables of " + tablesPath + ": ";
    }

    /** The first line of an exception's message (Spark's carry the query plan below it). */
    static String firstLine(Throwable t) {
        String m = t.getMessage();
        if (m == null || m.isBlank()) return t.getClass().getSimpleName();
        return m.strip().lines().findFirst().orElse("").strip();
    }
}
